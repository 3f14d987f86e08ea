import type { AuthSession } from '$lib/server/auth';

declare global {
	namespace App {
		interface Locals {
			user: AuthSession['user'] | null;
			session: AuthSession['session'] | null;
		}
		interface Error {
			message: string;
		}
	}
}

export {};
