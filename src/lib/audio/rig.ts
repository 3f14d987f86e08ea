// AudioRig: the one Tone.js graph of a rehearsal (DESIGN.md §5). It follows the engine and never
// decides what a step does. A live rig (the rehearsal room, the sounds page) applies each event's
// changes at the next render quantum; an exact rig (replay, offline render) schedules them at the
// event's time on a frame, plus a look-ahead when it runs in real time. All changes of one event
// land on the same audio frame.
import { getContext, setContext, type BaseContext } from 'tone';
import type { RackReach } from '$lib/engine/reach';
import { DECK_IDS, type DeckId, type RigChange, type RigState } from '$lib/engine/types';
import { BeatClock } from './beat-clock';
import { DeckChannel } from './deck';
import { loadCrusher } from './effects/crusher-worklet';
import type { DemoLoop } from './loops/patterns';
import { MasterBus } from './master';
import { quietRig, writeChange, type Touched } from './rig-state';
import { changeTime, onFrame } from './schedule-time';

/**
 * Seconds between an event's time and when its changes sound in a real-time exact rig (replay
 * following its cursor): changes keep their spacing even when a frame hands over several.
 */
export const LOOK_AHEAD = 0.04;

/**
 * Effect instances a live rig builds ahead of play at most (a mapping reaching further builds the
 * rest on first use). Each waits with its input unplugged, so it costs memory, not render time.
 */
export const PREPARE_BUDGET = 96;

export interface AudioRigOptions {
	tempo?: number;
	/** Context time of the session clock's zero (ms 0 of RigChange.t). */
	origin?: number;
	/** Live: changes sound at the next render quantum. Otherwise at their event time (exact). */
	live?: boolean;
	/** Exact rigs only; default LOOK_AHEAD in real time, 0 offline. */
	lookAhead?: number;
	state?: RigState;
}

export class AudioRig {
	readonly context: BaseContext;
	readonly master = new MasterBus();
	readonly clock: BeatClock;
	readonly decks: Record<DeckId, DeckChannel>;
	readonly lookAhead: number;
	readonly live: boolean;
	origin: number;
	/** Context time the last event's changes were scheduled at (measured by the benchmark). */
	lastScheduled = -1;
	#state: RigState;

	/** Builds the rig on the current Tone context once its worklets are loaded. */
	static async create(options: AudioRigOptions = {}): Promise<AudioRig> {
		const context = getContext();
		await loadCrusher(context);
		return within(context, () => new AudioRig(context, options));
	}

	private constructor(
		context: BaseContext,
		{ tempo = 120, origin = 0, live = false, lookAhead, state = quietRig() }: AudioRigOptions
	) {
		this.context = context;
		this.origin = origin;
		this.live = live;
		this.lookAhead = live ? 0 : (lookAhead ?? (context.isOffline ? 0 : LOOK_AHEAD));
		this.clock = new BeatClock(tempo, origin);
		const racks = state.racks.length;
		this.decks = Object.fromEntries(DECK_IDS.map((d) => [d, new DeckChannel(d, this.clock, racks)])) as Record<
			DeckId,
			DeckChannel
		>;
		for (const d of DECK_IDS) this.decks[d].output.connect(this.master.input);
		this.#state = structuredClone(state);
		this.sync(this.#state, origin);
	}

	get state(): RigState {
		return this.#state;
	}

	get tempo(): number {
		return this.clock.bpmAt(this.context.currentTime);
	}

	/** The context time a change at session time `t` (ms) sounds at in an exact rig: on a frame. */
	timeOf(t: number): number {
		return onFrame(this.origin + t / 1000 + this.lookAhead, this.context.sampleRate);
	}

	/** When an event at session time `t` sounds: the next render quantum live, its own time otherwise. */
	scheduleAt(t: number): number {
		return changeTime(this.context, this.live, this.origin + t / 1000 + this.lookAhead);
	}

	/** Follows a list of engine changes; consecutive changes of one event share one time. */
	apply(changes: readonly RigChange[]): void {
		within(this.context, () => this.#apply(changes));
	}

	#apply(changes: readonly RigChange[]) {
		let i = 0;
		while (i < changes.length) {
			const event = changes[i].event;
			const time = this.scheduleAt(changes[i].t);
			this.lastScheduled = time;
			const touched: Touched = { racks: new Set(), decks: new Set() };
			for (; i < changes.length && changes[i].event === event; i++) writeChange(this.#state, changes[i], touched);
			this.#follow(touched, time);
		}
	}

	/** Takes over a whole state at once (a session starting, a seek in replay). */
	sync(state: RigState, time = this.context.currentTime): void {
		this.#state = structuredClone(state);
		for (const d of DECK_IDS) this.decks[d].ensureRacks(state.racks.length);
		const touched = { racks: new Set(state.racks.map((_, i) => i)), decks: new Set<string>(DECK_IDS) };
		within(this.context, () => this.#follow(touched, time));
	}

	/**
	 * Builds ahead of play the inserts and effect instances a mapping may use (engine
	 * `mappingReach`), so no press waits for nodes to be made. Answers how many instances it built.
	 */
	prepare(reach: readonly RackReach[], budget = PREPARE_BUDGET): number {
		return within(this.context, () => {
			let built = 0;
			reach.forEach((rack, r) => {
				for (const d of rack.decks) {
					this.decks[d].ensureRacks(r + 1);
					built += this.decks[d].inserts[r].prepare(rack.effects, budget - built);
				}
			});
			return built;
		});
	}

	setTempo(bpm: number, time = this.context.currentTime): void {
		this.clock.setTempo(bpm, time);
		within(this.context, () => DECK_IDS.forEach((d) => this.decks[d].retime(time)));
	}

	setLoop(deck: DeckId, loop: DemoLoop | null, time = this.context.currentTime): void {
		within(this.context, () => this.decks[deck].setLoop(loop, time));
	}

	/**
	 * Marks the rig as running from the clock's origin. Nothing waits for it any more: beat-synced
	 * effects read the beat clock itself, not Tone's transport (whose ticks cost script time all
	 * through an offline render).
	 */
	startClock(): void {}

	#follow(touched: Touched, time: number) {
		for (const r of touched.racks) {
			const rack = this.#state.racks[r];
			if (rack) for (const d of DECK_IDS) this.decks[d].ensureRacks(r + 1);
			if (rack) for (const d of DECK_IDS) this.decks[d].inserts[r].follow(rack, time);
		}
		for (const d of touched.decks) {
			const deck = this.#state.decks[d as DeckId];
			if (deck) this.decks[d as DeckId].setPlaying(deck.playing, time);
		}
	}

	dispose(): void {
		for (const d of DECK_IDS) this.decks[d].dispose();
		this.master.dispose();
	}
}

/**
 * Runs `build` with `context` as Tone's current context. Tone nodes take the current context when
 * made, and a live rig and an offline render (WAV export) can both exist on one page.
 */
function within<T>(context: BaseContext, build: () => T): T {
	const previous = getContext();
	if (previous === context) return build();
	setContext(context);
	try {
		return build();
	} finally {
		setContext(previous);
	}
}
