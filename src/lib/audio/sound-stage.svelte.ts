// Live sound for a page: one realtime AudioRig started after a user gesture, its master meter
// polled each animation frame, and the audition rack the sounds page plays with. Tone.js loads
// only when sound starts, so a browser without Web Audio still gets the page and a clear message.
import { EFFECTS } from '$lib/engine/effects';
import { DECK_IDS, type DeckId, type EffectId, type RigState } from '$lib/engine/types';
import { findLoop } from './loops/patterns';
import { DEFAULT_MASTER_DB } from './mix';
import type { AudioRig } from './rig';
import { quietRack, quietRig } from './rig-state';
import { webAudioProblem } from './support';

export type StageStatus = 'idle' | 'starting' | 'running' | 'unavailable';

export interface Audition {
	effect: EffectId;
	deck: DeckId;
	mix: number;
	params: number[];
	on: boolean;
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
	audition = $state<Audition>({
		effect: 'echo',
		deck: 'A',
		mix: 0.5,
		params: EFFECTS.echo.params.map((p) => p.default),
		on: false
	});
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
			this.#rig = await AudioRig.create({ tempo: this.tempo, origin: now, state: this.#rigState() });
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

	chooseEffect(effect: EffectId): void {
		this.audition = { ...this.audition, effect, params: EFFECTS[effect].params.map((p) => p.default) };
		this.#syncRig();
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

	/** The audition as a rig state: rack 1 in focus mode, routed to the chosen deck only. */
	#rigState(): RigState {
		const state = quietRig();
		for (const d of DECK_IDS) state.decks[d].playing = this.playing[d];
		const a = this.audition;
		const rack = quietRack();
		rack.on = a.on;
		rack.mode = 'focus';
		rack.mix = a.mix;
		rack.params = [...a.params];
		rack.routes[a.deck] = true;
		rack.slots[0] = { effect: a.effect, on: true, amount: 0.5 };
		state.racks[0] = rack;
		return state;
	}

	#syncRig() {
		this.#rig?.sync(this.#rigState(), this.#now() + this.#rig.lookAhead);
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
