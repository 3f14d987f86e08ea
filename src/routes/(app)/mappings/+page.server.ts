import { db } from '$lib/server/db';
import { listMappings } from '$lib/server/mappings';
import { requireArea } from '$lib/server/roles';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals }) => {
	const user = requireArea(locals, 'app');
	return { mappings: await listMappings(db, user.id) };
};
