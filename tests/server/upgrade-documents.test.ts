// Version 1 mapping documents in the database: new ones are upgraded when they arrive, stored ones
// are rewritten at start with their original kept, and sessions pinned to them keep their findings.
import { readFileSync } from 'node:fs';
import { analyze, type InputEvent } from '$lib/engine';
import { prepareDatabase } from '$lib/server/db';
import { mappingVersion, mappingVersionV1 } from '$lib/server/db/schema';
import { upgradeStoredMappings } from '$lib/server/db/upgrade-documents';
import { createMapping, getMapping } from '$lib/server/mappings';
import { eq } from 'drizzle-orm';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { demoDatabase } from './factories';

const demos = JSON.parse(readFileSync(new URL('../engine/fixtures/v1-demos.json', import.meta.url), 'utf8'));

let t: Awaited<ReturnType<typeof demoDatabase>>;
beforeEach(async () => (t = await demoDatabase()));
afterEach(() => t.close());

// Two fingers on the broken row, the first lifts: the effect cuts out at 200 ms.
const dropoutTake: InputEvent[] = [
	{ t: 0, input: 'pad-13', type: 'press' },
	{ t: 100, input: 'pad-14', type: 'press' },
	{ t: 200, input: 'pad-13', type: 'release' }
];

describe('version 1 documents in the database', () => {
	it('upgrades a version 1 document posted as new and keeps what it does', async () => {
		const id = await createMapping(t.db, t.kai, { document: demos['broken-row'], name: 'Old row' });
		const saved = await getMapping(t.db, t.kai, id);
		expect(saved.document.version).toBe(2);
		expect(saved.document.racks.length).toBe(4);
		expect(analyze(saved.document, dropoutTake).find((f) => f.kind === 'dropout')).toMatchObject({ start: 200 });
	});

	it('rewrites stored version 1 documents at start, keeps the originals, and does it once', async () => {
		const id = await createMapping(t.db, t.kai, { document: demos['two-deck'], name: 'Stored long ago' });
		// Put the version 1 document back as an older release of Padproof would have stored it.
		await t.db.update(mappingVersion).set({ document: demos['two-deck'] }).where(eq(mappingVersion.mappingId, id));
		const [row] = await t.db.select().from(mappingVersion).where(eq(mappingVersion.mappingId, id));

		await prepareDatabase(t.client, t.db);
		const [after] = await t.db.select().from(mappingVersion).where(eq(mappingVersion.id, row.id));
		expect((after.document as { version: number }).version).toBe(2);
		const [kept] = await t.db.select().from(mappingVersionV1).where(eq(mappingVersionV1.versionId, row.id));
		expect(kept.document).toEqual(demos['two-deck']);
		expect(await upgradeStoredMappings(t.db)).toBe(0);
	});

	it('leaves a stored document that does not read untouched', async () => {
		const id = await createMapping(t.db, t.kai, { document: demos['two-deck'], name: 'Damaged' });
		const broken = { version: 1, name: 'x', bindings: [{ steps: [{ target: { kind: 'rack-mode', rack: 9 } }] }] };
		await t.db.update(mappingVersion).set({ document: broken }).where(eq(mappingVersion.mappingId, id));
		expect(await upgradeStoredMappings(t.db)).toBe(0);
		const [row] = await t.db.select().from(mappingVersion).where(eq(mappingVersion.mappingId, id));
		expect(row.document).toEqual(broken);
	});
});
