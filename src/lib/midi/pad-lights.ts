// Which pads are lit for a rig state, and the bank of device outputs that show it. A pad is lit
// while its effect is on: any rack its binding drives is audible (DESIGN.md §4.4) on the
// binding's deck, or on any deck when the binding names none; a deck-play binding is lit while
// its deck plays. The rule reads engine state only; it never decides what a step does.
import { isAudible } from '$lib/engine/rig';
import { DECK_IDS, type DeckId, type Mapping, type ControllerProfile, type RigState } from '$lib/engine/types';
import { LightFeedback, type LightOptions, type MidiSink } from './lights';

interface LightRule {
	input: string;
	racks: number[];
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
		for (const { target } of b.steps) {
			if ('rack' in target) racks.add(target.rack);
			else if (target.kind === 'deck-play') plays.add(target.deck);
		}
		return { input: b.input, racks: [...racks], decks: b.deck ? [b.deck] : DECK_IDS, plays: [...plays] };
	});
	rules.set(mapping, list);
	return list;
}

export function litInputs(mapping: Mapping, state: RigState): Set<string> {
	const lit = new Set<string>();
	for (const rule of rulesFor(mapping)) {
		if (lit.has(rule.input)) continue;
		const on =
			rule.racks.some((r) => rule.decks.some((d) => isAudible(state, r, d))) ||
			rule.plays.some((d) => state.decks[d].playing);
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
