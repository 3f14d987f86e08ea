import { db } from '$lib/server/db';
import { changeSessionBody } from '$lib/server/api-schemas';
import { readJson, refusalResponse, signedIn } from '$lib/server/http';
import { deleteRehearsal, finishRehearsal, renameRehearsal, sessionDocument } from '$lib/server/rehearsals';
import { json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';

/** The session document (our format, version 2), as the export and the command-line tool read it. */
export const GET: RequestHandler = async ({ locals, params, url }) => {
	try {
		const { row, session } = await sessionDocument(db, signedIn(locals).id, params.id);
		const headers: Record<string, string> = {};
		if (url.searchParams.has('download')) {
			const file = row.name.replace(/[^\w.-]+/g, '-').replace(/^-|-$/g, '') || 'session';
			headers['content-disposition'] = `attachment; filename="${file}.session.json"`;
		}
		return json(session, { headers });
	} catch (e) {
		return refusalResponse(e);
	}
};

export const PATCH: RequestHandler = async ({ locals, params, request }) => {
	try {
		const user = signedIn(locals);
		const body = await readJson(request, changeSessionBody);
		if (body.finish) return json(await finishRehearsal(db, user.id, params.id, body.name, body.clock));
		if (body.name) await renameRehearsal(db, user.id, params.id, body.name);
		return json({ ok: true });
	} catch (e) {
		return refusalResponse(e);
	}
};

export const DELETE: RequestHandler = async ({ locals, params }) => {
	try {
		await deleteRehearsal(db, signedIn(locals).id, params.id); // to the trash; purged after 30 days
		return new Response(null, { status: 204 });
	} catch (e) {
		return refusalResponse(e);
	}
};
