// Records a rehearsal without loss: events are cut into numbered chunks every 2 s and when the
// page is hidden (sent then with sendBeacon), kept in IndexedDB until the server confirms them,
// and sent again after an outage or a reload. A reload resumes the unfinished recording.
import type { SessionClock, SessionEvent, SessionStart } from '$lib/engine';
import type { UseStore } from 'idb-keyval';
import { ChunkQueue, type ActiveRecording, type Chunk, type SyncStore } from './chunk-queue';
import { uploadAudio } from './upload';

export type RecorderStatus = 'idle' | 'starting' | 'recording' | 'stopping' | 'saved' | 'failed';

export interface RecorderOptions {
	mappingId: string;
	tempo: () => number;
	/** The beat clock and rig when recording begins (asked at the take's first instant). */
	snapshot?: () => { clock: SessionClock; initial: SessionStart } | undefined;
	/** The take's beat clock with its tempo changes, sent when the recording ends. */
	clock?: () => SessionClock | undefined;
	flushEveryMs?: number;
	store?: UseStore; // IndexedDB store for the outbox (tests give their own)
	sync?: SyncStore; // synchronous storage for the recording's record (default localStorage)
	fetch?: typeof fetch;
}

class SendError extends Error {
	constructor(
		message: string,
		readonly permanent: boolean
	) {
		super(message);
	}
}

export class SessionRecorder {
	status = $state<RecorderStatus>('idle');
	sessionId = $state<string | null>(null);
	name = $state('');
	eventCount = $state(0);
	unsent = $state(0);
	offline = $state(false);
	error = $state<string | null>(null);
	uploadProgress = $state<number | null>(null);

	#options: RecorderOptions;
	#fetch: typeof fetch;
	#queue: ChunkQueue;
	#recording: ActiveRecording | null = null;
	#pending: SessionEvent[] = [];
	#timer: ReturnType<typeof setInterval> | undefined;
	#media: MediaRecorder | null = null;
	#audioParts: Blob[] = [];
	#onHidden = () => {
		if (document.visibilityState === 'hidden') this.leaving();
	};
	#onPageHide = () => this.leaving();

	constructor(options: RecorderOptions) {
		this.#options = options;
		this.#fetch = options.fetch ?? ((...args) => fetch(...args));
		this.#queue = new ChunkQueue((id, chunk) => this.#send(id, chunk), { store: options.store, sync: options.sync });
	}

	/** Milliseconds since the recording started, on the session clock (0 when not recording). */
	elapsed(): number {
		return this.#recording ? this.at(performance.now()) : 0;
	}

	/** Converts a performance.now() time (e.g. a MIDI message's timeStamp) to session time. */
	at(perfTime: number): number {
		if (!this.#recording) return 0;
		return Math.max(0, performance.timeOrigin + perfTime - this.#recording.startEpoch);
	}

	async start(name?: string): Promise<void> {
		if (this.status === 'recording' || this.status === 'starting') return;
		this.status = 'starting';
		this.error = null;
		try {
			const startedAt = new Date();
			const start = this.#options.snapshot?.();
			const response = await this.#json('/api/sessions', {
				mappingId: this.#options.mappingId,
				name: name?.trim() || undefined,
				tempo: this.#options.tempo(),
				startedAt: startedAt.toISOString(),
				...start
			});
			const { id, name: given } = response as { id: string; name: string };
			this.#recording = {
				sessionId: id,
				mappingId: this.#options.mappingId,
				name: given,
				startEpoch: startedAt.getTime(),
				nextSeq: 0,
				eventCount: 0
			};
			this.#queue.saveActive(this.#recording);
			this.#begin();
			this.#media?.start(1000);
		} catch (e) {
			this.status = 'failed';
			this.error = e instanceof Error ? e.message : String(e);
		}
	}

	/** Continues an unfinished recording of this mapping after a reload; true when there was one. */
	async resume(): Promise<boolean> {
		const active = this.#queue.active(this.#options.mappingId);
		if (!active) return false;
		this.#recording = active;
		this.eventCount = active.eventCount;
		this.#begin();
		await this.#tick();
		return true;
	}

	record(event: { midi?: number[]; input: SessionEvent['input']; t?: number }): void {
		if (!this.#recording || this.status !== 'recording') return;
		const t = Math.round((event.t ?? this.elapsed()) * 1000) / 1000;
		this.#pending.push(event.midi ? { t, midi: event.midi, input: event.input } : { t, input: event.input });
		this.eventCount += 1;
		this.unsent += 1;
	}

	async stop(name?: string): Promise<{ id: string; findings: number } | null> {
		const recording = this.#recording;
		if (!recording) return null;
		this.status = 'stopping';
		clearInterval(this.#timer);
		const audio = await this.#stopAudio();
		await this.#cut();
		const waiting = await this.#queue.flush(recording.sessionId);
		this.unsent = this.#pending.length + (await this.#countUnsent());
		if (waiting > 0) {
			this.status = 'recording';
			this.#timer = setInterval(() => void this.#tick(), this.#options.flushEveryMs ?? 2000);
			this.error = `${this.unsent} events are still waiting for the server. They are kept in this browser; press Stop again when the connection is back.`;
			return null;
		}
		try {
			const result = (await this.#json(
				`/api/sessions/${recording.sessionId}`,
				{ finish: true, name: name?.trim() || undefined, clock: this.#options.clock?.() },
				'PATCH'
			)) as { findings: number };
			if (audio) await this.#upload(recording.sessionId, audio);
			this.#queue.clearActive(recording.mappingId);
			this.#end();
			this.status = 'saved';
			this.error = null;
			return { id: recording.sessionId, findings: result.findings };
		} catch (e) {
			this.status = 'recording';
			this.error = e instanceof Error ? e.message : String(e);
			return null;
		}
	}

	/** Records the master output too; it is uploaded when the recording stops. */
	attachAudio(stream: MediaStream): void {
		if (typeof MediaRecorder === 'undefined') {
			this.error = 'This browser cannot record audio; the events are recorded as usual.';
			return;
		}
		const type = ['audio/webm;codecs=opus', 'audio/webm', 'audio/ogg'].find((t) => MediaRecorder.isTypeSupported(t));
		this.#media = new MediaRecorder(stream, type ? { mimeType: type } : undefined);
		this.#audioParts = [];
		this.#media.ondataavailable = (e) => e.data.size && this.#audioParts.push(e.data);
		if (this.status === 'recording') this.#media.start(1000);
	}

	dispose(): void {
		clearInterval(this.#timer);
		if (typeof document !== 'undefined') document.removeEventListener('visibilitychange', this.#onHidden);
		if (typeof window !== 'undefined') window.removeEventListener('pagehide', this.#onPageHide);
		if (this.#media?.state === 'recording') this.#media.stop();
	}

	#begin() {
		this.sessionId = this.#recording!.sessionId;
		this.name = this.#recording!.name;
		this.status = 'recording';
		this.#timer = setInterval(() => void this.#tick(), this.#options.flushEveryMs ?? 2000);
		if (typeof document !== 'undefined') document.addEventListener('visibilitychange', this.#onHidden);
		if (typeof window !== 'undefined') window.addEventListener('pagehide', this.#onPageHide);
	}

	#end() {
		this.dispose();
		this.#recording = null;
		this.unsent = 0;
	}

	async #cut(): Promise<Chunk | null> {
		if (!this.#recording || this.#pending.length === 0) return null;
		const events = this.#pending;
		this.#pending = [];
		return this.#queue.enqueue(this.#recording, events);
	}

	/** Sends what is waiting now instead of at the next 2-second tick. */
	flushNow(): Promise<void> {
		return this.#tick();
	}

	async #tick() {
		if (!this.#recording) return;
		await this.#cut();
		const waiting = await this.#queue.flush(this.#recording.sessionId);
		this.offline = waiting > 0;
		this.unsent = this.#pending.length + (waiting > 0 ? await this.#countUnsent() : 0);
	}

	async #countUnsent(): Promise<number> {
		if (!this.#recording) return 0;
		return (await this.#queue.unsent(this.#recording.sessionId)).reduce((n, c) => n + c.events.length, 0);
	}

	/**
	 * The page is being hidden or closed: keep the last events synchronously and hand them to the
	 * browser to deliver (sendBeacon outlives the page). Called by the page's own listeners.
	 */
	leaving() {
		const recording = this.#recording;
		if (!recording || this.#pending.length === 0) return;
		const chunk = this.#queue.stash(recording, this.#pending);
		this.#pending = [];
		globalThis.navigator?.sendBeacon?.(`/api/sessions/${recording.sessionId}/chunks`, JSON.stringify(chunk));
	}

	async #send(sessionId: string, chunk: Chunk): Promise<void> {
		let response: Response;
		try {
			response = await this.#fetch(`/api/sessions/${sessionId}/chunks`, {
				method: 'POST',
				headers: { 'content-type': 'application/json' },
				body: JSON.stringify(chunk)
			});
		} catch {
			this.offline = true;
			throw new SendError('The server cannot be reached.', false);
		}
		if (response.ok) {
			this.offline = false;
			return;
		}
		const body = await response.json().catch(() => null);
		const permanent =
			response.status >= 400 && response.status < 500 && response.status !== 408 && response.status !== 429;
		if (permanent) this.error = body?.error ?? `The server refused the events (${response.status}).`;
		throw new SendError(body?.error ?? `The server answered ${response.status}.`, permanent);
	}

	async #json(path: string, body: unknown, method = 'POST'): Promise<unknown> {
		let response: Response;
		try {
			response = await this.#fetch(path, {
				method,
				headers: { 'content-type': 'application/json' },
				body: JSON.stringify(body)
			});
		} catch {
			throw new Error('Padproof’s server cannot be reached. Check the connection and try again.');
		}
		const data = await response.json().catch(() => null);
		if (!response.ok) throw new Error(data?.error ?? `The server answered ${response.status}.`);
		return data;
	}

	#stopAudio(): Promise<Blob | null> {
		const media = this.#media;
		if (!media || media.state === 'inactive') return Promise.resolve(null);
		return new Promise((resolve) => {
			media.onstop = () =>
				resolve(
					this.#audioParts.length
						? new Blob(this.#audioParts, { type: media.mimeType.split(';')[0] || 'audio/webm' })
						: null
				);
			media.stop();
		});
	}

	async #upload(sessionId: string, audio: Blob) {
		this.uploadProgress = 0;
		try {
			await uploadAudio(`/api/sessions/${sessionId}/audio`, audio, (p) => (this.uploadProgress = p));
		} catch (e) {
			this.error = `The events are saved, but the audio upload failed: ${e instanceof Error ? e.message : String(e)}`;
		} finally {
			this.uploadProgress = null;
		}
	}
}
