import { error } from '@sveltejs/kit';
import { db } from '$lib/server/db';
import { Refusal } from '$lib/server/http';
import { drillFor } from '$lib/server/drills';
import { getMapping } from '$lib/server/mappings';
import { requireArea } from '$lib/server/roles';
import type { PageServerLoad } from './$types';

/** Practice mode: `?drill=…` (and `&assignment=…`) when the drill is played on this mapping. */
async function practiceDrill(userId: string, mappingId: string, url: URL) {
	const id = url.searchParams.get('drill');
	if (!id) return null;
	const d = await drillFor(db, userId, id);
	if (d.row.mappingId !== mappingId) throw new Refusal(404, 'That drill is played on another mapping.');
	const assignment = url.searchParams.get('assignment');
	return {
		id: d.row.id,
		document: d.document,
		assignmentId: assignment && /^[\w-]{1,64}$/.test(assignment) ? assignment : null
	};
}

export const load: PageServerLoad = async ({ locals, params, url }) => {
	const user = requireArea(locals, 'app');
	try {
		const m = await getMapping(db, user.id, params.mappingId);
		return {
			mapping: { id: m.id, name: m.name, version: m.version, versionId: m.versionId, document: m.document },
			drill: await practiceDrill(user.id, m.id, url)
		};
	} catch (e) {
		if (e instanceof Refusal) error(e.status, e.message);
		throw e;
	}
};
