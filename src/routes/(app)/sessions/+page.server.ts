import { db } from '$lib/server/db';
import { listMappings } from '$lib/server/mappings';
import { handedIn, handedInProblem, listRehearsals } from '$lib/server/rehearsals';
import { requireArea } from '$lib/server/roles';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, url }) => {
	const user = requireArea(locals, 'app');
	const q = url.searchParams.get('q') ?? '';
	const [sessions, mappings] = await Promise.all([listRehearsals(db, user.id, q), listMappings(db, user.id)]);
	const kept = await handedIn(
		db,
		sessions.map((s) => s.id)
	);
	return {
		q,
		sessions: sessions.map((s) => ({
			id: s.id,
			name: s.name,
			mappingName: s.mappingName,
			mappingGone: s.mappingId === null,
			startedAt: s.startedAt,
			durationMs: s.durationMs,
			eventCount: s.eventCount,
			findingCount: s.findingCount,
			status: s.status,
			hasAudio: s.audioFile !== null,
			// Why Delete is refused: the take is handed in for an assignment (null: it may go).
			keptBy: kept.has(s.id) ? handedInProblem(kept.get(s.id)!) : null
		})),
		mappings: mappings.map((m) => ({ id: m.id, name: m.name }))
	};
};
