// What each slot's effect is set to, from the rack as the engine holds it (DESIGN.md §2): focus
// mode gives slot 1's effect the rack's three knobs; chain mode keeps catalog defaults and lets
// the slot's amount drive the parameter(s) the catalog names for it.
import { EFFECTS } from '$lib/engine/effects';
import type { EffectId, RackState } from '$lib/engine/types';

/** The catalog parameters a chain slot's amount turns (engine/effects.ts `amount` describes them). */
export const AMOUNT_PARAMS: Record<EffectId, readonly string[]> = {
	echo: ['feedback'],
	'ping-pong': ['feedback'],
	'tape-echo': ['feedback'],
	reverb: ['size'],
	filter: ['cutoff'],
	stutter: ['slice'],
	gate: ['depth'],
	bitcrush: ['bits', 'rate'],
	flanger: ['depth'],
	phaser: ['depth']
};

export function slotValues(rack: RackState, slot: number, effect: EffectId): Record<string, number> {
	const values: Record<string, number> = {};
	const params = EFFECTS[effect].params;
	if (rack.mode === 'focus' && slot === 0) {
		params.forEach((p, i) => (values[p.id] = rack.params[i] ?? p.default));
		return values;
	}
	for (const p of params) values[p.id] = p.default;
	for (const id of AMOUNT_PARAMS[effect]) values[id] = rack.slots[slot].amount;
	return values;
}

/** Whether a slot's effect is in the signal path for this rack mode. */
export function slotActive(rack: RackState, slot: number): boolean {
	const s = rack.slots[slot];
	if (!s.on || s.effect === null) return false;
	return rack.mode === 'chain' || slot === 0;
}

/** DESIGN.md §4.4 without the deck's play state: the rack inserts its wet path on `routed`. */
export function rackEngaged(rack: RackState, routed: boolean): boolean {
	return rack.on && routed && rack.mix > 0 && rack.slots.some((_, i) => slotActive(rack, i));
}
