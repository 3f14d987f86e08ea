import { db } from '$lib/server/db';
import { requireArea } from '$lib/server/roles';
import { listUsers } from '$lib/server/users';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals }) => {
	requireArea(locals, 'teaching');
	const people = await listUsers(db);
	return { students: people.filter((p) => p.role === 'student') };
};
