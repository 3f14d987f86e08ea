// The finding rules of DESIGN.md §4.6, as conditions on one rig state. `analyze` turns them into
// timed findings over a replay and `verifyGroup` checks them at every explored state, so both read
// the same rules from here. A while-held binding belongs to a unit: its legato group (or its input
// alone) on its target deck, with the racks its steps switch on.
//   dropout    a pad of the unit is held, yet none of its racks is audible on its deck;
//   stuck-on   no pad of the unit is held (after it was played), yet one of its racks is audible on
//            its deck, the unit's own pads set that rack up last, and no held while-held pad or
//            latched pad is the reason;
//   bleed      a rack is audible on a deck other than the deck of the binding that last set it up;
//   count-left-over  no pad that counts a counter is held, yet the counter is off its rest value.
// Clash, count overflow and takeover are events, not states: `clashInputs`, the clamps applyEvent
// returns, and `takeovers` (another pad changes the chain, routing or on/off of a rack a latched
// pad holds on; a binding with `takeover: true` may). Knob and fader turns change values but never
// who set a rack up or holds it (DESIGN.md §4.6), so they neither hide nor end a finding.
import { isAudible } from './rig';
import { DECK_IDS, MAX_RACKS, type Binding, type DeckId, type Mapping, type RigChange, type RigState } from './types';

export interface Unit {
	key: string;
	name: string; // for messages: the group id or the pad's label
	deck: DeckId | null; // null: no target deck, any deck counts
	decks: DeckId[]; // [deck], or empty when deck is null
	inputs: Set<string>;
	racks: number[]; // 1-based
}

export interface Rules {
	decks: readonly DeckId[];
	units: Unit[];
	unitsByInput: Map<string, number[]>;
	/** `${rack}|${deck}` → inputs whose while-held bindings play that rack on that deck. */
	claims: Map<string, Set<string>>;
	/** For each rack (0-based): input → the binding that an event of that input counts as set up by. */
	touchers: Map<string, number>[];
	countingInputs: Map<string, Set<string>>;
	rest: Map<string, number>;
	clashInputs: Map<string, string[]>; // input → the other inputs on its MIDI address
	addressOf: Map<string, string>;
	bindings: Binding[];
	/** Per binding: a code equal for bindings the finding rules cannot tell apart as a rack's setter. */
	ownerCode: number[];
}

/** Mutable per-run facts the rig state doesn't hold. */
export interface WatchState {
	used: Uint8Array; // per unit: played at least once
	toucher: Int32Array; // per rack: binding index that last changed it, -1 none
	latched: Int32Array; // per rack: the latched binding holding it on, -1 none
}

/** Another pad changed a rack a latched pad holds on. Binding indexes. */
export interface Takeover {
	rack: number; // 1-based
	holder: number;
	by: number;
}

export interface Condition {
	kind: 'dropout' | 'stuck-on' | 'bleed' | 'count-left-over';
	key: string;
	unit: number; // -1 when not about a unit
	rack: number | null; // 1-based
	deck: DeckId | null;
	counter: string | null;
	binding: number | null;
}

const cache = new WeakMap<Mapping, Rules>();

export function rulesFor(mapping: Mapping): Rules {
	let r = cache.get(mapping);
	if (!r) cache.set(mapping, (r = buildRules(mapping)));
	return r;
}

/** Which racks a binding drives: those it switches on, else every rack it has a step on (1-based). */
export function racksOf(b: Binding): number[] {
	const on = new Set<number>();
	const any = new Set<number>();
	for (const s of b.steps)
		if ('rack' in s.target) {
			any.add(s.target.rack);
			if (s.target.kind === 'rack-on') on.add(s.target.rack);
		}
	return [...(on.size ? on : any)].sort();
}

const names = new WeakMap<Mapping, Map<string, string>>();

/** How messages name an input: its label in the profile, else its binding's label, else its id. */
export function inputName(mapping: Mapping, input: string): string {
	let map = names.get(mapping);
	if (!map) {
		map = new Map();
		for (const b of [...mapping.bindings].reverse()) if (b.label) map.set(b.input, b.label);
		for (const i of mapping.profile.inputs) if (i.label) map.set(i.id, i.label);
		names.set(mapping, map);
	}
	return map.get(input) ?? input;
}

/** How messages name a binding: its own label, else its input's name. */
export function bindingName(mapping: Mapping, b: Binding): string {
	return b.label ?? inputName(mapping, b.input);
}

export function addressText(i: Mapping['profile']['inputs'][0]): string {
	return i.note !== undefined ? `note ${i.note} on channel ${i.channel}` : `CC ${i.cc} on channel ${i.channel}`;
}

function buildRules(m: Mapping): Rules {
	const units: Unit[] = [];
	const unitIndex = new Map<string, number>();
	const unitsByInput = new Map<string, number[]>();
	const claims = new Map<string, Set<string>>();
	const add = <K, V>(map: Map<K, Set<V>>, k: K, v: V) => (map.get(k) ?? map.set(k, new Set()).get(k)!).add(v);
	m.bindings.forEach((b) => {
		if (b.intent !== 'while-held') return;
		const racks = racksOf(b);
		if (!racks.length) return;
		const key = `${b.group ?? `input:${b.input}`}|${b.deck ?? '*'}`;
		let u = unitIndex.get(key);
		if (u === undefined) {
			u = units.length;
			unitIndex.set(key, u);
			units.push({
				key,
				name: b.group ?? inputName(m, b.input),
				deck: b.deck ?? null,
				decks: b.deck ? [b.deck] : [],
				inputs: new Set(),
				racks: []
			});
		}
		const unit = units[u];
		unit.inputs.add(b.input);
		for (const r of racks) if (!unit.racks.includes(r)) unit.racks.push(r);
		const list = unitsByInput.get(b.input) ?? [];
		if (!list.includes(u)) list.push(u);
		unitsByInput.set(b.input, list);
		for (const r of racks) for (const d of b.deck ? [b.deck] : DECK_IDS) add(claims, `${r}|${d}`, b.input);
	});
	const touchers = Array.from({ length: MAX_RACKS }, () => new Map<string, number>());
	m.bindings.forEach((b, bi) => {
		for (const s of b.steps)
			if ('rack' in s.target && !touchers[s.target.rack - 1].has(b.input)) touchers[s.target.rack - 1].set(b.input, bi);
	});
	const countingInputs = new Map<string, Set<string>>();
	for (const b of m.bindings)
		for (const s of b.steps)
			if (s.target.kind === 'counter' && (s.action === 'count-up' || s.action === 'count-down'))
				add(countingInputs, s.target.counter, b.input);
	const byAddress = new Map<string, string[]>();
	const addressOf = new Map<string, string>();
	const bound = new Set(m.bindings.map((b) => b.input));
	for (const i of m.profile.inputs) {
		if (!bound.has(i.id)) continue;
		const a = `${i.channel}:${i.note !== undefined ? `n${i.note}` : `c${i.cc}`}`;
		addressOf.set(i.id, a);
		byAddress.set(a, [...(byAddress.get(a) ?? []), i.id]);
	}
	const clashInputs = new Map<string, string[]>();
	for (const ids of byAddress.values())
		if (ids.length > 1)
			for (const id of ids)
				clashInputs.set(
					id,
					ids.filter((x) => x !== id)
				);
	// Two bindings on one input answer the same address too.
	const perInput = new Map<string, number>();
	for (const b of m.bindings) perInput.set(b.input, (perInput.get(b.input) ?? 0) + 1);
	for (const [id, n] of perInput) if (n > 1 && !clashInputs.has(id)) clashInputs.set(id, [id]);
	// What the rules read of a rack's setter: its deck (bleed), whether it latches (stuck-on), the
	// units its input belongs to (stuck-on), whether it may take over (takeover).
	const codes = new Map<string, number>();
	const ownerCode = m.bindings.map((b) => {
		const key = [b.deck ?? '', b.intent ?? '', b.takeover ? 1 : 0, ...(unitsByInput.get(b.input) ?? [])].join('|');
		return codes.get(key) ?? codes.set(key, codes.size + 1).get(key)!;
	});
	return {
		decks: DECK_IDS.slice(0, m.decks),
		units,
		unitsByInput,
		claims,
		touchers,
		countingInputs,
		rest: new Map(m.counters.map((c) => [c.id, c.rest])),
		clashInputs,
		addressOf,
		bindings: m.bindings,
		ownerCode
	};
}

export function initialWatch(rules: Rules): WatchState {
	return {
		used: new Uint8Array(rules.units.length),
		toucher: new Int32Array(MAX_RACKS).fill(-1),
		latched: new Int32Array(MAX_RACKS).fill(-1)
	};
}

function isUsed(this: WatchState, u: number): boolean {
	return this.used[u] === 1;
}

/**
 * Record what one applied event means for the watch: units played, who last set up each rack and
 * which latched pad holds it on. `touched` and `reshaped` are rack bits (`rackBits`); `s` the state
 * after the event. A turn changes values only: it never changes who owns a rack.
 */
export function observe(
	rules: Rules,
	w: WatchState,
	input: string,
	type: string,
	touched: number,
	s: RigState,
	reshaped = touched
): WatchState {
	const units = type === 'press' ? rules.unitsByInput.get(input) : undefined;
	let next = w;
	if (units && !units.every(isUsed, w)) {
		next = { ...w, used: w.used.slice() };
		for (const u of units) next.used[u] = 1;
	}
	if (type === 'turn' || !touched) return next;
	for (let r = 0; r < MAX_RACKS; r++) {
		if (!(touched & (1 << r))) continue;
		const b = rules.touchers[r].get(input);
		if (b === undefined) continue;
		if (next.toucher[r] !== b) {
			if (next.toucher === w.toucher) next = { ...next, toucher: w.toucher.slice() };
			next.toucher[r] = b;
		}
		const on = s.racks[r]?.on ?? false;
		const holder = next.latched[r];
		const want =
			rules.bindings[b].intent === 'latched' && on
				? b
				: !on || (holder >= 0 && reshaped & (1 << r) && rules.bindings[holder].input !== input)
					? -1
					: holder;
		if (want !== holder) {
			if (next.latched === w.latched) next = { ...next, latched: w.latched.slice() };
			next.latched[r] = want;
		}
	}
	return next;
}

/** Takeovers by one event: read with the watch as it stood before the event (DESIGN.md §4.6). */
export function takeovers(rules: Rules, w: WatchState, input: string, type: string, reshaped: number): Takeover[] {
	if (type === 'turn' || !reshaped) return NONE;
	let out: Takeover[] = NONE;
	for (let r = 0; r < MAX_RACKS; r++) {
		const holder = w.latched[r];
		if (holder < 0 || !(reshaped & (1 << r)) || rules.bindings[holder].input === input) continue;
		const by = rules.touchers[r].get(input);
		if (by === undefined || rules.bindings[by].takeover) continue;
		if (out === NONE) out = [];
		out.push({ rack: r + 1, holder, by });
	}
	return out;
}

const NONE: Takeover[] = [];

/**
 * Bits per rack (0-based) that a change list touched, and of those the racks whose chain, routing
 * or on/off changed (what a takeover is about); mix and parameter values only touch.
 */
export function rackBits(changes: RigChange[]): { touched: number; reshaped: number } {
	let touched = 0;
	let reshaped = 0;
	for (let i = 0; i < changes.length; i++) {
		const p = changes[i].path;
		if (!p.startsWith('racks.')) continue;
		const bit = 1 << Number(p[6]);
		touched |= bit;
		// racks.N.on, racks.N.routes.X, racks.N.chain.P.effect|on — not .mix or .params.K
		if (p.endsWith('.on') || p.startsWith('routes', 8) || p.endsWith('.effect')) reshaped |= bit;
	}
	return { touched, reshaped };
}

// Plain loops below: this runs for every event of a replay and every edge of the verifier.
function heldAny(held: string[], inputs: Set<string>): boolean {
	for (let i = 0; i < held.length; i++) if (inputs.has(held[i])) return true;
	return false;
}

function audibleOn(s: RigState, racks: number[], deck: DeckId): boolean {
	for (let i = 0; i < racks.length; i++) if (isAudible(s, racks[i], deck)) return true;
	return false;
}

/** Every finding condition that holds in this state, in a fixed order. */
export function conditions(rules: Rules, s: RigState, w: WatchState): Condition[] {
	const out: Condition[] = [];
	for (let ui = 0; ui < rules.units.length; ui++) {
		const u = rules.units[ui];
		const decks = u.deck ? u.decks : rules.decks;
		if (heldAny(s.held, u.inputs)) {
			let heard = false;
			for (let k = 0; k < decks.length && !heard; k++) heard = audibleOn(s, u.racks, decks[k]);
			if (!heard)
				out.push({
					kind: 'dropout',
					key: `dropout|${u.key}`,
					unit: ui,
					rack: u.racks[0],
					deck: u.deck,
					counter: null,
					binding: null
				});
			continue;
		}
		if (!w.used[ui]) continue;
		for (const d of decks)
			for (const r of u.racks) {
				if (!isAudible(s, r, d) || !setUpBy(rules, w, r, u) || claimed(rules, s, w, r, d)) continue;
				out.push({
					kind: 'stuck-on',
					key: `stuck-on|${u.key}|${r}|${d}`,
					unit: ui,
					rack: r,
					deck: d,
					counter: null,
					binding: null
				});
			}
	}
	for (let r = 1; r <= MAX_RACKS; r++) {
		const b = w.toucher[r - 1];
		const target = b >= 0 ? rules.bindings[b].deck : undefined;
		if (!target) continue;
		for (const d of rules.decks)
			if (d !== target && isAudible(s, r, d))
				out.push({ kind: 'bleed', key: `bleed|${r}|${d}`, unit: -1, rack: r, deck: d, counter: null, binding: b });
	}
	for (const [c, inputs] of rules.countingInputs) {
		const v = s.counters[c];
		if (v !== undefined && v !== rules.rest.get(c) && !heldAny(s.held, inputs))
			out.push({
				kind: 'count-left-over',
				key: `count-left-over|${c}`,
				unit: -1,
				rack: null,
				deck: null,
				counter: c,
				binding: null
			});
	}
	return out;
}

/** Whether the unit's own pads were the last to change the rack (else its sound is another's doing). */
function setUpBy(rules: Rules, w: WatchState, rack: number, u: Unit): boolean {
	const b = w.toucher[rack - 1];
	return b >= 0 && u.inputs.has(rules.bindings[b].input);
}

function claimed(rules: Rules, s: RigState, w: WatchState, rack: number, deck: DeckId): boolean {
	const b = w.toucher[rack - 1];
	if (b >= 0 && rules.bindings[b].intent === 'latched') return true;
	const inputs = rules.claims.get(`${rack}|${deck}`);
	return !!inputs && heldAny(s.held, inputs);
}
