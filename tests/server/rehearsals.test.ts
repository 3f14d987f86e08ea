import { demoMapping, padId, replay, sessionStart, type SessionEvent } from '$lib/engine';
import { openDatabase } from '$lib/server/db';
import { createMapping, listMappings, saveVersion } from '$lib/server/mappings';
import { buildReplay } from '$lib/replay/model';
import {
	appendChunk,
	createRehearsal,
	finishRehearsal,
	getRehearsal,
	importSession,
	listRehearsals,
	sessionDocument
} from '$lib/server/rehearsals';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { demoDatabase } from './factories';

import { stopAnalysisWorkers } from '$lib/server/analysis/pool';
import { afterAll } from 'vitest';

// The first finish starts an analysis worker (through tsx in tests: a few seconds).
afterAll(() => stopAnalysisWorkers());
let t: Awaited<ReturnType<typeof demoDatabase>>;
beforeEach(async () => (t = await demoDatabase()));
afterEach(() => t.close());

const demoId = async (name: string) => (await listMappings(t.db, t.kai)).find((m) => m.name === name)!.id;
const press = (t: number, pad: number): SessionEvent => ({
	t,
	midi: [0x90, 35 + pad, 100],
	input: { input: padId(pad), type: 'press' }
});
const release = (t: number, pad: number): SessionEvent => ({
	t,
	midi: [0x80, 35 + pad, 0],
	input: { input: padId(pad), type: 'release' }
});

describe('recording a session in chunks', () => {
	it('stores a resent chunk once', async () => {
		const { id } = await createRehearsal(t.db, t.kai, { mappingId: await demoId('Two-deck pad set'), tempo: 120 });
		const chunk = { seq: 0, events: [press(10, 1), release(200, 1)] };
		expect(await appendChunk(t.db, t.kai, id, chunk)).toMatchObject({ stored: true, eventCount: 2 });
		expect(await appendChunk(t.db, t.kai, id, chunk)).toMatchObject({ stored: false, duplicate: true, eventCount: 2 });
		expect((await sessionDocument(t.db, t.kai, id)).session.events).toHaveLength(2);
	});

	it('counts every chunk once when many arrive at once, resends and late ones included', async () => {
		const { id } = await createRehearsal(t.db, t.kai, { mappingId: await demoId('Two-deck pad set'), tempo: 120 });
		const chunk = (seq: number) => ({
			seq,
			events: [press(seq * 250, 1 + (seq % 4)), release(seq * 250 + 100, 1 + (seq % 4))]
		});
		// 40 chunks in reverse order, every 4th sent three times, all without waiting for an answer.
		const sends = Array.from({ length: 40 }, (_, i) => 39 - i).flatMap((seq) => (seq % 4 ? [seq] : [seq, seq, seq]));
		const answers = await Promise.all(sends.map((seq) => appendChunk(t.db, t.kai, id, chunk(seq))));
		expect(answers.filter((a) => a.stored)).toHaveLength(40);
		expect(answers.filter((a) => a.duplicate)).toHaveLength(20);
		const { row, session } = await sessionDocument(t.db, t.kai, id);
		expect(row.eventCount).toBe(80);
		expect(row.durationMs).toBe(39 * 250 + 100);
		expect(session.events).toHaveLength(80);
		expect(session.events.map((e) => e.t)).toEqual([...session.events.map((e) => e.t)].sort((a, b) => a - b));
	});

	it('assembles chunks that arrived out of order in time order', async () => {
		const { id } = await createRehearsal(t.db, t.kai, { mappingId: await demoId('Two-deck pad set'), tempo: 120 });
		await appendChunk(t.db, t.kai, id, { seq: 1, events: [press(2100, 2), release(2300, 2)] });
		await appendChunk(t.db, t.kai, id, { seq: 0, events: [press(100, 1), release(400, 1)] });
		const { session, row } = await sessionDocument(t.db, t.kai, id);
		expect(session.events.map((e) => e.t)).toEqual([100, 400, 2100, 2300]);
		expect(row.durationMs).toBe(2300);
	});

	it('keeps every event across a server restart (a new connection to the same file)', async () => {
		const { id } = await createRehearsal(t.db, t.kai, { mappingId: await demoId('Two-deck pad set'), tempo: 120 });
		await appendChunk(t.db, t.kai, id, { seq: 0, events: [press(100, 1)] });
		t.client.close();
		const reopened = openDatabase(`file:${t.file}`);
		await appendChunk(reopened.db, t.kai, id, { seq: 0, events: [press(100, 1)] });
		await appendChunk(reopened.db, t.kai, id, { seq: 1, events: [release(900, 1)] });
		expect((await sessionDocument(reopened.db, t.kai, id)).session.events.map((e) => e.t)).toEqual([100, 900]);
		reopened.client.close();
		t.client = openDatabase(`file:${t.file}`).client;
	});

	it("refuses another user's session as if it did not exist", async () => {
		const { id } = await createRehearsal(t.db, t.kai, { mappingId: await demoId('Two-deck pad set'), tempo: 120 });
		await expect(appendChunk(t.db, t.lena, id, { seq: 0, events: [] })).rejects.toMatchObject({ status: 404 });
	});

	it('counts the dropout of the broken row when the session is finished', { timeout: 60_000 }, async () => {
		// Broken stutter row (top row pads 13–16): press 13, press 14, release 13 cuts the effect
		// while 14 is held — the dropout the held-pad counter exists to prevent (common practice).
		const { id } = await createRehearsal(t.db, t.kai, { mappingId: await demoId('Broken stutter row'), tempo: 120 });
		await appendChunk(t.db, t.kai, id, {
			seq: 0,
			events: [press(1000, 13), press(1200, 14), release(1500, 13), release(1800, 14)]
		});
		expect(await finishRehearsal(t.db, t.kai, id, 'Chord test')).toEqual({ findings: 1 });
		const [row] = await listRehearsals(t.db, t.kai, 'chord');
		expect(row).toMatchObject({ status: 'saved', findingCount: 1, eventCount: 4, name: 'Chord test' });
	});

	it(
		'stores the length the replay page shows, quantized landings included, with the mapping version played',
		{ timeout: 60_000 },
		async () => {
			// Every pad waits for the next quarter note: at 120 BPM a beat is 500 ms (60000 / BPM, REFERENCES.md).
			const base = demoMapping('two-deck');
			const quantized = { ...base, bindings: base.bindings.map((b) => ({ ...b, quantize: '1/4' as const })) };
			const mappingId = await createMapping(t.db, t.kai, { document: quantized, name: 'On the beat' });
			const { id } = await createRehearsal(t.db, t.kai, { mappingId, tempo: 120 });
			await appendChunk(t.db, t.kai, id, { seq: 0, events: [press(1010, 1), release(1100, 1)] });
			// A later version of the mapping acts at once; the session keeps the version it was played with.
			await saveVersion(t.db, t.kai, mappingId, base, 1);
			await finishRehearsal(t.db, t.kai, id, 'Late landing');
			const [row] = await listRehearsals(t.db, t.kai, 'late landing');
			const { session, mapping } = await getRehearsal(t.db, t.kai, id);
			expect(mapping!.bindings[0].quantize).toBe('1/4');
			expect(buildReplay(mapping, session).length).toBe(1500);
			expect(row.durationMs).toBe(1500);
		}
	);
});

describe('what a recording refuses', () => {
	it(
		'refuses a chunk after the session was finished with 409, and keeps the session as it was',
		{ timeout: 60_000 },
		async () => {
			const { id } = await createRehearsal(t.db, t.kai, { mappingId: await demoId('Two-deck pad set'), tempo: 120 });
			await appendChunk(t.db, t.kai, id, { seq: 0, events: [press(10, 1), release(200, 1)] });
			await finishRehearsal(t.db, t.kai, id);
			await expect(appendChunk(t.db, t.kai, id, { seq: 1, events: [press(300, 2)] })).rejects.toMatchObject({
				status: 409,
				message: expect.stringMatching(/finished/)
			});
			const { row, session } = await sessionDocument(t.db, t.kai, id);
			expect(session.events).toHaveLength(2);
			expect(row.eventCount).toBe(2);
		}
	);

	it('answers an identical resend after finishing as a duplicate, not a refusal', { timeout: 60_000 }, async () => {
		const { id } = await createRehearsal(t.db, t.kai, { mappingId: await demoId('Two-deck pad set'), tempo: 120 });
		const chunk = { seq: 0, events: [press(10, 1), release(200, 1)] };
		await appendChunk(t.db, t.kai, id, chunk);
		await finishRehearsal(t.db, t.kai, id);
		expect(await appendChunk(t.db, t.kai, id, chunk)).toMatchObject({ duplicate: true, eventCount: 2 });
	});

	it('refuses a resent chunk number with different content with 409 instead of dropping it silently', async () => {
		const { id } = await createRehearsal(t.db, t.kai, { mappingId: await demoId('Two-deck pad set'), tempo: 120 });
		await appendChunk(t.db, t.kai, id, { seq: 0, events: [press(10, 1), release(200, 1)] });
		await expect(
			appendChunk(t.db, t.kai, id, { seq: 0, events: [press(10, 1), release(250, 1)] })
		).rejects.toMatchObject({ status: 409, message: expect.stringMatching(/chunk 0/) });
		expect((await sessionDocument(t.db, t.kai, id)).session.events.map((e) => e.t)).toEqual([10, 200]);
	});

	it('refuses events past the per-session limit with 413 and keeps what was recorded', async () => {
		process.env.PADPROOF_MAX_SESSION_EVENTS = '3';
		try {
			const { id } = await createRehearsal(t.db, t.kai, { mappingId: await demoId('Two-deck pad set'), tempo: 120 });
			await appendChunk(t.db, t.kai, id, { seq: 0, events: [press(10, 1), release(200, 1)] });
			await expect(
				appendChunk(t.db, t.kai, id, { seq: 1, events: [press(300, 2), release(400, 2)] })
			).rejects.toMatchObject({ status: 413, message: expect.stringMatching(/at most 3 events/) });
			expect((await sessionDocument(t.db, t.kai, id)).row.eventCount).toBe(2);
		} finally {
			delete process.env.PADPROOF_MAX_SESSION_EVENTS;
		}
	});

	it('refuses a new session past the per-person limit with 409', async () => {
		process.env.PADPROOF_MAX_SESSIONS = '2';
		try {
			const mappingId = await demoId('Two-deck pad set');
			await createRehearsal(t.db, t.kai, { mappingId, tempo: 120 });
			await createRehearsal(t.db, t.kai, { mappingId, tempo: 120 });
			await expect(createRehearsal(t.db, t.kai, { mappingId, tempo: 120 })).rejects.toMatchObject({
				status: 409,
				message: expect.stringMatching(/2 sessions/)
			});
			// Someone else is not held back by Kai's library.
			await expect(createRehearsal(t.db, t.lena, { mappingId, tempo: 120 })).resolves.toHaveProperty('id');
		} finally {
			delete process.env.PADPROOF_MAX_SESSIONS;
		}
	});
});

describe('importing a session document', () => {
	it('refuses a bad file with a readable reason and stores nothing', async () => {
		const mappingId = await demoId('Two-deck pad set');
		const bad = { version: 1, tempo: 120, startedAt: '2026-12-01T20:00:00Z', events: [press(500, 1), release(100, 1)] };
		await expect(importSession(t.db, t.kai, mappingId, bad)).rejects.toMatchObject({
			status: 400,
			message: expect.stringMatching(/time order/)
		});
		expect(await listRehearsals(t.db, t.kai)).toEqual([]);
	});

	it('saves a good file as a finished session', { timeout: 60_000 }, async () => {
		const mappingId = await demoId('Two-deck pad set');
		const doc = { version: 1, tempo: 124, startedAt: '2026-12-01T20:00:00Z', events: [press(500, 1), release(900, 1)] };
		const id = await importSession(t.db, t.kai, mappingId, doc, 'From file');
		const { session, row } = await sessionDocument(t.db, t.kai, id);
		expect(row.status).toBe('saved');
		// A version 1 file is kept as version 2: beat 0 at 0 and its tempo constant.
		expect(session).toEqual({
			...doc,
			version: 2,
			clock: { zero: 0, tempos: [{ at: 0, bpm: 124 }] },
			mapping: 'Two-deck pad set'
		});
	});
});

describe('a take that starts mid-play', () => {
	it('keeps the starting rig and beat clock, and counts no overflow that never happened', async () => {
		const held = replay(demoMapping('two-deck'), [{ t: 0, input: padId(13), type: 'press' }]).final;
		const start = sessionStart(held, { zero: 250, tempos: [{ at: 250, bpm: 124 }] }, 1000);
		const mappingId = await demoId('Two-deck pad set');
		const { id } = await createRehearsal(t.db, t.kai, { mappingId, tempo: 124, ...start });
		await appendChunk(t.db, t.kai, id, { seq: 0, events: [release(300, 13)] });
		const later = { zero: -750, tempos: [...start.clock.tempos, { at: 200, bpm: 100 }] };
		expect(await finishRehearsal(t.db, t.kai, id, undefined, later)).toEqual({ findings: 0 });
		const { session } = await sessionDocument(t.db, t.kai, id);
		expect(session.clock).toEqual(later);
		expect(session.initial?.held).toEqual([padId(13)]);
		expect(session.initial?.counters).toEqual(held.counters);
	});
});
