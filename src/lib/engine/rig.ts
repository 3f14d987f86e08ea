// Step semantics (DESIGN.md §4.2–§4.4) in ONE pure function, `applyEvent`. Live play (the rig
// actor), replay, analysis, the verifier and scoring all call it; nothing else decides what a step
// does. Contract:
// - guards read the counters as they stood before the event (the old state's object is the snapshot);
// - steps run in binding order, then list order; every change of one event carries the event's time;
// - a path changed twice in one event is reported once, old → final (the audio layer sees the net
//   change, so a switch-off-then-on in one event is no click), and not at all if it ends unchanged;
// - count steps clamp to 0..max and every clamp is returned.
// States are immutable and structurally shared: only the rack, slot list or counters an event
// touches are copied, which keeps an event to a handful of small allocations.
// Semantics beyond §4: `momentary` ignores phase (on at press, off at release); `toggle` flips at
// press; a `set` step without a value follows a knob and runs on `turn` events only, taking the
// knob's position (scaled to the counter's max for counters); release of an input not held still
// runs its release steps, as a device would.
import { compileMapping, type CompiledStep, T } from './compile';
import { EFFECTS } from './effects';
import {
	CHAIN_MAX,
	DECK_IDS,
	PARAM_COUNT,
	type Clamp,
	type DeckId,
	type EffectId,
	type GuardOp,
	type InputEvent,
	type Mapping,
	type PositionState,
	type RackState,
	type RigChange,
	type RigState,
	type StepResult
} from './types';

const EMPTY_PARAMS: readonly number[] = Array.from({ length: PARAM_COUNT }, () => 0.5);

export function emptyPosition(): PositionState {
	return { effect: null, on: false, params: EMPTY_PARAMS.slice() };
}

/** A position as a `chain` step loads it: the effect on, its parameters at the catalog defaults. */
export function loadedPosition(effect: EffectId): PositionState {
	return { effect, on: true, params: EFFECTS[effect].params.map((p) => p.default) };
}

export function initialRack(): RackState {
	return {
		on: false,
		mix: 0.5,
		routes: { A: false, B: false, C: false, D: false },
		chain: Array.from({ length: CHAIN_MAX }, emptyPosition)
	};
}

/** Racks off, unrouted and empty, the mapping's decks playing, counters at their rest values. */
export function initialRigState(mapping: Mapping): RigState {
	const counters: Record<string, number> = {};
	for (const c of mapping.counters) counters[c.id] = c.rest;
	const decks = {} as RigState['decks'];
	DECK_IDS.forEach((d, i) => (decks[d] = { playing: i < mapping.decks }));
	return { racks: mapping.racks.map(initialRack), decks, counters, held: [] };
}

/** Whether a rack's chain makes any sound of its own: at least one position on with an effect. */
export function chainSounds(r: RackState): boolean {
	for (const p of r.chain) if (p.on && p.effect !== null) return true;
	return false;
}

/** DESIGN.md §4.4, the one audible rule. `rack` is 1-based, as people count racks. */
export function isAudible(state: RigState, rack: number, deck: DeckId): boolean {
	const r = state.racks[rack - 1];
	if (!r || !r.on || !r.routes[deck] || !state.decks[deck].playing || !(r.mix > 0)) return false;
	return chainSounds(r);
}

const NO_CLAMPS: Clamp[] = [];

/** Copy-on-write view of one event's work on a state. */
class Draft {
	racks: RackState[] | null = null;
	rackCopied = 0; // bit per rack already copied in this event
	chainCopied = 0;
	decks: RigState['decks'] | null = null;
	counters: Record<string, number> | null = null;
	changes: RigChange[] = [];
	clamps: Clamp[] = NO_CLAMPS;
	constructor(
		readonly base: RigState,
		readonly t: number,
		readonly event: number
	) {}

	/** The rack as it stands now in this event, without copying it. */
	peek(i: number): RackState {
		return (this.racks ?? this.base.racks)[i];
	}

	rack(i: number): RackState {
		if (this.rackCopied & (1 << i)) return this.racks![i];
		if (!this.racks) this.racks = this.base.racks.slice();
		const copy = { ...this.racks[i] };
		this.racks[i] = copy;
		this.rackCopied |= 1 << i;
		return copy;
	}

	chain(i: number): RackState['chain'] {
		const r = this.rack(i);
		if (!(this.chainCopied & (1 << i))) {
			r.chain = r.chain.slice();
			this.chainCopied |= 1 << i;
		}
		return r.chain;
	}

	record(path: string, from: unknown, to: unknown): void {
		if (from === to) return;
		const list = this.changes;
		for (let k = 0; k < list.length; k++) {
			if (list[k].path !== path) continue;
			if (list[k].from === to) list.splice(k, 1);
			else list[k].to = to;
			return;
		}
		list.push({ t: this.t, event: this.event, path, from, to });
	}

	finish(held: string[]): RigState {
		const b = this.base;
		if (!this.racks && !this.decks && !this.counters && held === b.held) return b;
		return {
			racks: this.racks ?? b.racks,
			decks: this.decks ?? b.decks,
			counters: this.counters ?? b.counters,
			held
		};
	}
}

/** The one guard comparison (DESIGN.md §4.2): does counter value `v` pass `op value`? */
export function guardHolds(op: GuardOp, v: number, value: number): boolean {
	switch (op) {
		case '=':
			return v === value;
		case '!=':
			return v !== value;
		case '<':
			return v < value;
		case '<=':
			return v <= value;
		case '>':
			return v > value;
		case '>=':
			return v >= value;
	}
}

function guardsHold(step: CompiledStep, snapshot: Record<string, number>): boolean {
	const gs = step.guards;
	for (let g = 0; g < gs.length; g++) {
		const { counter, op, value } = gs[g];
		if (!guardHolds(op, snapshot[counter] ?? 0, value)) return false;
	}
	return true;
}

/** The value a step writes for this event, or undefined when the step doesn't run. */
function stepValue(step: CompiledStep, type: InputEvent['type'], knob: number | undefined) {
	if (type === 'turn') return step.followsKnob ? (knob ?? 0) : undefined;
	if (step.followsKnob) return undefined;
	if (step.action === 'momentary') return type === 'press' ? 1 : 0;
	if (step.action === 'toggle') return type === 'press' ? 'flip' : undefined;
	if (step.phase !== type) return undefined;
	// Count and reset steps carry no value; any defined value means "run".
	return step.action === 'set' ? step.value : 0;
}

// No closures on the hot path: each one costs an allocation per step.
function switched(was: boolean, flip: boolean, v: unknown): boolean {
	return flip ? !was : v === 1;
}

function runStep(d: Draft, step: CompiledStep, type: InputEvent['type'], knob: number | undefined) {
	const v = stepValue(step, type, knob);
	if (v === undefined) return;
	const flip = v === 'flip';
	const ri = step.rack;
	switch (step.kind) {
		case T.rackOn: {
			const to = switched(d.peek(ri).on, flip, v);
			if (to === d.peek(ri).on) return;
			d.record(step.path, !to, to);
			d.rack(ri).on = to;
			return;
		}
		case T.rackMix: {
			const from = d.peek(ri).mix;
			if (from === v) return;
			d.record(step.path, from, v);
			d.rack(ri).mix = v as number;
			return;
		}
		case T.rackRoute: {
			const deck = step.deck!;
			const from = d.peek(ri).routes[deck];
			const to = switched(from, flip, v);
			if (to === from) return;
			d.record(step.path, from, to);
			const r = d.rack(ri);
			r.routes = { ...r.routes, [deck]: to };
			return;
		}
		case T.chain:
			return loadChain(d, ri, v as EffectId[]);
		case T.effect:
		case T.effectOn: {
			const old = d.peek(ri).chain[step.position];
			const key = step.kind === T.effect ? 'effect' : 'on';
			const to = key === 'effect' ? (v as EffectId | null) : switched(old.on, flip, v);
			if (old[key] === to) return;
			d.record(step.path, old[key], to);
			d.chain(ri)[step.position] = { ...old, [key]: to };
			return;
		}
		case T.effectParam: {
			const old = d.peek(ri).chain[step.position];
			if (old.params[step.param] === v) return;
			d.record(step.path, old.params[step.param], v);
			const params = old.params.slice();
			params[step.param] = v as number;
			d.chain(ri)[step.position] = { ...old, params };
			return;
		}
		case T.deckPlay: {
			const deck = step.deck!;
			const cur = (d.decks ?? d.base.decks)[deck].playing;
			const to = switched(cur, flip, v);
			if (to === cur) return;
			d.record(step.path, cur, to);
			d.decks = { ...(d.decks ?? d.base.decks), [deck]: { playing: to } };
			return;
		}
		case T.counter:
			return runCounter(d, step, v, type);
	}
}

/** Load a whole chain: the listed effects on with default parameters, the positions after them emptied. */
function loadChain(d: Draft, ri: number, effects: EffectId[]) {
	const before = d.peek(ri).chain;
	let chain: PositionState[] | null = null;
	for (let p = 0; p < CHAIN_MAX; p++) {
		const want = p < effects.length ? loadedPosition(effects[p]) : emptyPosition();
		const old = before[p];
		const base = `racks.${ri}.chain.${p}`;
		let same = old.effect === want.effect && old.on === want.on;
		if (old.effect !== want.effect) d.record(`${base}.effect`, old.effect, want.effect);
		if (old.on !== want.on) d.record(`${base}.on`, old.on, want.on);
		for (let k = 0; k < PARAM_COUNT; k++)
			if (old.params[k] !== want.params[k]) {
				d.record(`${base}.params.${k}`, old.params[k], want.params[k]);
				same = false;
			}
		if (same) continue;
		chain ??= d.chain(ri);
		chain[p] = want;
	}
}

function runCounter(d: Draft, step: CompiledStep, v: unknown, type: InputEvent['type']) {
	const id = step.counter!;
	const cur = (d.counters ?? d.base.counters)[id] ?? 0;
	const max = step.max;
	let want: number;
	if (step.action === 'count-up') want = cur + 1;
	else if (step.action === 'count-down') want = cur - 1;
	else if (step.action === 'reset') want = 0;
	else if (type === 'turn') want = Math.round((v as number) * max);
	else want = v as number;
	const to = Math.min(max, Math.max(0, want));
	if (to !== want) {
		if (d.clamps === NO_CLAMPS) d.clamps = [];
		d.clamps.push({
			t: d.t,
			event: d.event,
			counter: id,
			binding: step.binding,
			step: step.index,
			attempted: want,
			value: to
		});
	}
	if (to === cur) return;
	d.record(step.path, cur, to);
	if (!d.counters) d.counters = { ...d.base.counters };
	d.counters[id] = to;
}

function nextHeld(held: string[], event: InputEvent): string[] {
	if (event.type === 'press') return held.includes(event.input) ? held : [...held, event.input];
	if (event.type !== 'release') return held;
	const at = held.indexOf(event.input);
	if (at < 0) return held;
	const next = held.slice();
	next.splice(at, 1);
	return next;
}

/**
 * The engine: apply one input event to the rig. `index` is the event's position in its session;
 * it is stamped on every change and clamp so findings can point back at the press that caused them.
 */
export function applyEvent(mapping: Mapping, state: RigState, event: InputEvent, index: number): StepResult {
	const steps = compileMapping(mapping).stepsByInput.get(event.input);
	const d = new Draft(state, event.t, index);
	let setUp = 0;
	if (steps) {
		const snapshot = state.counters;
		for (let k = 0; k < steps.length; k++) {
			const step = steps[k];
			if (step.guards.length && !guardsHold(step, snapshot)) continue;
			// A knob turn changes values but never who set a rack up (DESIGN.md §4.6).
			if (step.rack >= 0 && event.type !== 'turn' && stepValue(step, event.type, undefined) !== undefined)
				setUp |= 1 << step.rack;
			runStep(d, step, event.type, event.value);
		}
	}
	const held = nextHeld(state.held, event);
	if (held !== state.held) d.record('held', state.held, held);
	return { state: d.finish(held), changes: d.changes, clamps: d.clamps, setUp };
}

/** Fold a list of events through `applyEvent` (no timing, no quantize): handy for tests and tools. */
export function applyEvents(mapping: Mapping, events: InputEvent[], from = initialRigState(mapping)): RigState {
	let s = from;
	for (let i = 0; i < events.length; i++) s = applyEvent(mapping, s, events[i], i).state;
	return s;
}
