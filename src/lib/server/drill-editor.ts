// What the drill editor needs: the mappings a teacher can play drills on, each with its pads and
// its versions (newest first), so the teacher can choose the version a drill is played on.
import type { Database } from './db';
import { getMapping, listMappings } from './mappings';

export async function editorMappings(db: Database, userId: string) {
	const list = await listMappings(db, userId);
	return Promise.all(
		list.map(async (m) => {
			const detail = await getMapping(db, userId, m.id);
			return {
				id: m.id,
				name: m.name,
				version: m.version,
				tempo: detail.document.tempo ?? 120,
				pads: detail.document.profile.inputs
					.filter((i) => i.kind === 'pad' || i.kind === 'button')
					.map((i) => ({ id: i.id, label: i.label ?? i.id })),
				versions: detail.versions.map((v) => ({ version: v.version, createdAt: new Date(v.createdAt).toISOString() }))
			};
		})
	);
}
