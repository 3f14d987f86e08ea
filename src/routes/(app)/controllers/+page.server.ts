import { listLayouts } from '$lib/server/controllers';
import { db } from '$lib/server/db';
import { listMappings } from '$lib/server/mappings';
import { requireArea } from '$lib/server/roles';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals }) => {
	const user = requireArea(locals, 'app');
	const [layouts, mappings] = await Promise.all([listLayouts(db, user.id), listMappings(db, user.id)]);
	return {
		layouts,
		mine: mappings.filter((m) => m.mine).map((m) => ({ id: m.id, name: m.name, version: m.version }))
	};
};
