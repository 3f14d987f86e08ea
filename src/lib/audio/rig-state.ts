// The audio layer's private copy of the rig state, updated path by path from engine changes
// (`RigChange.path`, e.g. 'racks.0.routes.B'). It only records what the engine decided.
import { initialRack } from '$lib/engine/rig';
import { DECK_IDS, type RackState, type RigChange, type RigState } from '$lib/engine/types';

/** A rack as the engine starts it: off, unrouted, an empty chain. */
export const quietRack: () => RackState = initialRack;

/** `racks` racks off and unrouted, every deck playing. */
export function quietRig(racks = 1): RigState {
	const decks = Object.fromEntries(DECK_IDS.map((d) => [d, { playing: true }])) as RigState['decks'];
	return { racks: Array.from({ length: racks }, quietRack), decks, counters: {}, held: [] };
}

export interface Touched {
	racks: Set<number>;
	decks: Set<string>;
}

/** Writes one change into `state` (a private mutable copy) and notes which rack or deck it hit. */
export function writeChange(state: RigState, change: RigChange, touched: Touched): void {
	const keys = change.path.split('.');
	if (keys[0] === 'racks') touched.racks.add(Number(keys[1]));
	else if (keys[0] === 'decks') touched.decks.add(keys[1]);
	else return; // counters and held pads make no sound
	let node: Record<string, unknown> = state as unknown as Record<string, unknown>;
	for (const key of keys.slice(0, -1)) {
		const next = node[key];
		if (typeof next !== 'object' || next === null) return;
		node = next as Record<string, unknown>;
	}
	node[keys[keys.length - 1]] = change.to;
}
