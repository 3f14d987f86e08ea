import { db } from '$lib/server/db';
import { readJson, refusalResponse, signedIn } from '$lib/server/http';
import { forkMapping } from '$lib/server/mappings';
import { json } from '@sveltejs/kit';
import { z } from 'zod';
import type { RequestHandler } from './$types';

/** Copies a mapping you can read (a public one, or your own: a duplicate) into a new one of yours. */
export const POST: RequestHandler = async ({ locals, params, request }) => {
	try {
		const user = signedIn(locals);
		const text = await request.clone().text();
		const body = text.trim()
			? await readJson(request, z.object({ name: z.string().trim().min(1).max(120).optional() }))
			: {};
		return json({ id: await forkMapping(db, user.id, params.id, body.name) }, { status: 201 });
	} catch (e) {
		return refusalResponse(e);
	}
};
