import { demoMapping } from '$lib/engine';
import {
	createMapping,
	forkMapping,
	getMapping,
	listMappings,
	listVersions,
	renameMapping,
	saveVersion,
	VersionConflict
} from '$lib/server/mappings';
import { deleteLayout, listLayouts, saveLayout } from '$lib/server/controllers';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { demoDatabase } from './factories';

let t: Awaited<ReturnType<typeof demoDatabase>>;
beforeEach(async () => (t = await demoDatabase()));
afterEach(() => t.close());

describe('saving from the studio', () => {
	it('saves on top of the newest version and refuses a save from an older one, overwriting nothing', async () => {
		const id = await createMapping(t.db, t.kai, { document: demoMapping('two-deck'), name: 'Kai set' });
		const first = { ...demoMapping('two-deck'), name: 'Kai set', tempo: 126 };
		expect(await saveVersion(t.db, t.kai, id, first, 1)).toBe(2);
		const late = { ...demoMapping('two-deck'), name: 'Kai set', tempo: 90 };
		const error = await saveVersion(t.db, t.kai, id, late, 1).catch((e) => e);
		expect(error).toBeInstanceOf(VersionConflict);
		expect(error.status).toBe(409);
		expect(error.newest.version).toBe(2);
		expect(error.newest.document.tempo).toBe(126);
		const now = await getMapping(t.db, t.kai, id);
		expect(now.version).toBe(2);
		expect(now.document.tempo).toBe(126);
		expect(await listVersions(t.db, t.kai, id)).toHaveLength(2);
	});

	it('renames as a new version', async () => {
		const id = await createMapping(t.db, t.kai, { document: demoMapping('two-deck'), name: 'Kai set' });
		expect(await renameMapping(t.db, t.kai, id, 'Friday set')).toBe(2);
		const m = await getMapping(t.db, t.kai, id);
		expect([m.name, m.document.name]).toEqual(['Friday set', 'Friday set']);
	});
});

describe('forking', () => {
	it('copies a public mapping into a private one of your own and leaves the original alone', async () => {
		const demo = (await listMappings(t.db, t.kai)).find((m) => m.name === 'Two-deck pad set')!;
		const id = await forkMapping(t.db, t.kai, demo.id);
		const fork = await getMapping(t.db, t.kai, id);
		expect(fork.mine).toBe(true);
		expect(fork.visibility).toBe('private');
		expect(fork.document.bindings).toEqual((await getMapping(t.db, t.kai, demo.id)).document.bindings);
		await expect(saveVersion(t.db, t.kai, demo.id, fork.document, 1)).rejects.toMatchObject({ status: 403 });
	});

	it('cannot fork someone’s private mapping', async () => {
		const id = await createMapping(t.db, t.lena, { document: demoMapping('two-deck'), name: 'Lena set' });
		await expect(forkMapping(t.db, t.kai, id)).rejects.toMatchObject({ status: 404 });
	});
});

describe('learned controller layouts', () => {
	const layout = (name: string, note = 60) => ({
		name,
		rows: 1,
		cols: 2,
		inputs: [0, 1].map((i) => ({ id: `p${i}`, kind: 'pad', channel: 10, note: note + i, row: 0, col: i }))
	});

	it('keeps one layout per name for its owner only', async () => {
		await saveLayout(t.db, t.kai, layout('Bench pads'));
		await saveLayout(t.db, t.kai, layout('Bench pads', 70));
		const kai = await listLayouts(t.db, t.kai);
		expect(kai).toHaveLength(1);
		expect(kai[0].profile.inputs[0].note).toBe(70);
		expect(await listLayouts(t.db, t.lena)).toEqual([]);
		await expect(deleteLayout(t.db, t.lena, kai[0].id)).rejects.toMatchObject({ status: 404 });
		await deleteLayout(t.db, t.kai, kai[0].id);
		expect(await listLayouts(t.db, t.kai)).toEqual([]);
	});

	it('refuses a layout whose inputs share an id, saying where', async () => {
		const bad = layout('Twins');
		bad.inputs[1].id = 'p0';
		const error = await saveLayout(t.db, t.kai, bad).catch((e) => e);
		expect(error.status).toBe(400);
		expect(error.problems[0]).toMatchObject({ path: 'inputs[1].id', message: 'another input is already called "p0"' });
		expect(await listLayouts(t.db, t.kai)).toEqual([]);
	});
});
