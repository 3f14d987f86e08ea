// Which pads are lit for a rig state, and the bank of device outputs that show it. A pad is lit
// while its effect is on: a rack it drives is audible (DESIGN.md §4.4) on the binding's deck (any
// deck when it names none) and, when the binding loads a chain or an effect, that is still what
// the rack holds, on — so of several pads sharing a rack only the one playing lights. In a hold
// group, whose pads load the same chain with other parameters, the pad whose setting is sounding
// is lit strong and the group's other held pads dim. A deck-play binding is lit while its deck
// plays. The rule reads engine state (the audible rule is the engine's); it never decides a step.
// Relative, not $lib: Node scripts (the benchmark) load this module without SvelteKit's aliases.
import { DECK_IDS, isAudible, type ControllerProfile, type DeckId, type Mapping, type RigState } from '../engine';
import { LightFeedback, type LightOptions, type MidiSink } from './lights';

interface Expect {
	rack: number; // 0-based
	position: number; // 0-based
	effect?: string | null; // the effect this binding puts there
	param?: number; // 0-based parameter index…
	value?: number; // …and the value it sets it to
}

interface LightRule {
	input: string;
	group: string | null;
	racks: number[]; // 0-based
	effects: Expect[]; // what the binding loads: an effect per position
	params: Expect[]; // the parameters it sets: what tells a hold group's pads apart
	deckMask: number; // bit i: DECK_IDS[i]
	plays: DeckId[];
}

/** Strong: the pad's own setting sounds. Dim: a held pad of a hold group another pad's setting won. */
export interface PadLights {
	lit: Set<string>;
	dim: Set<string>;
}

const rules = new WeakMap<Mapping, LightRule[]>();
const lastLit = new WeakMap<RigState, { mapping: Mapping; lights: PadLights }>();

function rulesFor(mapping: Mapping): LightRule[] {
	let list = rules.get(mapping);
	if (list) return list;
	list = mapping.bindings.map((b) => {
		const racks = new Set<number>();
		const plays = new Set<DeckId>();
		const effects: Expect[] = [];
		const params: Expect[] = [];
		for (const { target, action, value, phase } of b.steps) {
			if ('rack' in target) racks.add(target.rack - 1);
			else if (target.kind === 'deck-play') plays.add(target.deck);
			if (action !== 'set' || value === undefined || phase === 'release') continue;
			const rack = 'rack' in target ? target.rack - 1 : -1;
			if (target.kind === 'chain' && Array.isArray(value)) {
				for (let p = 0; p < 4; p++) effects.push({ rack, position: p, effect: value[p] ?? null });
			} else if (target.kind === 'effect' && (typeof value === 'string' || value === null)) {
				effects.push({ rack, position: target.position - 1, effect: value });
			} else if (target.kind === 'effect-param' && typeof value === 'number') {
				params.push({ rack, position: target.position - 1, param: target.param - 1, value });
			}
		}
		const deckMask = b.deck ? 1 << DECK_IDS.indexOf(b.deck) : (1 << DECK_IDS.length) - 1;
		return { input: b.input, group: b.group ?? null, racks: [...racks], effects, params, deckMask, plays: [...plays] };
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

function playsOwnEffect(rule: LightRule, state: RigState, audible: number): boolean {
	if (rule.effects.length) {
		for (const { rack, position, effect } of rule.effects) {
			if (effect === null) continue;
			const p = state.racks[rack]?.chain[position];
			if (p && p.on && p.effect === effect && (audible >> (rack * 4)) & rule.deckMask) return true;
		}
		return false;
	}
	for (const rack of rule.racks) if ((audible >> (rack * 4)) & rule.deckMask) return true;
	for (const deck of rule.plays) if (state.decks[deck].playing) return true;
	return false;
}

function paramsMatch(rule: LightRule, state: RigState): boolean {
	for (const { rack, position, param, value } of rule.params) {
		if (state.racks[rack]?.chain[position]?.params[param!] !== value) return false;
	}
	return true;
}

/** The strong and dim inputs for a state; the same sets come back for the same state (read-only). */
export function padLights(mapping: Mapping, state: RigState): PadLights {
	const cached = lastLit.get(state);
	if (cached && cached.mapping === mapping) return cached.lights;
	const audible = audibleBits(state);
	const lit = new Set<string>();
	const dim = new Set<string>();
	const groups = new Map<string, LightRule[]>();
	for (const rule of rulesFor(mapping)) {
		if (lit.has(rule.input) || !playsOwnEffect(rule, state, audible)) continue;
		if (rule.group === null) lit.add(rule.input);
		else groups.set(rule.group, [...(groups.get(rule.group) ?? []), rule]);
	}
	for (const members of groups.values()) {
		// The sounding pad: the one whose parameters the rack holds; after a knob moved them, the
		// group's pad pressed last. Its group's other held pads show dim; pads not held stay dark.
		const held = members.filter((r) => state.held.includes(r.input));
		const matching = members.filter((r) => paramsMatch(r, state));
		let strong: LightRule | undefined;
		if (matching.length === 1) strong = matching[0];
		else {
			const pool = matching.length ? matching : members;
			const last = [...state.held].reverse().find((id) => pool.some((r) => r.input === id));
			strong = pool.find((r) => r.input === last) ?? (held.length ? undefined : pool[0]);
		}
		if (strong) lit.add(strong.input);
		for (const r of held) if (r !== strong && !lit.has(r.input)) dim.add(r.input);
	}
	const lights = { lit, dim };
	lastLit.set(state, { mapping, lights });
	return lights;
}

/** The inputs lit strong for a state (see `padLights`); treat the Set as read-only. */
export function litInputs(mapping: Mapping, state: RigState): Set<string> {
	return padLights(mapping, state).lit;
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
