import { gradebook } from '$lib/server/assignments';
import { taughtClass } from '$lib/server/classes';
import { db } from '$lib/server/db';
import { pageRefusal } from '$lib/server/http';
import { requireArea } from '$lib/server/roles';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, params }) => {
	const user = requireArea(locals, 'teaching');
	const c = await taughtClass(db, user.id, params.id).catch(pageRefusal);
	return { c: { id: c.id, name: c.name }, rows: await gradebook(db, user.id, c.id) };
};
