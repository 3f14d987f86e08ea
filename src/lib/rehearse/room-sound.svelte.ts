// The room's sound: one realtime AudioRig that follows the rig actor's changes, the decks' demo
// loops, a metronome click and the master capture for the recorder. Tone.js loads only when sound
// starts (after a gesture and the hearing caution), so without Web Audio the room still plays
// pads and shows findings. Deck play/stop here is the loop transport only: whether a deck counts
// as playing for the findings is the engine's rig state, which a mapping changes with its steps.
import { DECK_IDS, type DeckId, type RackReach, type RigChange, type RigState } from '$lib/engine';
import { DEMO_LOOPS, findLoop } from '$lib/audio/loops/patterns';
import { DEFAULT_MASTER_DB } from '$lib/audio/mix';
import type { AudioRig } from '$lib/audio/rig';
import { webAudioProblem } from '$lib/audio/support';
import type { RoomClock } from './room-clock';

export type SoundStatus = 'idle' | 'starting' | 'running' | 'unavailable';

const SCHEDULE_AHEAD = 0.12; // seconds of clicks booked ahead of the audio clock
const TICK_MS = 25;
export const DEFAULT_LOOPS: Record<DeckId, string> = {
	A: 'glass-steps',
	B: 'night-bus',
	C: 'porch-light',
	D: 'coil-run'
};

type Click = {
	triggerAttackRelease(note: number, duration: number, time: number, velocity?: number): unknown;
	dispose(): unknown;
};

export class RoomSound {
	status = $state<SoundStatus>('idle');
	problem = $state<string | null>(null);
	masterDb = $state(DEFAULT_MASTER_DB);
	meterDb = $state(-Infinity);
	loops = $state<Record<DeckId, string | null>>({ ...DEFAULT_LOOPS });
	playing = $state<Record<DeckId, boolean>>({ A: true, B: false, C: false, D: false });
	metronome = $state(false);
	readonly loopChoices = DEMO_LOOPS;
	#rig: AudioRig | null = null;
	#click: Click | null = null;
	#capture: MediaStreamAudioDestinationNode | null = null;
	#frame = 0;
	#ticker: ReturnType<typeof setInterval> | undefined;
	#nextBeat = -1;
	#countIn: { from: number; to: number } | null = null;
	readonly #clock: RoomClock;
	readonly #roomNow: () => number;

	constructor(clock: RoomClock, roomNow: () => number) {
		this.#clock = clock;
		this.#roomNow = roomNow;
		const problem = typeof window === 'undefined' ? null : webAudioProblem(window);
		if (problem?.includes('no Web Audio')) {
			this.status = 'unavailable';
			this.problem = problem;
		}
	}

	get running(): boolean {
		return this.status === 'running';
	}

	/**
	 * Must run inside a user gesture. `state`: the rig as it stands, so sound joins mid-session.
	 * `beginBeat` restarts the room's beat clock at this moment and returns the room time it did:
	 * the loops' beat 0 is then the same instant on the audio clock. `reach`: what the mapping may
	 * load, built before "running" so the first press of each pad does not wait for nodes.
	 */
	async start(state: RigState, beginBeat: () => number, reach: readonly RackReach[] = []): Promise<void> {
		if (this.status !== 'idle') return;
		this.status = 'starting';
		try {
			const [tone, { AudioRig }] = await Promise.all([import('tone'), import('$lib/audio/rig')]);
			await tone.start();
			const ctx = tone.getContext();
			const now = ctx.currentTime;
			const roomTime = beginBeat();
			// A live rig: a pad's changes sound from the next render quantum, not behind a look-ahead.
			this.#rig = await AudioRig.create({ tempo: this.#clock.tempo, origin: now, live: true, state });
			this.#rig.prepare(reach);
			// Session time 0 (room ms 0) on the audio clock: the loops' and the metronome's beat grid.
			this.#rig.origin = now - roomTime / 1000;
			this.#rig.master.setLevel(this.masterDb, ctx.currentTime);
			this.#rig.master.output.toDestination();
			this.#click = new tone.Synth({
				oscillator: { type: 'sine' },
				envelope: { attack: 0.001, decay: 0.04, sustain: 0, release: 0.01 },
				volume: -10
			}).connect(this.#rig.master.input);
			for (const d of DECK_IDS) this.#applyDeck(d);
			this.#rig.startClock();
			this.status = 'running';
			this.#ticker = setInterval(() => this.#scheduleClicks(), TICK_MS);
			this.#poll();
		} catch (error) {
			this.status = 'unavailable';
			this.problem = `Sound could not start: ${error instanceof Error ? error.message : String(error)}. The pads and findings still work.`;
		}
	}

	apply(changes: readonly RigChange[]): void {
		this.#rig?.apply(changes);
	}

	/** Takes over a whole rig state (after a reset). */
	sync(state: RigState): void {
		this.#rig?.sync(state);
	}

	retime(bpm: number, roomTime: number): void {
		this.#nextBeat = -1;
		this.#rig?.setTempo(bpm, Math.max(this.#contextTime(roomTime), this.#rig.context.currentTime));
	}

	setLoop(deck: DeckId, loop: string | null): void {
		this.loops[deck] = loop;
		this.#applyDeck(deck);
	}

	setPlaying(deck: DeckId, playing: boolean): void {
		this.playing[deck] = playing;
		this.#applyDeck(deck);
	}

	setMaster(db: number): void {
		this.masterDb = db;
		if (this.#rig) this.#rig.master.setLevel(db, this.#rig.context.currentTime);
	}

	/** Clicks beats [from, to) whether or not the metronome is on (a count-in). */
	countIn(from: number, to: number): void {
		this.#countIn = { from, to };
	}

	/** The master output as a stream, for recording it; null until sound runs. */
	captureStream(): MediaStream | null {
		if (!this.#rig) return null;
		if (!this.#capture) {
			this.#capture = this.#rig.context.createMediaStreamDestination();
			this.#rig.master.output.connect(this.#capture);
		}
		return this.#capture.stream;
	}

	/** Where room time falls on the loops' beat clock. */
	#contextTime(roomTime: number): number {
		return this.#rig ? this.#rig.origin + roomTime / 1000 : 0;
	}

	#applyDeck(deck: DeckId) {
		const loop = this.loops[deck];
		this.#rig?.setLoop(deck, loop && this.playing[deck] ? findLoop(loop) : null);
	}

	#scheduleClicks() {
		const rig = this.#rig;
		if (!rig || !this.#click) return;
		const now = this.#roomNow();
		const horizon = now + SCHEDULE_AHEAD * 1000;
		if (this.#nextBeat < 0) this.#nextBeat = Math.ceil(this.#clock.beatAt(now));
		for (; this.#clock.timeOfBeat(this.#nextBeat) < horizon; this.#nextBeat++) {
			const beat = this.#nextBeat;
			const counting = this.#countIn && beat >= this.#countIn.from && beat < this.#countIn.to;
			if (!this.metronome && !counting) continue;
			const at = Math.max(this.#contextTime(this.#clock.timeOfBeat(beat)), rig.context.currentTime);
			this.#click.triggerAttackRelease(beat % 4 === 0 ? 1760 : 1320, 0.03, at, counting ? 1 : 0.7);
		}
	}

	#poll = () => {
		if (!this.#rig) return;
		this.meterDb = this.#rig.master.meterDb();
		this.#frame = requestAnimationFrame(this.#poll);
	};

	dispose(): void {
		clearInterval(this.#ticker);
		if (this.#frame) cancelAnimationFrame(this.#frame);
		this.#click?.dispose();
		this.#capture?.disconnect();
		this.#rig?.dispose();
		this.#rig = null;
		this.status = 'idle';
	}
}
