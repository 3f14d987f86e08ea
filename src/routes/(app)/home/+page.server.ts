import { assignmentsOf } from '$lib/server/assignments';
import { db } from '$lib/server/db';
import { listMappings } from '$lib/server/mappings';
import { listRehearsals } from '$lib/server/rehearsals';
import { requireArea } from '$lib/server/roles';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals }) => {
	const user = requireArea(locals, 'app');
	const [mappings, sessions, assigned] = await Promise.all([
		listMappings(db, user.id),
		listRehearsals(db, user.id),
		assignmentsOf(db, user.id)
	]);
	// The guide starts on the demo whose row drops out, so the third step has something to find.
	const demo = mappings.find((m) => m.demo && m.name === 'Broken stutter row') ?? mappings.find((m) => m.demo) ?? null;
	const latest = sessions.find((s) => s.status === 'saved') ?? null;
	return {
		demo: demo && { id: demo.id, name: demo.name },
		mappingCount: mappings.filter((m) => m.mine).length,
		sessionCount: sessions.length,
		latest: latest && { id: latest.id, name: latest.name, findings: latest.findingCount },
		// Drills given to the classes this person joined and not handed in yet, soonest first.
		due: assigned
			.filter((a) => !a.submission)
			.map((a) => ({ id: a.id, drill: a.drill, className: a.className, dueAt: a.dueAt }))
	};
};
