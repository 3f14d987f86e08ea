import { db } from '$lib/server/db';
import { deleteLayout } from '$lib/server/controllers';
import { refusalResponse, signedIn } from '$lib/server/http';
import type { RequestHandler } from './$types';

export const DELETE: RequestHandler = async ({ locals, params }) => {
	try {
		await deleteLayout(db, signedIn(locals).id, params.id);
		return new Response(null, { status: 204 });
	} catch (e) {
		return refusalResponse(e);
	}
};
