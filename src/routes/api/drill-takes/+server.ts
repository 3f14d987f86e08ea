import { db } from '$lib/server/db';
import { recordTake, takeInput } from '$lib/server/drills';
import { readJson, refusalResponse, signedIn } from '$lib/server/http';
import { json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';

/** `{ rehearsalId, drillId, zero }`: one of your sessions is a try at a drill; answers its score. */
export const POST: RequestHandler = async ({ locals, request }) => {
	try {
		const user = signedIn(locals);
		const body = await readJson(request, takeInput);
		return json({ score: await recordTake(db, user.id, body) }, { status: 201 });
	} catch (e) {
		return refusalResponse(e);
	}
};
