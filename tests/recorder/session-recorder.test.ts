import 'fake-indexeddb/auto';
import { ChunkQueue, splitEvents, type SyncStore } from '$lib/recorder/chunk-queue';
import { CHUNK_MAX_EVENTS, CHUNK_TARGET_BYTES } from '$lib/recorder/limits';
import { SessionRecorder } from '$lib/recorder/session-recorder.svelte';
import { createStore } from 'idb-keyval';
import { afterEach, describe, expect, it } from 'vitest';
import { fakeServer } from './fake-server';

let stores = 0;
const recorders: SessionRecorder[] = [];
afterEach(() => recorders.splice(0).forEach((r) => r.dispose()));

/** localStorage's interface over a Map; a "reload" opens the same one again. */
function memoryStorage(): SyncStore {
	const items = new Map<string, string>();
	return {
		getItem: (k) => items.get(k) ?? null,
		setItem: (k, v) => void items.set(k, v),
		removeItem: (k) => void items.delete(k),
		key: (i) => [...items.keys()][i] ?? null,
		get length() {
			return items.size;
		}
	};
}
const syncStores = new Map<string, SyncStore>();

/** A recorder as a page makes one, with its own outbox stores (a reload opens the same stores again). */
function recorderFor(server: ReturnType<typeof fakeServer>, storeName: string) {
	if (!syncStores.has(storeName)) syncStores.set(storeName, memoryStorage());
	const recorder = new SessionRecorder({
		mappingId: 'm1',
		tempo: () => 120,
		flushEveryMs: 60_000,
		fetch: server.fetch,
		store: createStore(storeName, 'outbox'),
		sync: syncStores.get(storeName)
	});
	recorders.push(recorder);
	return recorder;
}

const press = (t: number, pad = 'pad-1') => ({
	t,
	midi: [0x90, 36, 100],
	input: { input: pad, type: 'press' as const }
});

describe('ChunkQueue', () => {
	it('keeps chunks that could not be sent and sends them in order, once, later', async () => {
		const sent: number[] = [];
		let up = false;
		const queue = new ChunkQueue(
			async (_id, chunk) => {
				if (!up) throw new Error('offline');
				sent.push(chunk.seq);
			},
			{ store: createStore(`queue-test-${++stores}`, 'outbox'), sync: memoryStorage() }
		);
		const rec = { sessionId: 's1', mappingId: 'm1', name: 'x', startEpoch: 0, nextSeq: 0, eventCount: 0 };
		for (let i = 0; i < 3; i++) await queue.enqueue(rec, [{ t: i, input: null }]);
		expect(await queue.flush('s1')).toBe(3);
		up = true;
		expect(await queue.flush('s1')).toBe(0);
		expect(await queue.flush('s1')).toBe(0);
		expect(sent).toEqual([0, 1, 2]);
		expect(rec).toMatchObject({ nextSeq: 3, eventCount: 3 });
	});
});

describe('SessionRecorder', () => {
	it('records through an outage and the server ends with every event exactly once', async () => {
		const server = fakeServer();
		const recorder = recorderFor(server, `rec-${++stores}`);
		await recorder.start('Outage take');
		recorder.record(press(100));
		await recorder.flushNow();
		server.setOnline(false);
		recorder.record(press(200));
		recorder.record(press(300));
		await recorder.flushNow();
		expect(recorder.offline).toBe(true);
		expect(recorder.unsent).toBe(2);
		server.setOnline(true);
		recorder.record(press(400));
		const saved = await recorder.stop();
		expect(saved).toEqual({ id: 's1', findings: 0 });
		expect(server.events('s1').map((e) => e.t)).toEqual([100, 200, 300, 400]);
		expect(recorder.status).toBe('saved');
	});

	it('will not finish while events wait, and says so', async () => {
		const server = fakeServer();
		const recorder = recorderFor(server, `rec-${++stores}`);
		await recorder.start();
		recorder.record(press(50));
		server.setOnline(false);
		expect(await recorder.stop()).toBeNull();
		expect(recorder.status).toBe('recording');
		expect(recorder.error).toMatch(/still waiting for the server/);
		server.setOnline(true);
		expect(await recorder.stop()).toEqual({ id: 's1', findings: 0 });
		expect(server.events('s1')).toHaveLength(1);
	});

	it('resumes after a reload and delivers what the old page kept, without doubles', async () => {
		const server = fakeServer();
		const storeName = `rec-${++stores}`;
		const first = recorderFor(server, storeName);
		await first.start();
		first.record(press(10));
		await first.flushNow(); // delivered
		server.setOnline(false);
		first.record(press(20));
		await first.flushNow(); // kept in IndexedDB only
		first.dispose(); // the tab reloads

		server.setOnline(true);
		const second = recorderFor(server, storeName);
		expect(await second.resume()).toBe(true);
		expect(second.sessionId).toBe('s1');
		second.record(press(30));
		await second.stop();
		expect(server.events('s1').map((e) => e.t)).toEqual([10, 20, 30]);
		expect(await recorderFor(server, storeName).resume()).toBe(false);
	});

	it('keeps what a closing page hands off even when its delivery is lost, and never reuses its number', async () => {
		const server = fakeServer();
		const storeName = `rec-${++stores}`;
		const first = recorderFor(server, storeName);
		await first.start();
		first.record(press(10));
		first.record(press(20));
		server.setOnline(false); // the beacon is lost too
		first.leaving();
		first.dispose(); // the tab closes before any IndexedDB write could finish

		server.setOnline(true);
		const second = recorderFor(server, storeName);
		expect(await second.resume()).toBe(true);
		expect(second.eventCount).toBe(2);
		second.record(press(30));
		await second.stop();
		expect(server.events('s1').map((e) => e.t)).toEqual([10, 20, 30]);
	});

	it('sends a chunk the server already holds again without storing it twice', async () => {
		const server = fakeServer();
		const recorder = recorderFor(server, `rec-${++stores}`);
		await recorder.start();
		await server.fetch('/api/sessions/s1/chunks', {
			method: 'POST',
			body: JSON.stringify({ seq: 0, events: [press(5)] })
		});
		recorder.record(press(5));
		await recorder.stop();
		expect(server.events('s1')).toHaveLength(1);
		expect(server.posts).toBe(2);
	});

	it('cuts a burst into chunks under the server limits, and all of it arrives', async () => {
		const server = fakeServer();
		const recorder = recorderFor(server, `rec-${++stores}`);
		await recorder.start();
		const burst = 12_000;
		for (let i = 0; i < burst; i++)
			recorder.record({ ...press(i), input: { input: `pad-${1 + (i % 16)}`, type: 'press' } });
		expect(await recorder.stop()).toEqual({ id: 's1', findings: 0 });
		expect(server.events('s1')).toHaveLength(burst);
		expect(Math.max(...server.bodies)).toBeLessThanOrEqual(CHUNK_TARGET_BYTES);
		expect(server.bodies.length).toBeGreaterThan(burst / CHUNK_MAX_EVENTS);
	});

	it('does not stall behind a refused chunk: it shows it, keeps it, and sends the next ones', async () => {
		const server = fakeServer();
		const recorder = recorderFor(server, `rec-${++stores}`);
		await recorder.start();
		server.refuse(1);
		recorder.record(press(10));
		await recorder.flushNow(); // chunk 0
		recorder.record(press(20));
		recorder.record(press(30));
		await recorder.flushNow(); // chunk 1: refused
		recorder.record(press(40));
		await recorder.flushNow(); // chunk 2
		expect(server.events('s1').map((e) => e.t)).toEqual([10, 40]);
		expect(recorder.unsent).toBe(0);
		expect(recorder.refused).toEqual([
			{ seq: 1, events: [press(20), press(30)], reason: 'Chunk 1 is not acceptable.' }
		]);
		expect(await recorder.stop()).toEqual({ id: 's1', findings: 0 });
		expect(recorder.refused).toHaveLength(1); // still shown after saving, to download
	});

	it('keeps the events of a take left by an in-app link and delivers them when the room opens again', async () => {
		const server = fakeServer();
		const storeName = `rec-${++stores}`;
		const first = recorderFor(server, storeName);
		await first.start();
		first.record(press(10));
		await first.flushNow();
		first.record(press(20));
		first.record(press(30));
		first.dispose(); // the room is left by an in-app link: the page stays, the room is unmounted
		await first.settled();
		expect(server.events('s1').map((e) => e.t)).toEqual([10, 20, 30]);

		const second = recorderFor(server, storeName);
		expect(await second.resume()).toBe(true);
		expect(second.eventCount).toBe(3);
		second.record(press(40));
		await second.stop();
		expect(server.events('s1').map((e) => e.t)).toEqual([10, 20, 30, 40]);
	});
});

describe('splitEvents', () => {
	it('splits by event count and by bytes, keeping order', () => {
		const events = Array.from({ length: 25 }, (_, i) => press(i));
		const byCount = splitEvents(events, 10, 1 << 20);
		expect(byCount.map((c) => c.length)).toEqual([10, 10, 5]);
		const one = JSON.stringify(events[0]).length;
		const byBytes = splitEvents(events, 1000, 60 + one * 4);
		expect(byBytes.every((c) => JSON.stringify({ seq: 999_999_999, events: c }).length <= 60 + one * 4)).toBe(true);
		expect(byBytes.flat()).toEqual(events);
		expect(splitEvents([], 10, 100)).toEqual([]);
	});
});
