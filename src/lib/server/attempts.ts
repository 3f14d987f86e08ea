import type { RequestEvent } from '@sveltejs/kit';
import { APIError } from 'better-auth/api';
import { clientAddress } from './address';
import { throttle } from './throttle-instance';
import type { AttemptKind } from './throttle';

/**
 * The throttle for a form action (actions call better-auth's API directly, past `auth-gate.ts`):
 * returns the plain-language refusal, or null when the attempt may go ahead.
 */
export async function refuseAttempt(
	event: Pick<RequestEvent, 'request' | 'getClientAddress'>,
	kind: AttemptKind,
	account?: string
): Promise<string | null> {
	const address = clientAddress(event.request.headers, () => event.getClientAddress());
	const refusal = await throttle.guard({ kind, account: account?.toLowerCase(), address });
	return refusal?.message ?? null;
}

export const attemptSucceeded = (account: string) => throttle.succeeded(account.toLowerCase());

/** better-auth's error code of a refusal (e.g. INVALID_PASSWORD, BANNED_USER), or ''. */
export function authCode(e: unknown): string {
	if (!(e instanceof APIError)) return '';
	const body = e.body as { code?: unknown } | undefined;
	return typeof body?.code === 'string' ? body.code : '';
}
