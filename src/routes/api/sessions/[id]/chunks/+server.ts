import { db } from '$lib/server/db';
import { readJson, refusalResponse, signedIn } from '$lib/server/http';
import { appendChunk, chunkSchema } from '$lib/server/rehearsals';
import { json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';

/**
 * Appends one numbered chunk of events. Idempotent by `seq`: sending a chunk again answers
 * `duplicate: true` and changes nothing. Accepts text/plain bodies too (navigator.sendBeacon).
 */
export const POST: RequestHandler = async ({ locals, params, request }) => {
	try {
		const user = signedIn(locals);
		const chunk = await readJson(request, chunkSchema, 4 << 20);
		return json(await appendChunk(db, user.id, params.id, chunk));
	} catch (e) {
		return refusalResponse(e);
	}
};
