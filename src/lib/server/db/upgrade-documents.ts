// Data migration run at start after the schema migrations: every stored version 1 mapping
// document is rewritten as the version 2 document it upgrades to, and the original is kept in
// `mapping_version_v1`, so nothing is lost. Idempotent: a version already upgraded is skipped.
import { parseMapping } from '../../engine/mapping';
import { eq, sql } from 'drizzle-orm';
import type { Database } from './index';
import { mappingVersion, mappingVersionV1 } from './schema';

export async function upgradeStoredMappings(db: Database): Promise<number> {
	const old = await db
		.select({ id: mappingVersion.id, document: mappingVersion.document })
		.from(mappingVersion)
		.where(sql`json_extract(${mappingVersion.document}, '$.version') = 1`);
	let upgraded = 0;
	for (const row of old) {
		const parsed = parseMapping(row.document);
		// A document that no longer reads is left exactly as it was, for a person to look at.
		if (!parsed.ok) continue;
		await db.transaction(async (tx) => {
			await tx.insert(mappingVersionV1).values({ versionId: row.id, document: row.document }).onConflictDoNothing();
			await tx.update(mappingVersion).set({ document: parsed.mapping }).where(eq(mappingVersion.id, row.id));
		});
		upgraded++;
	}
	return upgraded;
}
