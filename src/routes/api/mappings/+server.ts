import { documentKind } from '$lib/documents';
import { upgradeSentences } from '$lib/engine/mapping';
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
		// A version 1 document is upgraded on the way in; `notes` says where it may not sound exactly as before.
		return json({ id, notes: upgradeSentences(body.document) }, { status: 201 });
	} catch (e) {
		return refusalResponse(e);
	}
};
