// The recorder's outbox. Events are cut into numbered chunks; each chunk is kept in the browser
// before it is sent and deleted only once the server confirms it. The server keeps a chunk once
// per number, so sending again after a lost answer, a reload or an outage never doubles an event.
// The recording's own record (next chunk number, event count) lives in synchronous storage
// (localStorage), so a page closing mid-write can never hand out a chunk number twice; chunks
// cut while the page is closing are stashed there too, as IndexedDB writes may not finish then.
// A chunk the server refuses for good (4xx) is moved aside with the server's reason, shown to the
// person and kept for download, and the queue goes on with the next chunk.
import { createStore, del, entries, set, type UseStore } from 'idb-keyval';
import type { SessionEvent } from '$lib/engine';
import { CHUNK_MAX_EVENTS, CHUNK_TARGET_BYTES } from './limits';

export interface ActiveRecording {
	sessionId: string;
	mappingId: string;
	name: string;
	startEpoch: number; // ms since 1970 when recording started; survives a reload
	nextSeq: number;
	eventCount: number;
}

export interface Chunk {
	seq: number;
	events: SessionEvent[];
}

export interface RefusedChunk extends Chunk {
	reason: string;
}

/** Thrown by a SendChunk when the server refuses a chunk for good: sending it again cannot help. */
export class ChunkRefused extends Error {}

export type SendChunk = (sessionId: string, chunk: Chunk) => Promise<void>;

const encoder = new TextEncoder();
// {"seq":<up to 10 digits>,"events":[]} around the events, and a comma between two of them.
const ENVELOPE_BYTES = 32;

/**
 * Cuts events into chunk-sized runs in order: at most `maxEvents` each and at most `maxBytes` of
 * JSON body (one event larger than that alone still goes in a chunk of its own).
 */
export function splitEvents(
	events: SessionEvent[],
	maxEvents = CHUNK_MAX_EVENTS,
	maxBytes = CHUNK_TARGET_BYTES
): SessionEvent[][] {
	const runs: SessionEvent[][] = [];
	let run: SessionEvent[] = [];
	let bytes = ENVELOPE_BYTES;
	for (const event of events) {
		const size = encoder.encode(JSON.stringify(event)).length + 1;
		if (run.length && (run.length >= maxEvents || bytes + size > maxBytes)) {
			runs.push(run);
			run = [];
			bytes = ENVELOPE_BYTES;
		}
		run.push(event);
		bytes += size;
	}
	if (run.length) runs.push(run);
	return runs;
}

export type SyncStore = Pick<Storage, 'getItem' | 'setItem' | 'removeItem'> & {
	key(i: number): string | null;
	readonly length: number;
};

const PREFIX = 'padproof.recording.';
const activeKey = (mappingId: string) => `${PREFIX}active:${mappingId}`;
const chunkKey = (sessionId: string, seq: number) => `chunk:${sessionId}:${String(seq).padStart(9, '0')}`;
const refusedKey = (sessionId: string, seq: number) => `refused:${sessionId}:${String(seq).padStart(9, '0')}`;

export class ChunkQueue {
	#store: UseStore;
	#sync: SyncStore;
	#sending: Promise<number> | null = null;

	constructor(
		readonly send: SendChunk,
		options: { store?: UseStore; sync?: SyncStore } = {}
	) {
		this.#store = options.store ?? createStore('padproof-recorder', 'outbox');
		this.#sync = options.sync ?? globalThis.localStorage;
	}

	active(mappingId: string): ActiveRecording | undefined {
		const raw = this.#sync.getItem(activeKey(mappingId));
		return raw ? (JSON.parse(raw) as ActiveRecording) : undefined;
	}

	saveActive(recording: ActiveRecording): void {
		this.#sync.setItem(activeKey(recording.mappingId), JSON.stringify(recording));
	}

	clearActive(mappingId: string): void {
		this.#sync.removeItem(activeKey(mappingId));
	}

	#take(recording: ActiveRecording, events: SessionEvent[]): Chunk {
		const chunk = { seq: recording.nextSeq, events };
		recording.nextSeq += 1;
		recording.eventCount += events.length;
		this.saveActive(recording);
		return chunk;
	}

	/** Cuts events into numbered chunks under the server's limits and keeps them in IndexedDB until the server has them. */
	async enqueue(recording: ActiveRecording, events: SessionEvent[]): Promise<Chunk[]> {
		const chunks = splitEvents(events).map((run) => this.#take(recording, run));
		for (const chunk of chunks) await set(chunkKey(recording.sessionId, chunk.seq), chunk, this.#store);
		return chunks;
	}

	/** The same, synchronously, for a page that is closing or a room that is left (kept in localStorage). */
	stash(recording: ActiveRecording, events: SessionEvent[]): Chunk[] {
		const chunks = splitEvents(events).map((run) => this.#take(recording, run));
		for (const chunk of chunks)
			this.#sync.setItem(PREFIX + chunkKey(recording.sessionId, chunk.seq), JSON.stringify(chunk));
		return chunks;
	}

	/** Chunks of this session the server refused for good, with its reasons, in number order. */
	async refused(sessionId: string): Promise<RefusedChunk[]> {
		const prefix = `refused:${sessionId}:`;
		return (await entries<string, RefusedChunk>(this.#store))
			.filter(([key]) => typeof key === 'string' && key.startsWith(prefix))
			.map(([, c]) => c)
			.sort((a, b) => a.seq - b.seq);
	}

	#stashed(sessionId: string): Chunk[] {
		const prefix = `${PREFIX}chunk:${sessionId}:`;
		const found: Chunk[] = [];
		for (let i = 0; i < this.#sync.length; i++) {
			const key = this.#sync.key(i);
			if (key?.startsWith(prefix)) found.push(JSON.parse(this.#sync.getItem(key)!) as Chunk);
		}
		return found;
	}

	async unsent(sessionId: string): Promise<Chunk[]> {
		const prefix = `chunk:${sessionId}:`;
		const kept = (await entries<string, Chunk>(this.#store))
			.filter(([key]) => typeof key === 'string' && key.startsWith(prefix))
			.map(([, c]) => c);
		const bySeq = new Map([...kept, ...this.#stashed(sessionId)].map((c) => [c.seq, c]));
		return [...bySeq.values()].sort((a, b) => a.seq - b.seq);
	}

	/**
	 * Sends every waiting chunk in order. A chunk the server refuses for good is moved aside and the
	 * next one is sent; any other failure (offline, server busy) stops the round. Returns how many
	 * chunks are still waiting.
	 */
	flush(sessionId: string): Promise<number> {
		// One flush at a time, so a chunk is never in flight twice from this tab.
		this.#sending ??= this.#flush(sessionId).finally(() => (this.#sending = null));
		return this.#sending;
	}

	async #flush(sessionId: string): Promise<number> {
		const waiting = await this.unsent(sessionId);
		for (let i = 0; i < waiting.length; i++) {
			try {
				await this.send(sessionId, waiting[i]);
			} catch (e) {
				if (!(e instanceof ChunkRefused)) return waiting.length - i;
				const refused: RefusedChunk = { ...waiting[i], reason: e.message };
				await set(refusedKey(sessionId, refused.seq), refused, this.#store);
			}
			const key = chunkKey(sessionId, waiting[i].seq);
			await del(key, this.#store);
			this.#sync.removeItem(PREFIX + key);
		}
		return 0;
	}
}
