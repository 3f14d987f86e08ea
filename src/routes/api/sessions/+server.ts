import { db } from '$lib/server/db';
import { newSessionBody } from '$lib/server/api-schemas';
import { readJson, refusalResponse, signedIn } from '$lib/server/http';
import { createRehearsal, importSession, listRehearsals } from '$lib/server/rehearsals';
import { json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async ({ locals, url }) => {
	try {
		return json({ sessions: await listRehearsals(db, signedIn(locals).id, url.searchParams.get('q') ?? '') });
	} catch (e) {
		return refusalResponse(e);
	}
};

/** Starts a recording, or with `session` in the body saves an imported session document whole. */
export const POST: RequestHandler = async ({ locals, request }) => {
	try {
		const user = signedIn(locals);
		const body = await readJson(request, newSessionBody, 64 << 20);
		if ('session' in body) {
			const id = await importSession(db, user.id, body.mappingId, body.session, body.name);
			return json({ id }, { status: 201 });
		}
		return json(await createRehearsal(db, user.id, body), { status: 201 });
	} catch (e) {
		return refusalResponse(e);
	}
};
