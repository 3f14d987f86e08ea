// What a mapping can put in front of the sound: for each declared rack, the effects each chain
// position may hold and the decks the rack may be routed to, read from the starting rig and every
// step. The audio layer builds those effect instances before the first press (DESIGN.md §5), so a
// press only moves gains and parameters.
import { initialRigState } from './rig';
import { CHAIN_MAX, DECK_IDS, EFFECT_IDS, type DeckId, type EffectId, type Mapping, type Step } from './types';

export interface RackReach {
	/** Per chain position (CHAIN_MAX entries): the effects it may hold, in the order first met. */
	effects: EffectId[][];
	/** Decks the rack is routed to at the start or may be routed to by some step, in deck order. */
	decks: DeckId[];
}

const isEffect = (v: unknown): v is EffectId => typeof v === 'string' && (EFFECT_IDS as readonly string[]).includes(v);

/** One entry per declared rack (index 0 is rack 1). */
export function mappingReach(mapping: Mapping): RackReach[] {
	const start = initialRigState(mapping);
	const positions = mapping.racks.map(() => Array.from({ length: CHAIN_MAX }, () => new Set<EffectId>()));
	const decks = mapping.racks.map(() => new Set<DeckId>());
	start.racks.forEach((rack, r) => {
		rack.chain.forEach((p, i) => p.effect && positions[r][i].add(p.effect));
		for (const d of DECK_IDS) if (rack.routes[d]) decks[r].add(d);
	});
	const read = (step: Step) => {
		const t = step.target;
		if (!('rack' in t)) return;
		const r = t.rack - 1;
		if (!positions[r]) return;
		if (t.kind === 'chain' && Array.isArray(step.value))
			step.value.slice(0, CHAIN_MAX).forEach((e, i) => isEffect(e) && positions[r][i].add(e));
		if (t.kind === 'effect' && isEffect(step.value)) positions[r][t.position - 1]?.add(step.value);
		// A step that only routes the rack away from a deck never brings it there.
		if (t.kind === 'rack-route' && !(step.action === 'set' && step.value === 0)) decks[r].add(t.deck);
	};
	for (const b of mapping.bindings) for (const s of b.steps) read(s);
	return mapping.racks.map((_, r) => ({
		effects: positions[r].map((s) => [...s]),
		decks: DECK_IDS.filter((d) => decks[r].has(d))
	}));
}
