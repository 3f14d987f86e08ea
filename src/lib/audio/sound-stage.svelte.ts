// Live sound for a page: one realtime AudioRig started after a user gesture, its master meter
// polled each animation frame, and the audition rack the sounds page plays with: a chain of 1–4
// effects, each with its own on and parameters. Tone.js loads only when sound starts, so a
// browser without Web Audio still gets the page and a clear message.
import { loadedPosition } from '$lib/engine/rig';
import { CHAIN_MAX, DECK_IDS, type DeckId, type EffectId, type PositionState, type RigState } from '$lib/engine/types';
import { findLoop } from './loops/patterns';
import { DEFAULT_MASTER_DB } from './mix';
import type { AudioRig } from './rig';
import { quietRack, quietRig } from './rig-state';
import { webAudioProblem } from './support';

export type StageStatus = 'idle' | 'starting' | 'running' | 'unavailable';

/** One chain position on the bench: always holds an effect (remove the position to empty it). */
export interface AuditionPosition {
	effect: EffectId;
	on: boolean;
	params: number[];
}

export interface Audition {
	chain: AuditionPosition[]; // 1–4
	deck: DeckId;
	mix: number;
	on: boolean;
}

function benchPosition(effect: EffectId): AuditionPosition {
	const { on, params } = loadedPosition(effect);
	return { effect, on, params };
}

/** The audition as a rig state: rack 1 carries the chain, routed to the chosen deck only. */
export function auditionRig(a: Audition, playing: Record<DeckId, boolean>): RigState {
	const state = quietRig();
	for (const d of DECK_IDS) state.decks[d].playing = playing[d];
	const rack = quietRack();
	rack.on = a.on;
	rack.mix = a.mix;
	rack.routes[a.deck] = true;
	rack.chain = Array.from({ length: CHAIN_MAX }, (_, i): PositionState => {
		const p = a.chain[i];
		return p ? { effect: p.effect, on: p.on, params: [...p.params] } : { ...rack.chain[i] };
	});
	state.racks[0] = rack;
	return state;
}

export class SoundStage {
	status = $state<StageStatus>('idle');
	problem = $state<string | null>(null);
	tempo = $state(120);
	masterDb = $state(DEFAULT_MASTER_DB);
	meterDb = $state(-Infinity);
	loops = $state<Record<DeckId, string | null>>({ A: 'glass-steps', B: null, C: null, D: null });
	playing = $state<Record<DeckId, boolean>>({ A: true, B: false, C: false, D: false });
	levels = $state<Record<DeckId, number>>({ A: 0, B: 0, C: 0, D: 0 });
	audition = $state<Audition>({ chain: [benchPosition('echo')], deck: 'A', mix: 0.5, on: false });
	#rig: AudioRig | null = null;
	#frame = 0;

	constructor() {
		const problem = typeof window === 'undefined' ? null : webAudioProblem(window);
		if (problem && problem.includes('no Web Audio')) {
			this.status = 'unavailable';
			this.problem = problem;
		}
	}

	/** Must run inside a user gesture (a click or key press): browsers only start audio then. */
	async start(): Promise<void> {
		if (this.status !== 'idle') return;
		this.status = 'starting';
		try {
			const [tone, { AudioRig }] = await Promise.all([import('tone'), import('./rig')]);
			await tone.start();
			const now = tone.getContext().currentTime;
			this.#rig = await AudioRig.create({ tempo: this.tempo, origin: now, live: true, state: this.rigState() });
			this.#rig.master.setLevel(this.masterDb, now);
			this.#rig.master.output.toDestination(); // the rig renders offline too, so live pages wire the speakers
			for (const d of DECK_IDS) this.#applyDeck(d);
			this.#rig.startClock();
			this.status = 'running';
			this.#poll();
		} catch (error) {
			this.status = 'unavailable';
			this.problem = `Sound could not start: ${error instanceof Error ? error.message : String(error)}`;
		}
	}

	setTempo(bpm: number): void {
		this.tempo = Math.min(200, Math.max(60, Math.round(bpm)));
		this.#rig?.setTempo(this.tempo);
	}

	setMaster(db: number): void {
		this.masterDb = db;
		this.#rig?.master.setLevel(db, this.#now());
	}

	setLoop(deck: DeckId, loop: string | null): void {
		this.loops[deck] = loop;
		this.#rig?.setLoop(deck, loop ? findLoop(loop) : null);
	}

	setPlaying(deck: DeckId, playing: boolean): void {
		this.playing[deck] = playing;
		this.#syncRig();
	}

	setLevel(deck: DeckId, db: number): void {
		this.levels[deck] = db;
		this.#rig?.decks[deck].setLevel(db, this.#now());
	}

	/** Puts `effect` at chain position `index` (0-based) with its catalog defaults; at the end it adds one. */
	setEffect(index: number, effect: EffectId): void {
		if (index < 0 || index > this.audition.chain.length || index >= CHAIN_MAX) return;
		const chain = [...this.audition.chain];
		chain[index] = benchPosition(effect);
		this.updateAudition({ chain });
	}

	/** Adds an effect at the end of the chain (up to four). */
	addEffect(effect: EffectId): void {
		this.setEffect(this.audition.chain.length, effect);
	}

	/** Removes a position; the chain keeps at least one effect. */
	removePosition(index: number): void {
		if (this.audition.chain.length <= 1) return;
		this.updateAudition({ chain: this.audition.chain.filter((_, i) => i !== index) });
	}

	updatePosition(index: number, patch: Partial<Omit<AuditionPosition, 'effect'>>): void {
		const chain = this.audition.chain.map((p, i) => (i === index ? { ...p, ...patch } : p));
		this.updateAudition({ chain });
	}

	setParam(index: number, param: number, value: number): void {
		const params = [...(this.audition.chain[index]?.params ?? [])];
		params[param] = value;
		this.updatePosition(index, { params });
	}

	updateAudition(patch: Partial<Audition>): void {
		this.audition = { ...this.audition, ...patch };
		this.#syncRig();
	}

	#now(): number {
		return this.#rig?.context.currentTime ?? 0;
	}

	#applyDeck(deck: DeckId) {
		const loop = this.loops[deck];
		this.#rig?.setLoop(deck, loop ? findLoop(loop) : null);
		this.#rig?.decks[deck].setLevel(this.levels[deck], this.#now());
	}

	/** What the page plays, as a rig state (the WAV export renders the same). */
	rigState(): RigState {
		return auditionRig(this.audition, this.playing);
	}

	/** A live change: heard from the next render quantum. */
	#syncRig() {
		this.#rig?.sync(this.rigState(), this.#rig.scheduleAt(0));
	}

	#poll = () => {
		if (!this.#rig) return;
		this.meterDb = this.#rig.master.meterDb();
		this.#frame = requestAnimationFrame(this.#poll);
	};

	dispose(): void {
		cancelAnimationFrame(this.#frame);
		this.#rig?.dispose();
		this.#rig = null;
		this.status = 'idle';
	}
}
