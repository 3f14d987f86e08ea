// Data migration run at start after the schema migrations: every stored version 1 mapping
// document is rewritten as the version 2 document it upgrades to, and the original is kept in
// `mapping_version_v1`, so nothing is lost. Idempotent: a version already upgraded is skipped.
// A mapping whose upgrade may not keep the exact timeline gets one log line with the reasons.
import { parseMapping } from '../../engine/mapping';
import { eq, sql } from 'drizzle-orm';
import type { Database } from './index';
import { mapping, mappingVersion, mappingVersionV1 } from './schema';

export async function upgradeStoredMappings(
	db: Database,
	log: (line: string) => void = (line) => console.warn(line)
): Promise<number> {
	const old = await db
		.select({
			id: mappingVersion.id,
			version: mappingVersion.version,
			document: mappingVersion.document,
			mappingId: mappingVersion.mappingId,
			name: mapping.name
		})
		.from(mappingVersion)
		.innerJoin(mapping, eq(mapping.id, mappingVersion.mappingId))
		.where(sql`json_extract(${mappingVersion.document}, '$.version') = 1`);
	let upgraded = 0;
	const notes = new Map<string, { name: string; versions: number[]; notes: Set<string> }>();
	for (const row of old) {
		const parsed = parseMapping(row.document);
		// A document that no longer reads is left exactly as it was, for a person to look at.
		if (!parsed.ok) continue;
		await db.transaction(async (tx) => {
			await tx.insert(mappingVersionV1).values({ versionId: row.id, document: row.document }).onConflictDoNothing();
			await tx
				.update(mappingVersion)
				.set({ document: parsed.mapping, lintCount: null })
				.where(eq(mappingVersion.id, row.id));
		});
		upgraded++;
		if (!parsed.upgrade?.notes.length) continue;
		const entry = notes.get(row.mappingId) ?? { name: row.name, versions: [], notes: new Set<string>() };
		entry.versions.push(row.version);
		for (const note of parsed.upgrade.notes) entry.notes.add(note);
		notes.set(row.mappingId, entry);
	}
	for (const [id, entry] of notes) {
		const versions = entry.versions.toSorted((a, b) => a - b).join(', ');
		log(
			`Mapping "${entry.name}" (${id}), version${entry.versions.length > 1 ? 's' : ''} ${versions}, ` +
				`upgraded from document version 1 to 2: ${[...entry.notes].join(' ')}`
		);
	}
	return upgraded;
}
