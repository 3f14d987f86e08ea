import { db } from '$lib/server/db';
import { Refusal, refusalResponse, signedIn } from '$lib/server/http';
import { openSessionAudio, storeSessionAudio } from '$lib/server/session-audio';
import { json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';

/**
 * Stores the session's audio capture (the request body is the file, streamed to storage; its kind
 * is read from its bytes), replacing an earlier one.
 */
export const PUT: RequestHandler = async ({ locals, params, request }) => {
	try {
		const stored = await storeSessionAudio(db, signedIn(locals).id, params.id, request);
		return json(stored, { status: 201 });
	} catch (e) {
		return refusalResponse(e);
	}
};

export const GET: RequestHandler = async ({ locals, params }) => {
	try {
		const file = await openSessionAudio(db, signedIn(locals).id, params.id);
		if (!file) throw new Refusal(404, 'This session has no audio recording.');
		return new Response(file.stream, {
			headers: { 'content-type': file.type, 'content-length': String(file.size) }
		});
	} catch (e) {
		return refusalResponse(e);
	}
};
