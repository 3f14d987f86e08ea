import { db } from '$lib/server/db';
import { listLayouts, saveLayout } from '$lib/server/controllers';
import { readJson, refusalResponse, signedIn } from '$lib/server/http';
import { json } from '@sveltejs/kit';
import { z } from 'zod';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async ({ locals }) => {
	try {
		return json({ layouts: await listLayouts(db, signedIn(locals).id) });
	} catch (e) {
		return refusalResponse(e);
	}
};

/** Saves a learned layout (`{ profile }`), replacing the user's layout of the same name. */
export const POST: RequestHandler = async ({ locals, request }) => {
	try {
		const user = signedIn(locals);
		const body = await readJson(request, z.object({ profile: z.unknown() }), 256 << 10);
		return json({ id: await saveLayout(db, user.id, body.profile) }, { status: 201 });
	} catch (e) {
		return refusalResponse(e);
	}
};
