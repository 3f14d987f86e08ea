import { documentKind } from '$lib/documents';
import { db } from '$lib/server/db';
import { newMappingBody } from '$lib/server/api-schemas';
import { readJson, Refusal, refusalResponse, signedIn } from '$lib/server/http';
import { createMapping, listMappings } from '$lib/server/mappings';
import { json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async ({ locals }) => {
	try {
		return json({ mappings: await listMappings(db, signedIn(locals).id) });
	} catch (e) {
		return refusalResponse(e);
	}
};

export const POST: RequestHandler = async ({ locals, request }) => {
	try {
		const user = signedIn(locals);
		const body = await readJson(request, newMappingBody, 2 << 20);
		const kind = documentKind(body.document);
		if (kind === 'session' || kind === 'drill')
			throw new Refusal(400, `This is a ${kind} file, not a mapping. Nothing was saved.`);
		const id = await createMapping(db, user.id, body);
		return json({ id }, { status: 201 });
	} catch (e) {
		return refusalResponse(e);
	}
};
