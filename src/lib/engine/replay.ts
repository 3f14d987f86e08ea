// Replay: run logged input events through `applyEvent` in the order they land (quantized presses
// wait for their grid line) and produce a timeline — every change with its time and causing event
// index, every clamp, and the audible intervals per rack × deck. Deterministic: the same mapping
// and events give the same timeline, byte for byte once serialized.
import { applyEvent, initialRigState, isAudible } from './rig';
import { clockFor, scheduleEvents, type Clock } from './schedule';
import {
	DECK_IDS,
	MAX_RACKS,
	type AudibleInterval,
	type InputEvent,
	type Mapping,
	type RigState,
	type StepResult,
	type Timeline
} from './types';

export interface ReplayOptions {
	clock?: Clock; // the session's beat clock (zero and tempo changes); wins over tempo and origin
	tempo?: number; // BPM of a constant beat clock; default the mapping's tempo, else 120
	origin?: number; // session time of its first beat, default 0
	from?: RigState; // the rig as it stood when the events began; default the starting rig
}

export type StepVisitor = (result: StepResult, before: RigState, index: number, at: number) => void;

/** The one loop every consumer of logged events shares. Returns the final state. */
export function runEvents(
	mapping: Mapping,
	events: readonly InputEvent[],
	options: ReplayOptions,
	visit: StepVisitor
): RigState {
	const clock = options.clock ?? clockFor(mapping, options.tempo, options.origin);
	let state = options.from ?? initialRigState(mapping);
	for (const { index, at } of scheduleEvents(mapping, events, clock)) {
		const e = events[index];
		const result = applyEvent(mapping, state, at === e.t ? e : { ...e, t: at }, index);
		visit(result, state, index, at);
		state = result.state;
	}
	return state;
}

/** Opens and closes audible intervals as states go by; shared by replay and inspection. */
export class AudibleTracker {
	readonly intervals: AudibleInterval[] = [];
	#open: (AudibleInterval | null)[] = new Array(MAX_RACKS * DECK_IDS.length).fill(null);
	constructor(private readonly decks: number) {}

	update(state: RigState, at: number, index: number): void {
		for (let r = 0; r < state.racks.length; r++)
			for (let d = 0; d < this.decks; d++) {
				const slot = r * DECK_IDS.length + d;
				const now = isAudible(state, r + 1, DECK_IDS[d]);
				const open = this.#open[slot];
				if (now && !open) {
					const iv: AudibleInterval = {
						rack: r + 1,
						deck: DECK_IDS[d],
						start: at,
						end: null,
						startEvent: index,
						endEvent: null
					};
					this.intervals.push(iv);
					this.#open[slot] = iv;
				} else if (!now && open) {
					open.end = at;
					open.endEvent = index;
					this.#open[slot] = null;
				}
			}
	}
}

export function replay(mapping: Mapping, events: readonly InputEvent[], options: ReplayOptions = {}): Timeline {
	const changes: Timeline['changes'] = [];
	const clamps: Timeline['clamps'] = [];
	const order: number[] = [];
	const audible = new AudibleTracker(mapping.decks);
	const start = options.from ?? initialRigState(mapping);
	audible.update(start, 0, -1);
	const final = runEvents(mapping, events, { ...options, from: start }, (result, _before, index, at) => {
		order.push(index);
		for (const c of result.changes) changes.push(c);
		for (const c of result.clamps) clamps.push(c);
		if (result.changes.length) audible.update(result.state, at, index);
	});
	return { changes, audible: audible.intervals, clamps, final, order };
}
