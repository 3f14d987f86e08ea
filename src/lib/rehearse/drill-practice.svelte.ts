// Practice mode: one try at a drill in the rehearsal room. The room's own recorder records the
// try from the start of the count-in; beat 0 of the drill is put on a beat line of the room's
// clock after the count-in bars, so the metronome, the quantize grid and the drill agree, and the
// take's beat clock has its zero there. When
// the drill's bars are over the recording stops, the server scores it (the engine's scoring)
// and the score is shown. Times here are ms relative to beat 0 (negative during the count-in).
import { BEATS_PER_BAR, type DrillDocument, type ScoreSummary } from '$lib/engine';
import type { RehearsalRoom } from './rehearsal-room.svelte';

export type PracticeStatus = 'idle' | 'starting' | 'counting' | 'playing' | 'scoring' | 'scored' | 'failed';

type Post = (url: string, body: unknown) => Promise<{ ok: boolean; status: number; json(): Promise<unknown> }>;

const defaultPost: Post = (url, body) =>
	fetch(url, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(body) });

export class DrillPractice {
	status = $state<PracticeStatus>('idle');
	/** Drill time now: ms since beat 0 (negative while counting in). */
	now = $state(0);
	score = $state<ScoreSummary | null>(null);
	takeId = $state<string | null>(null);
	problem = $state<string | null>(null);
	tries = $state(0);

	#zeroRoom = 0;
	#zeroRecording = 0;
	#frame = 0;

	constructor(
		readonly room: RehearsalRoom,
		readonly drill: DrillDocument,
		readonly drillId: string,
		private readonly post: Post = defaultPost
	) {}

	get beatMs(): number {
		return 60_000 / this.drill.tempo;
	}

	get lengthMs(): number {
		return this.drill.lengthBars * BEATS_PER_BAR * this.beatMs;
	}

	get busy(): boolean {
		return ['starting', 'counting', 'playing', 'scoring'].includes(this.status);
	}

	/** Beat 0 of the current try on the performance clock (ms), for players that play along. */
	zeroAt = $state<number | null>(null);

	async start(): Promise<void> {
		if (this.busy || this.room.recording) return;
		this.problem = null;
		this.score = null;
		this.takeId = null;
		this.status = 'starting';
		this.room.setTempo(this.drill.tempo);
		const countIn = this.room.countInOn;
		this.room.countInOn = false; // the drill brings its own count-in
		this.room.record(`${this.drill.name} · try ${this.tries + 1}`);
		this.room.countInOn = countIn;
		const started = await this.#until(
			() => this.room.recorder.status === 'recording' || this.room.recorder.status === 'failed'
		);
		if (!started || this.room.recorder.status !== 'recording') {
			this.status = 'failed';
			this.problem = this.room.recorder.error ?? 'The recording could not start.';
			return;
		}
		const nowRoom = this.room.roomNow();
		const countInBeats = this.drill.countInBars * BEATS_PER_BAR;
		// The next beat line at least half a beat away starts the count-in.
		const first = Math.ceil(this.room.clock.beatAt(nowRoom) + 0.5);
		const zeroBeat = first + countInBeats;
		this.#zeroRoom = this.room.clock.timeOfBeat(zeroBeat);
		// The take's beat clock starts at the drill's beat 0: the saved session then scores the same
		// wherever it is scored (the app, an exported file on the command line).
		this.#zeroRecording =
			this.room.anchorTake(this.#zeroRoom) ?? this.room.recorder.elapsed() + (this.#zeroRoom - nowRoom);
		this.zeroAt = performance.now() + (this.#zeroRoom - nowRoom);
		this.room.sound.countIn(first, zeroBeat);
		this.status = countInBeats > 0 ? 'counting' : 'playing';
		this.#tick();
	}

	#tick = () => {
		this.now = this.room.roomNow() - this.#zeroRoom;
		if (this.status === 'counting' && this.now >= 0) this.status = 'playing';
		// One beat after the last bar, so a late final press is still in the take.
		if (this.status === 'playing' && this.now >= this.lengthMs + this.beatMs) {
			void this.#finish();
			return;
		}
		if (this.status === 'counting' || this.status === 'playing') this.#frame = requestAnimationFrame(this.#tick);
	};

	/** Stops the try early; nothing is scored. */
	async cancel(): Promise<void> {
		if (this.status !== 'counting' && this.status !== 'playing') return;
		cancelAnimationFrame(this.#frame);
		this.room.sound.countIn(0, 0);
		await this.room.stopRecording(`${this.drill.name} · stopped`);
		this.status = 'idle';
	}

	async #finish(): Promise<void> {
		this.status = 'scoring';
		this.tries++;
		await this.room.stopRecording(`${this.drill.name} · try ${this.tries}`);
		const saved = this.room.saved;
		if (!saved) {
			this.status = 'failed';
			this.problem = this.room.recorder.error ?? 'The take could not be saved.';
			return;
		}
		try {
			const res = await this.post('/api/drill-takes', {
				rehearsalId: saved.id,
				drillId: this.drillId,
				zero: Math.max(0, this.#zeroRecording)
			});
			const body = (await res.json()) as { score?: ScoreSummary; error?: string };
			if (!res.ok || !body.score) throw new Error(body.error ?? `The server answered ${res.status}.`);
			this.score = body.score;
			this.takeId = saved.id;
			this.status = 'scored';
		} catch (e) {
			this.status = 'failed';
			this.problem = `The take was saved, but it could not be scored: ${e instanceof Error ? e.message : String(e)}`;
		}
	}

	async #until(ok: () => boolean, ms = 10_000): Promise<boolean> {
		const end = performance.now() + ms;
		while (!ok()) {
			if (performance.now() > end) return false;
			await new Promise((r) => setTimeout(r, 20));
		}
		return true;
	}

	/** Also runs when the room is rendered on the server, where there are no animation frames. */
	dispose(): void {
		if (typeof cancelAnimationFrame !== 'undefined') cancelAnimationFrame(this.#frame);
	}
}
