// The recorder's outbox. Events are cut into numbered chunks; each chunk is written to IndexedDB
// before it is sent and deleted only once the server confirms it. The server keeps a chunk once
// per number, so sending again after a lost answer, a reload or an outage never doubles an event.
import { createStore, del, entries, get, set, type UseStore } from 'idb-keyval';
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

const activeKey = (mappingId: string) => `active:${mappingId}`;
const chunkKey = (sessionId: string, seq: number) => `chunk:${sessionId}:${String(seq).padStart(9, '0')}`;

export class ChunkQueue {
	#store: UseStore;
	#sending: Promise<number> | null = null;

	constructor(
		readonly send: SendChunk,
		store?: UseStore
	) {
		this.#store = store ?? createStore('padproof-recorder', 'outbox');
	}

	active(mappingId: string): Promise<ActiveRecording | undefined> {
		return get<ActiveRecording>(activeKey(mappingId), this.#store);
	}

	saveActive(recording: ActiveRecording): Promise<void> {
		return set(activeKey(recording.mappingId), recording, this.#store);
	}

	clearActive(mappingId: string): Promise<void> {
		return del(activeKey(mappingId), this.#store);
	}

	/** Numbers a chunk and keeps it until the server has it. */
	async enqueue(recording: ActiveRecording, events: SessionEvent[]): Promise<Chunk> {
		const chunk = { seq: recording.nextSeq, events };
		recording.nextSeq += 1;
		recording.eventCount += events.length;
		await set(chunkKey(recording.sessionId, chunk.seq), chunk, this.#store);
		await this.saveActive(recording);
		return chunk;
	}

	async unsent(sessionId: string): Promise<Chunk[]> {
		const prefix = `chunk:${sessionId}:`;
		const all = await entries<string, Chunk>(this.#store);
		return all
			.filter(([key]) => typeof key === 'string' && key.startsWith(prefix))
			.map(([, chunk]) => chunk)
			.sort((a, b) => a.seq - b.seq);
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
			await del(chunkKey(sessionId, waiting[i].seq), this.#store);
		}
		return 0;
	}
}
