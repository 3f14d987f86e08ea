import { demoMapping, lintMapping } from '$lib/engine';
import { mappingVersion } from '$lib/server/db/schema';
import { eq } from 'drizzle-orm';
import { Refusal } from '$lib/server/http';
import {
	createMapping,
	deleteMapping,
	getMapping,
	backfillLintCounts,
	listMappings,
	saveVersion,
	seedDemoMappings,
	setVisibility
} from '$lib/server/mappings';
import { shareMapping } from '$lib/server/classes';
import { DEMO_CLASS } from '$lib/server/db/seed';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { demoDatabase } from './factories';

let t: Awaited<ReturnType<typeof demoDatabase>>;
beforeEach(async () => (t = await demoDatabase()));
afterEach(() => t.close());

describe('mappings in the database', () => {
	it('seeds the three demo mappings once, public, owned by the teacher', async () => {
		expect(await seedDemoMappings(t.db, t.teacher)).toBe(0);
		const seen = await listMappings(t.db, t.kai);
		expect(seen.map((m) => m.name).sort()).toEqual(['Broken stutter row', 'Four-deck pad set', 'Two-deck pad set']);
		expect(seen.every((m) => m.visibility === 'public' && !m.mine && m.demo)).toBe(true);
		expect(seen.find((m) => m.name === 'Four-deck pad set')?.decks).toBe(4);
	});

	it('keeps a private mapping from other users', async () => {
		const id = await createMapping(t.db, t.kai, { document: demoMapping('two-deck'), name: 'Kai set' });
		expect((await listMappings(t.db, t.kai)).some((m) => m.id === id && m.mine)).toBe(true);
		expect((await listMappings(t.db, t.lena)).some((m) => m.id === id)).toBe(false);
		await expect(getMapping(t.db, t.lena, id)).rejects.toMatchObject({ status: 404 });
	});

	it('refuses an invalid document with readable problems and stores nothing', async () => {
		const before = (await listMappings(t.db, t.kai)).length;
		const error = await createMapping(t.db, t.kai, { document: { version: 1, name: '', decks: 3 } }).catch((e) => e);
		expect(error).toBeInstanceOf(Refusal);
		expect(error.status).toBe(400);
		expect(error.message).toMatch(/not a valid mapping document/);
		expect(error.problems.length).toBeGreaterThan(0);
		expect((await listMappings(t.db, t.kai)).length).toBe(before);
	});

	it('saves every change as a new version and keeps the old ones readable', async () => {
		const id = await createMapping(t.db, t.kai, { document: demoMapping('two-deck') });
		const changed = { ...demoMapping('two-deck'), name: 'Two-deck, faster', tempo: 128 };
		expect(await saveVersion(t.db, t.kai, id, changed, 1)).toBe(2);
		const now = await getMapping(t.db, t.kai, id);
		expect(now.document.tempo).toBe(128);
		expect(now.versions.map((v) => v.version)).toEqual([2, 1]);
		expect((await getMapping(t.db, t.kai, id, 1)).document.tempo).toBe(demoMapping('two-deck').tempo);
	});

	it('lets only the owner change or delete a public mapping', async () => {
		const id = await createMapping(t.db, t.teacher, { document: demoMapping('two-deck'), visibility: 'public' });
		await expect(deleteMapping(t.db, t.kai, id)).rejects.toMatchObject({ status: 403 });
		await expect(saveVersion(t.db, t.kai, id, demoMapping('two-deck'), 1)).rejects.toMatchObject({ status: 403 });
		await deleteMapping(t.db, t.teacher, id);
		await expect(getMapping(t.db, t.kai, id)).rejects.toMatchObject({ status: 404 });
	});
});

describe('what listing mappings costs', () => {
	it('keeps the lint count with the version when it is saved, and lists the kept count', async () => {
		const broken = (await listMappings(t.db, t.kai)).find((m) => m.name === 'Broken stutter row')!;
		const detail = await getMapping(t.db, t.kai, broken.id);
		const [kept] = await t.db.select().from(mappingVersion).where(eq(mappingVersion.id, detail.versionId));
		expect(kept.lintCount).toBe(lintMapping(detail.document).length);
		expect(kept.lintCount).toBeGreaterThan(0);
		// The list reads the kept number; it does not lint the document again.
		await t.db.update(mappingVersion).set({ lintCount: 42 }).where(eq(mappingVersion.id, detail.versionId));
		expect((await listMappings(t.db, t.kai)).find((m) => m.id === broken.id)!.lintCount).toBe(42);
	});

	it('fills in the lint count of versions saved before it was kept', async () => {
		await t.db.update(mappingVersion).set({ lintCount: null });
		expect(await backfillLintCounts(t.db)).toBe(3);
		const rows = await t.db.select().from(mappingVersion);
		for (const row of rows) expect(row.lintCount).toBe(lintMapping(row.document as never).length);
		expect(await backfillLintCounts(t.db)).toBe(0);
	});

	it('refuses a new mapping past the per-person limit with 409', async () => {
		process.env.PADPROOF_MAX_MAPPINGS = '1';
		try {
			await createMapping(t.db, t.kai, { document: demoMapping('two-deck') });
			await expect(createMapping(t.db, t.kai, { document: demoMapping('two-deck') })).rejects.toMatchObject({
				status: 409,
				message: expect.stringMatching(/1 mapping/)
			});
		} finally {
			delete process.env.PADPROOF_MAX_MAPPINGS;
		}
	});
});

describe('mappings shared with a class', () => {
	it('lists a private mapping shared with a class to its members and its teacher, named by class', async () => {
		const id = await createMapping(t.db, t.teacher, { document: demoMapping('two-deck'), name: 'Crew private set' });
		await shareMapping(t.db, t.teacher, DEMO_CLASS.id, id);

		const lena = (await listMappings(t.db, t.lena)).find((m) => m.id === id);
		expect(lena).toMatchObject({ mine: false, visibility: 'private', classes: ['Wednesday night crew'] });
		const teacher = (await listMappings(t.db, t.teacher)).find((m) => m.id === id);
		expect(teacher).toMatchObject({ mine: true, classes: ['Wednesday night crew'] });
		// Kai is in no class: the private mapping stays out of his list.
		expect((await listMappings(t.db, t.kai)).some((m) => m.id === id)).toBe(false);
		// The seeded share of the public two-deck demo is named for members, not for others.
		const demo = (list: Awaited<ReturnType<typeof listMappings>>) => list.find((m) => m.name === 'Two-deck pad set')!;
		expect(demo(await listMappings(t.db, t.lena)).classes).toEqual(['Wednesday night crew']);
		expect(demo(await listMappings(t.db, t.kai)).classes).toEqual([]);

		// Members read it but do not change it: refused as not theirs (403), while Kai is told it does not exist.
		await expect(saveVersion(t.db, t.lena, id, demoMapping('two-deck'), 1)).rejects.toMatchObject({
			status: 403,
			message: expect.stringMatching(/Fork it/)
		});
		await expect(deleteMapping(t.db, t.lena, id)).rejects.toMatchObject({ status: 403 });
		await expect(saveVersion(t.db, t.kai, id, demoMapping('two-deck'), 1)).rejects.toMatchObject({ status: 404 });
		expect((await getMapping(t.db, t.teacher, id)).version).toBe(1);

		await deleteMapping(t.db, t.teacher, id);
		expect((await listMappings(t.db, t.lena)).some((m) => m.id === id)).toBe(false);
	});

	it('drops the share of someone else’s mapping once its owner makes it private', async () => {
		const id = await createMapping(t.db, t.kai, {
			document: demoMapping('two-deck'),
			name: 'Kai open set',
			visibility: 'public'
		});
		await shareMapping(t.db, t.teacher, DEMO_CLASS.id, id);
		expect((await listMappings(t.db, t.lena)).find((m) => m.id === id)?.classes).toEqual(['Wednesday night crew']);
		await setVisibility(t.db, t.kai, id, 'private');
		expect((await listMappings(t.db, t.lena)).some((m) => m.id === id)).toBe(false);
		expect((await listMappings(t.db, t.teacher)).some((m) => m.id === id)).toBe(false);
	});
});
