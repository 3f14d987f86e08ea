import { building } from '$app/environment';
import { tokenUser } from '$lib/server/api-token-gate';
import { auth } from '$lib/server/auth';
import { authGate } from '$lib/server/auth-gate';
import { stopAnalysisWorkers, warmAnalysisWorkers } from '$lib/server/analysis/pool';
import { assertProductionSettings, demoEnabled, isProduction } from '$lib/server/config';
import { client, db, prepareDatabase } from '$lib/server/db';
import { seedDemo } from '$lib/server/db/seed';
import { authErrorShape, limitBody, secureHeaders } from '$lib/server/guard';
import { discardUnread } from '$lib/server/http';
import { sweepIncoming } from '$lib/server/storage';
import { emptyExpiredTrash } from '$lib/server/trash-purge';
import type { Handle, ServerInit } from '@sveltejs/kit';
import { svelteKitHandler } from 'better-auth/svelte-kit';

export const init: ServerInit = async () => {
	assertProductionSettings();
	await prepareDatabase(client, db);
	// In production the demo school (PADPROOF_DEMO=1) gets fresh passwords, printed once.
	if (demoEnabled()) await seedDemo(db, { randomPasswords: isProduction() });
	await sweepIncoming();
	void warmAnalysisWorkers().catch((e) => console.error('The analysis workers did not start:', e));
	// adapter-node announces a graceful stop (SIGTERM/SIGINT) once the server is closed; the workers end with it.
	process.once('sveltekit:shutdown', () => void stopAnalysisWorkers());
	await emptyExpiredTrash(db);
};

export const handle: Handle = async ({ event, resolve }) => {
	const refused = await limitBody(event);
	if (refused) return secureHeaders(refused);
	// /api requests with `Authorization: Bearer <token>` act as the token's owner (api-token-gate.ts).
	const byToken = await tokenUser(event);
	if (byToken instanceof Response) {
		discardUnread(event.request);
		return secureHeaders(byToken);
	}
	const session = byToken ? null : await auth.api.getSession({ headers: event.request.headers });
	event.locals.user = byToken ?? session?.user ?? null;
	event.locals.session = session?.session ?? null;
	const response =
		event.url.pathname === '/api/auth' || event.url.pathname.startsWith('/api/auth/')
			? await authGate(event)
			: await svelteKitHandler({ event, resolve, auth, building });
	discardUnread(event.request); // an answer given before the body was read (401, 404, ...)
	return secureHeaders(await authErrorShape(event, response));
};
