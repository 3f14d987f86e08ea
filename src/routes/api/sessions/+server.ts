import { db } from '$lib/server/db';
import { readJson, refusalResponse, signedIn } from '$lib/server/http';
import { createRehearsal, importSession, listRehearsals, newRehearsalSchema } from '$lib/server/rehearsals';
import { json } from '@sveltejs/kit';
import { z } from 'zod';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async ({ locals, url }) => {
	try {
		return json({ sessions: await listRehearsals(db, signedIn(locals).id, url.searchParams.get('q') ?? '') });
	} catch (e) {
		return refusalResponse(e);
	}
};

const Import = z.object({
	mappingId: z.string().min(1),
	name: z.string().trim().max(120).optional(),
	session: z.unknown()
});

/** Starts a recording, or with `session` in the body saves an imported session document whole. */
export const POST: RequestHandler = async ({ locals, request }) => {
	try {
		const user = signedIn(locals);
		const body = await readJson(request, z.union([Import, newRehearsalSchema]), 64 << 20);
		if ('session' in body) {
			const id = await importSession(db, user.id, body.mappingId, body.session, body.name);
			return json({ id }, { status: 201 });
		}
		return json(await createRehearsal(db, user.id, body), { status: 201 });
	} catch (e) {
		return refusalResponse(e);
	}
};
