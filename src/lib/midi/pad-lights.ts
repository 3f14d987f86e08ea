// Which pads are lit for a rig state, and the bank of device outputs that show it. A pad is lit
// while its effect is on: a rack it drives is audible (DESIGN.md §4.4) on the binding's deck (any
// deck when it names none) and, when the binding chooses an effect, that effect is still the one
// in its slot and on — so of several pads sharing a rack only the one playing lights. A deck-play
// binding is lit while its deck plays. The rule reads engine state; it never decides a step.
import { DECK_IDS, isAudible, type ControllerProfile, type DeckId, type Mapping, type RigState } from '$lib/engine';
import { LightFeedback, type LightOptions, type MidiSink } from './lights';

interface LightRule {
	input: string;
	racks: number[]; // 1-based
	effects: { rack: number; slot: number; effect: string }[];
	decks: readonly DeckId[];
	plays: DeckId[];
}

const rules = new WeakMap<Mapping, LightRule[]>();

function rulesFor(mapping: Mapping): LightRule[] {
	let list = rules.get(mapping);
	if (list) return list;
	list = mapping.bindings.map((b) => {
		const racks = new Set<number>();
		const plays = new Set<DeckId>();
		const effects: LightRule['effects'] = [];
		for (const { target, action, value } of b.steps) {
			if ('rack' in target) racks.add(target.rack);
			else if (target.kind === 'deck-play') plays.add(target.deck);
			if (target.kind === 'slot-effect' && action === 'set' && typeof value === 'string') {
				effects.push({ rack: target.rack, slot: target.slot, effect: value });
			}
		}
		return { input: b.input, racks: [...racks], effects, decks: b.deck ? [b.deck] : DECK_IDS, plays: [...plays] };
	});
	rules.set(mapping, list);
	return list;
}

export function litInputs(mapping: Mapping, state: RigState): Set<string> {
	const lit = new Set<string>();
	for (const rule of rulesFor(mapping)) {
		if (lit.has(rule.input)) continue;
		const audible = (r: number) => rule.decks.some((d) => isAudible(state, r, d));
		const on = rule.effects.length
			? rule.effects.some(({ rack, slot, effect }) => {
					const s = state.racks[rack - 1]?.slots[slot - 1];
					return s?.effect === effect && s.on && audible(rack);
				})
			: rule.racks.some(audible) || rule.plays.some((d) => state.decks[d].playing);
		if (on) lit.add(rule.input);
	}
	return lit;
}

/** One LightFeedback per device output; the same lit set goes to all of them. */
export class LightBank {
	#outputs = new Map<string, LightFeedback>();
	#lit: Set<string> = new Set();
	#options: LightOptions;

	constructor(options: LightOptions = {}) {
		this.#options = options;
	}

	get size(): number {
		return this.#outputs.size;
	}

	/** `profile` must carry the mapping's input ids (see alignProfile) and the device's LEDs. */
	attach(portId: string, profile: ControllerProfile, sink: MidiSink): void {
		this.detach(portId);
		const lights = new LightFeedback(profile, sink, this.#options);
		this.#outputs.set(portId, lights);
		lights.show(this.#lit);
	}

	/** Darkens the port if it can still hear us, then forgets it. */
	detach(portId: string): void {
		this.#outputs.get(portId)?.dark();
		this.#outputs.delete(portId);
	}

	show(lit: Set<string>): void {
		this.#lit = lit;
		for (const lights of this.#outputs.values()) lights.show(lit);
	}

	flush(): void {
		for (const lights of this.#outputs.values()) lights.flush();
	}

	darkAll(): void {
		for (const lights of this.#outputs.values()) lights.dark();
	}
}
