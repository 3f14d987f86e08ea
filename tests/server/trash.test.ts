import { demoMapping, padId, type SessionEvent } from '$lib/engine';
import { createMapping, deleteMapping, getMapping, listMappings, setVisibility } from '$lib/server/mappings';
import { deleteRehearsal, getRehearsal, importSession, listRehearsals, sessionDocument } from '$lib/server/rehearsals';
import { listTrash, purgeTrash, restoreFromTrash } from '$lib/server/trash';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { demoDatabase } from './factories';

let t: Awaited<ReturnType<typeof demoDatabase>>;
beforeEach(async () => (t = await demoDatabase()));
afterEach(() => t.close());

const DAY = 24 * 60 * 60 * 1000;
const later = (days: number) => new Date(Date.now() + days * DAY);
const note = (t: number, pad: number, on: boolean): SessionEvent => ({
	t,
	midi: [on ? 0x90 : 0x80, 35 + pad, on ? 100 : 0],
	input: { input: padId(pad), type: on ? 'press' : 'release' }
});
// Two fingers on the broken row's top row (pads 13 and 14), the first lifted early: one dropout.
const chord = {
	version: 1,
	tempo: 124,
	startedAt: '2026-03-02T18:30:00.000Z',
	events: [note(1000, 13, true), note(1200, 14, true), note(1500, 13, false), note(2000, 14, false)]
};

const demoId = async (name: string) => (await listMappings(t.db, t.kai)).find((m) => m.name === name)!.id;

describe('the trash', () => {
	it('keeps a deleted session for 30 days and restores it with its events', async () => {
		const id = await importSession(t.db, t.kai, await demoId('Broken stutter row'), chord, 'Chord');
		await deleteRehearsal(t.db, t.kai, id);
		expect((await listRehearsals(t.db, t.kai)).map((s) => s.id)).not.toContain(id);
		await expect(sessionDocument(t.db, t.kai, id)).rejects.toMatchObject({ status: 404 });
		const [item] = await listTrash(t.db, t.kai);
		expect(item).toMatchObject({ kind: 'session', id, name: 'Chord', daysLeft: 30 });
		expect(await listTrash(t.db, t.lena)).toEqual([]);

		await expect(restoreFromTrash(t.db, t.lena, 'session', id)).rejects.toMatchObject({ status: 404 });
		expect(await restoreFromTrash(t.db, t.kai, 'session', id)).toBe('Chord');
		expect((await sessionDocument(t.db, t.kai, id)).session.events).toHaveLength(4);
		expect(await listTrash(t.db, t.kai)).toEqual([]);
	});

	it('purges a session only after 30 days', async () => {
		const id = await importSession(t.db, t.kai, await demoId('Broken stutter row'), chord, 'Chord');
		await deleteRehearsal(t.db, t.kai, id);
		expect(await purgeTrash(t.db, later(29))).toMatchObject({ sessions: 0 });
		expect(await listTrash(t.db, t.kai, later(29))).toMatchObject([{ id, daysLeft: 1 }]);
		expect(await purgeTrash(t.db, later(31))).toMatchObject({ sessions: 1 });
		await expect(restoreFromTrash(t.db, t.kai, 'session', id)).rejects.toMatchObject({ status: 404 });
	});

	it('purges a deleted mapping nobody recorded with after 30 days', async () => {
		const id = await createMapping(t.db, t.kai, { document: demoMapping('two-deck'), name: 'Scratch copy' });
		await deleteMapping(t.db, t.kai, id);
		expect((await listMappings(t.db, t.kai)).map((m) => m.id)).not.toContain(id);
		expect(await listTrash(t.db, t.kai)).toMatchObject([{ kind: 'mapping', id, name: 'Scratch copy' }]);
		expect(await purgeTrash(t.db, later(31))).toMatchObject({ mappings: 1 });
		await expect(restoreFromTrash(t.db, t.kai, 'mapping', id)).rejects.toMatchObject({ status: 404 });
	});

	it('restores a deleted mapping to its owner’s list', async () => {
		const id = await createMapping(t.db, t.kai, { document: demoMapping('two-deck'), name: 'Kai set' });
		await deleteMapping(t.db, t.kai, id);
		await restoreFromTrash(t.db, t.kai, 'mapping', id);
		expect((await getMapping(t.db, t.kai, id)).name).toBe('Kai set');
	});
});

describe('deleting a mapping others use', () => {
	it('refuses to delete a demo mapping, even for its owner', async () => {
		const demo = (await listMappings(t.db, t.teacher)).find((m) => m.demo)!;
		await expect(deleteMapping(t.db, t.teacher, demo.id)).rejects.toMatchObject({ status: 403 });
		expect((await getMapping(t.db, t.kai, demo.id)).id).toBe(demo.id);
	});

	it('leaves other users’ sessions replaying with their findings, also after the purge', async () => {
		const shared = await createMapping(t.db, t.kai, { document: demoMapping('broken-row'), name: 'Kai row' });
		await setVisibility(t.db, t.kai, shared, 'public');
		const lenas = await importSession(t.db, t.lena, shared, chord, 'Lena on Kai row');
		const before = await getRehearsal(t.db, t.lena, lenas);
		expect(before.row.findingCount).toBe(1);

		await deleteMapping(t.db, t.kai, shared);
		expect((await listMappings(t.db, t.lena)).map((m) => m.id)).not.toContain(shared);
		await purgeTrash(t.db, later(31));
		const after = await getRehearsal(t.db, t.lena, lenas);
		expect(after.mapping).toEqual(before.mapping);
		expect(after.row.findingCount).toBe(1);
		// Out of the owner's trash after 30 days, but kept for the session that replays against it.
		expect(await listTrash(t.db, t.kai, later(31))).toEqual([]);
	});
});

describe('importing the wrong kind of file', () => {
	it('says a mapping file is a mapping file and saves nothing', async () => {
		const before = (await listRehearsals(t.db, t.kai)).length;
		const mappingDoc = demoMapping('two-deck');
		await expect(importSession(t.db, t.kai, await demoId('Two-deck pad set'), mappingDoc)).rejects.toMatchObject({
			status: 400,
			message: 'This is a mapping file, not a session. Import it on the Mappings page.'
		});
		expect((await listRehearsals(t.db, t.kai)).length).toBe(before);
	});
});
