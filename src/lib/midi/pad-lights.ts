// Which pads are lit for a rig state, and the bank of device outputs that show it. A pad is lit
// while its effect is on: a rack it drives is audible (DESIGN.md §4.4) on the binding's deck (any
// deck when it names none) and, when the binding chooses an effect, that effect is still the one
// in its slot and on — so of several pads sharing a rack only the one playing lights. A deck-play
// binding is lit while its deck plays. The rule reads engine state; it never decides a step.
// Relative, not $lib: Node scripts (the benchmark) load this module without SvelteKit's aliases.
import { DECK_IDS, isAudible, type ControllerProfile, type DeckId, type Mapping, type RigState } from '../engine';
import { LightFeedback, type LightOptions, type MidiSink } from './lights';

interface LightRule {
	input: string;
	racks: number[]; // 0-based
	effects: { rack: number; slot: number; effect: string }[]; // 0-based rack and slot
	deckMask: number; // bit i: DECK_IDS[i]
	plays: DeckId[];
}

const rules = new WeakMap<Mapping, LightRule[]>();
const lastLit = new WeakMap<RigState, { mapping: Mapping; lit: Set<string> }>();

function rulesFor(mapping: Mapping): LightRule[] {
	let list = rules.get(mapping);
	if (list) return list;
	list = mapping.bindings.map((b) => {
		const racks = new Set<number>();
		const plays = new Set<DeckId>();
		const effects: LightRule['effects'] = [];
		for (const { target, action, value } of b.steps) {
			if ('rack' in target) racks.add(target.rack - 1);
			else if (target.kind === 'deck-play') plays.add(target.deck);
			if (target.kind === 'slot-effect' && action === 'set' && typeof value === 'string') {
				effects.push({ rack: target.rack - 1, slot: target.slot - 1, effect: value });
			}
		}
		const deckMask = b.deck ? 1 << DECK_IDS.indexOf(b.deck) : (1 << DECK_IDS.length) - 1;
		return { input: b.input, racks: [...racks], effects, deckMask, plays: [...plays] };
	});
	rules.set(mapping, list);
	return list;
}

/** Bit (rack × 4 + deck index) set when that rack is audible on that deck. */
function audibleBits(state: RigState): number {
	let bits = 0;
	for (let r = 0; r < state.racks.length; r++) {
		if (!state.racks[r].on) continue;
		for (let d = 0; d < DECK_IDS.length; d++) if (isAudible(state, r + 1, DECK_IDS[d])) bits |= 1 << (r * 4 + d);
	}
	return bits;
}

/** The lit inputs for a state; the same Set comes back for the same state (treat it as read-only). */
export function litInputs(mapping: Mapping, state: RigState): Set<string> {
	const cached = lastLit.get(state);
	if (cached && cached.mapping === mapping) return cached.lit;
	const audible = audibleBits(state);
	const lit = new Set<string>();
	for (const rule of rulesFor(mapping)) {
		if (lit.has(rule.input)) continue;
		let on = false;
		if (rule.effects.length) {
			for (const { rack, slot, effect } of rule.effects) {
				const s = state.racks[rack]?.slots[slot];
				if (s && s.on && s.effect === effect && (audible >> (rack * 4)) & rule.deckMask) on = true;
			}
		} else {
			for (const rack of rule.racks) if ((audible >> (rack * 4)) & rule.deckMask) on = true;
			for (const deck of rule.plays) if (state.decks[deck].playing) on = true;
		}
		if (on) lit.add(rule.input);
	}
	lastLit.set(state, { mapping, lit });
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
