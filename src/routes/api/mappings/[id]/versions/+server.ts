import { db } from '$lib/server/db';
import { refusalResponse, signedIn } from '$lib/server/http';
import { listVersions } from '$lib/server/mappings';
import { json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async ({ locals, params }) => {
	try {
		return json({ versions: await listVersions(db, signedIn(locals).id, params.id) });
	} catch (e) {
		return refusalResponse(e);
	}
};
