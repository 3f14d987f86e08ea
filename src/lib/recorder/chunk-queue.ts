// The recorder's outbox. Events are cut into numbered chunks; each chunk is kept in the browser
// before it is sent and deleted only once the server confirms it. The server keeps a chunk once
// per number, so sending again after a lost answer, a reload or an outage never doubles an event.
// The recording's own record (next chunk number, event count) lives in synchronous storage
// (localStorage), so a page closing mid-write can never hand out a chunk number twice; chunks
// cut while the page is closing are stashed there too, as IndexedDB writes may not finish then.
import { createStore, del, entries, set, type UseStore } from 'idb-keyval';
import type { SessionEvent } from '$lib/engine';

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

export type SendChunk = (sessionId: string, chunk: Chunk) => Promise<void>;

export type SyncStore = Pick<Storage, 'getItem' | 'setItem' | 'removeItem'> & {
	key(i: number): string | null;
	readonly length: number;
};

const PREFIX = 'padproof.recording.';
const activeKey = (mappingId: string) => `${PREFIX}active:${mappingId}`;
const chunkKey = (sessionId: string, seq: number) => `chunk:${sessionId}:${String(seq).padStart(9, '0')}`;

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

	/** Numbers a chunk and keeps it in IndexedDB until the server has it. */
	async enqueue(recording: ActiveRecording, events: SessionEvent[]): Promise<Chunk> {
		const chunk = this.#take(recording, events);
		await set(chunkKey(recording.sessionId, chunk.seq), chunk, this.#store);
		return chunk;
	}

	/** The same, synchronously, for a page that is closing (kept in localStorage). */
	stash(recording: ActiveRecording, events: SessionEvent[]): Chunk {
		const chunk = this.#take(recording, events);
		this.#sync.setItem(PREFIX + chunkKey(recording.sessionId, chunk.seq), JSON.stringify(chunk));
		return chunk;
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

	/** Sends every waiting chunk in order; stops at the first failure. Returns how many are still waiting. */
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
			} catch {
				return waiting.length - i;
			}
			const key = chunkKey(sessionId, waiting[i].seq);
			await del(key, this.#store);
			this.#sync.removeItem(PREFIX + key);
		}
		return 0;
	}
}
