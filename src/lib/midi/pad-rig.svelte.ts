// A mapping played live from the input hub: each hub event goes through the engine's
// `applyEvent`, and `lit` follows the resulting rig state. Used by the "try pads" panel; it applies
// events as they come (no quantize wait), which is all the demo mappings need.
import { applyEvent, initialRigState, type InputEvent, type Mapping, type RigChange, type RigState } from '$lib/engine';
import type { InputHub } from './input-hub.svelte';
import { litInputs } from './pad-lights';

const MAX_TAKE = 100_000;

export class PadRig {
	readonly mapping: Mapping;
	state = $state.raw<RigState>() as RigState;
	events = $state(0);
	lastChanges = $state.raw<RigChange[]>([]);
	#played: InputEvent[] = [];

	constructor(mapping: Mapping) {
		this.mapping = mapping;
		this.state = initialRigState(mapping);
	}

	/** Inputs whose effect is on now; cheap enough to work out on every read. */
	get lit(): Set<string> {
		return litInputs(this.mapping, this.state);
	}

	apply(event: InputEvent): void {
		const result = applyEvent(this.mapping, this.state, event, this.events);
		this.state = result.state;
		this.events++;
		this.lastChanges = result.changes;
		if (this.#played.length < MAX_TAKE) this.#played.push(event);
	}

	/** What was played since the last reset, timed from the first event (ms). */
	take(): InputEvent[] {
		const t0 = this.#played[0]?.t ?? 0;
		return this.#played.map((e) => ({ ...e, t: e.t - t0 }));
	}

	/** Plays every hub event through the engine; returns the unsubscribe function. */
	listen(hub: InputHub): () => void {
		return hub.subscribe(({ t, input, type, value }) =>
			this.apply(value === undefined ? { t, input, type } : { t, input, type, value })
		);
	}

	reset(): void {
		this.state = initialRigState(this.mapping);
		this.events = 0;
		this.lastChanges = [];
		this.#played = [];
	}
}
