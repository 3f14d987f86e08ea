import { db } from '$lib/server/db';
import { Refusal } from '$lib/server/http';
import { getMapping } from '$lib/server/mappings';
import { requireArea } from '$lib/server/roles';
import { error } from '@sveltejs/kit';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, params }) => {
	const user = requireArea(locals, 'app');
	try {
		const m = await getMapping(db, user.id, params.id);
		return {
			mapping: {
				id: m.id,
				name: m.name,
				owner: m.owner,
				mine: m.mine,
				visibility: m.visibility,
				version: m.version,
				document: m.document
			}
		};
	} catch (e) {
		if (e instanceof Refusal) return error(e.status, e.message);
		throw e;
	}
};
