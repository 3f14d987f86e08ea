// The rig state at any moment of a replay, fast enough to follow a dragged cursor: the engine
// runs once and keeps a snapshot every `every` applied events; a seek starts from the nearest
// snapshot at or before it and applies the few events after it with the same `applyEvent`.
import { applyEvent, runEvents, type InputEvent, type Mapping, type ReplayOptions, type RigState } from '$lib/engine';

export class RigSnapshots {
	readonly at: number[] = []; // landing time of each applied event, in applied order (ascending)
	readonly order: number[] = []; // replay event index of each applied event
	#snapshots: RigState[] = []; // state before applied event k × every
	#final: RigState;

	constructor(
		private readonly mapping: Mapping,
		private readonly events: readonly InputEvent[],
		options: number | ReplayOptions, // a session's replay options, or a constant tempo
		private readonly every = 64
	) {
		const run = typeof options === 'number' ? { tempo: options } : options;
		this.#final = runEvents(mapping, events, run, (_result, before, index, at) => {
			if (this.order.length % every === 0) this.#snapshots.push(before);
			this.order.push(index);
			this.at.push(at);
		});
	}

	/** How many events have landed by `ms` (an event exactly at `ms` counts). */
	countAt(ms: number): number {
		let lo = 0;
		let hi = this.at.length;
		while (lo < hi) {
			const mid = (lo + hi) >> 1;
			if (this.at[mid] <= ms) lo = mid + 1;
			else hi = mid;
		}
		return lo;
	}

	/** The state after the first `count` applied events. */
	stateAfter(count: number): RigState {
		if (count >= this.order.length) return this.#final;
		const base = Math.floor(count / this.every);
		let state = this.#snapshots[base];
		for (let k = base * this.every; k < count; k++) {
			const index = this.order[k];
			const e = this.events[index];
			state = applyEvent(this.mapping, state, this.at[k] === e.t ? e : { ...e, t: this.at[k] }, index).state;
		}
		return state;
	}

	stateAt(ms: number): RigState {
		return this.stateAfter(this.countAt(ms));
	}
}
