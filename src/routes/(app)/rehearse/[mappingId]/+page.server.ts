import { error } from '@sveltejs/kit';
import { db } from '$lib/server/db';
import { Refusal } from '$lib/server/http';
import { getMapping } from '$lib/server/mappings';
import { requireArea } from '$lib/server/roles';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, params }) => {
	const user = requireArea(locals, 'app');
	try {
		const m = await getMapping(db, user.id, params.mappingId);
		return { mapping: { id: m.id, name: m.name, version: m.version, versionId: m.versionId, document: m.document } };
	} catch (e) {
		if (e instanceof Refusal) error(e.status, e.message);
		throw e;
	}
};
