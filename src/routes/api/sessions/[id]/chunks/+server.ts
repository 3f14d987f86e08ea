import { db } from '$lib/server/db';
import { readJson, refusalResponse, signedIn } from '$lib/server/http';
import { appendChunk, chunkSchema } from '$lib/server/rehearsals';
import { CHUNK_MAX_BYTES } from '$lib/recorder/limits';
import { json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';

/**
 * Appends one numbered chunk of events. Idempotent by `seq`: sending a chunk again answers
 * `duplicate: true` and changes nothing; a different chunk under a used number, a chunk after
 * "finish" (409) and one past the session's limits (413) are refused. Accepts text/plain bodies too (navigator.sendBeacon).
 */
export const POST: RequestHandler = async ({ locals, params, request }) => {
	try {
		const user = signedIn(locals);
		const chunk = await readJson(request, chunkSchema, CHUNK_MAX_BYTES);
		return json(await appendChunk(db, user.id, params.id, chunk));
	} catch (e) {
		return refusalResponse(e);
	}
};
