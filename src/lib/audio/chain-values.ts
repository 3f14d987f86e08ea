// What each chain position plays, from the rack as the engine holds it (DESIGN.md §2): every
// position has its own effect, its own on and its own three parameters (0..1, catalog order).
// Whether a rack sounds is the engine's rule (`isAudible`), never a copy of it.
import { EFFECTS } from '$lib/engine/effects';
import { isAudible } from '$lib/engine/rig';
import type { DeckId, PositionState, RackState, RigState } from '$lib/engine/types';

/** A position's parameters by catalog id; a missing value falls back to the catalog default. */
export function positionValues(position: PositionState): Record<string, number> {
	const values: Record<string, number> = {};
	if (position.effect === null) return values;
	EFFECTS[position.effect].params.forEach((p, i) => (values[p.id] = position.params[i] ?? p.default));
	return values;
}

/** Whether a position's effect is in the signal path: it holds an effect and is on. */
export function positionActive(position: PositionState): boolean {
	return position.on && position.effect !== null;
}

const PLAYING: RigState['decks'] = {
	A: { playing: true },
	B: { playing: true },
	C: { playing: true },
	D: { playing: true }
};

/**
 * The engine's audible rule (DESIGN.md §4.4) for one rack on one deck, with the deck taken as
 * playing: a stopped deck is silenced before its inserts (deck.ts), so effect tails ring out.
 */
export function rackEngaged(rack: RackState, deck: DeckId): boolean {
	return isAudible({ racks: [rack], decks: PLAYING, counters: {}, held: [] }, 1, deck);
}
