// A mapping played live from the input hub, for the controllers page's "try pads" panel. Every hub
// event goes to the engine's live rig actor (engine/machines/rig.ts) — the one the rehearsal room
// uses — so quantize waits for its grid line here too; `state`, `lit` and `dim` follow what the
// actor lands. Event times are ms since this rig was made (the beat grid starts there).
import { createActor, type Actor } from 'xstate';
import { initialRigState, rigMachine, type InputEvent, type Mapping, type RigChange, type RigState } from '$lib/engine';
import type { InputHub } from './input-hub.svelte';
import { padLights } from './pad-lights';

const MAX_TAKE = 100_000;

export class PadRig {
	readonly mapping: Mapping;
	state = $state.raw<RigState>() as RigState;
	/** Events the actor has landed (a quantized press counts once it lands on its grid line). */
	events = $state(0);
	lastChanges = $state.raw<RigChange[]>([]);
	#played: InputEvent[] = [];
	#actor: Actor<typeof rigMachine>;
	#t0: number;
	#lastT = 0;

	constructor(mapping: Mapping, now: () => number = () => performance.now()) {
		this.mapping = mapping;
		this.state = initialRigState(mapping);
		this.#t0 = now();
		this.#actor = createActor(rigMachine, { input: { mapping } });
		this.#actor.on('changes', (e) => {
			this.state = e.state;
			this.events++;
			this.lastChanges = e.changes;
		});
		this.#actor.start();
	}

	/** Inputs whose effect is on now (a hold group's sounding pad); cheap enough on every read. */
	get lit(): Set<string> {
		return padLights(this.mapping, this.state).lit;
	}

	/** Held pads of a hold group whose own setting is not the one sounding. */
	get dim(): Set<string> {
		return padLights(this.mapping, this.state).dim;
	}

	/** One event at hub time `event.t` (the performance clock, ms). */
	apply(event: InputEvent): void {
		const t = Math.max(this.#lastT, event.t - this.#t0);
		this.#lastT = t;
		const timed = { ...event, t };
		if (this.#played.length < MAX_TAKE) this.#played.push(timed);
		this.#actor.send({ type: 'input', event: timed });
	}

	/** What was played since the last reset, timed from the first event (ms). */
	take(): InputEvent[] {
		const t0 = this.#played[0]?.t ?? 0;
		return this.#played.map((e) => ({ ...e, t: e.t - t0 }));
	}

	/** Plays every hub event through the actor; returns the unsubscribe function. */
	listen(hub: InputHub): () => void {
		return hub.subscribe(({ t, input, type, value }) =>
			this.apply(value === undefined ? { t, input, type } : { t, input, type, value })
		);
	}

	reset(): void {
		this.#actor.send({ type: 'reset' });
		this.state = initialRigState(this.mapping);
		this.events = 0;
		this.lastChanges = [];
		this.#played = [];
	}

	/** Stops the actor (a waiting quantized press is dropped): the page closes or picks another mapping. */
	stop(): void {
		this.#actor.stop();
	}
}
