import { building } from '$app/environment';
import { auth } from '$lib/server/auth';
import { authGate } from '$lib/server/auth-gate';
import { demoEnabled } from '$lib/server/config';
import { client, db, prepareDatabase } from '$lib/server/db';
import { seedDemo } from '$lib/server/db/seed';
import type { Handle, ServerInit } from '@sveltejs/kit';
import { svelteKitHandler } from 'better-auth/svelte-kit';

export const init: ServerInit = async () => {
	await prepareDatabase(client, db);
	if (demoEnabled()) await seedDemo(db);
};

export const handle: Handle = async ({ event, resolve }) => {
	const session = await auth.api.getSession({ headers: event.request.headers });
	event.locals.user = session?.user ?? null;
	event.locals.session = session?.session ?? null;
	if (event.url.pathname === '/api/auth' || event.url.pathname.startsWith('/api/auth/')) return authGate(event);
	return svelteKitHandler({ event, resolve, auth, building });
};
