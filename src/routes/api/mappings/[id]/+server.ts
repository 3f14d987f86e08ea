import { upgradeSentences } from '$lib/engine/mapping';
import { db } from '$lib/server/db';
import { mappingRenameBody, mappingVersionBody, mappingVisibilityBody } from '$lib/server/api-schemas';
import { readJson, refusalResponse, signedIn } from '$lib/server/http';
import {
	deleteMapping,
	getMapping,
	renameMapping,
	saveVersion,
	setVisibility,
	VersionConflict
} from '$lib/server/mappings';
import { json } from '@sveltejs/kit';
import { z } from 'zod';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async ({ locals, params, url }) => {
	try {
		const version = url.searchParams.get('version');
		const detail = await getMapping(db, signedIn(locals).id, params.id, version ? Number(version) : undefined);
		if (url.searchParams.has('download')) {
			const file = detail.name.replace(/[^\w.-]+/g, '-').replace(/^-|-$/g, '') || 'mapping';
			return json(detail.document, {
				headers: { 'content-disposition': `attachment; filename="${file}.mapping.json"` }
			});
		}
		return json({ mapping: detail });
	} catch (e) {
		return refusalResponse(e);
	}
};

export const PUT: RequestHandler = async ({ locals, params, request }) => {
	try {
		const user = signedIn(locals);
		const body = await readJson(request, mappingVersionBody, 2 << 20);
		const version = await saveVersion(db, user.id, params.id, body.document, body.baseVersion);
		return json({ version, notes: upgradeSentences(body.document) });
	} catch (e) {
		if (e instanceof VersionConflict)
			return json({ error: e.message, problems: e.problems, newest: e.newest }, { status: 409 });
		return refusalResponse(e);
	}
};

export const PATCH: RequestHandler = async ({ locals, params, request }) => {
	try {
		const user = signedIn(locals);
		const body = await readJson(request, z.union([mappingVisibilityBody, mappingRenameBody]));
		if ('name' in body) return json({ version: await renameMapping(db, user.id, params.id, body.name) });
		await setVisibility(db, user.id, params.id, body.visibility);
		return json({ ok: true });
	} catch (e) {
		return refusalResponse(e);
	}
};

export const DELETE: RequestHandler = async ({ locals, params }) => {
	try {
		await deleteMapping(db, signedIn(locals).id, params.id);
		return new Response(null, { status: 204 });
	} catch (e) {
		return refusalResponse(e);
	}
};
