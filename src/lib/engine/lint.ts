// Static checks a person can act on, before anything is played. Each finding points at a binding
// (and a step where one is to blame) and explains in plain words what will go wrong on stage.
// Rules: clash (two bindings on one MIDI address), partial-route (routes a rack to one deck but
// not away from every other deck), no-chain-load (a one-press pad that switches a rack on without
// loading its chain, so it inherits what the last pad left), counter-too-small (a counter whose max
// is below the number of pads that count it), legato-without-counter (a group sharing momentary on/off with no held-pad counter),
// unbalanced-count (count-up without a count-down on release), idle-guard (a guard on a counter
// nothing changes), dead-step (a step that can never run).
import { guardHolds } from './rig';
import { bindingName, inputName, rulesFor } from './watch';
import { DECK_IDS, type Binding, type Guard, type Mapping, type Step } from './types';

export const LINT_RULES = [
	'clash',
	'partial-route',
	'no-chain-load',
	'counter-too-small',
	'legato-without-counter',
	'unbalanced-count',
	'idle-guard',
	'dead-step'
] as const;
export type LintRule = (typeof LINT_RULES)[number];

export interface LintFinding {
	rule: LintRule;
	binding: number;
	step: number | null;
	input: string;
	message: string;
}

const isOn = (s: Step) => s.action === 'momentary' || s.action === 'toggle' || (s.action === 'set' && s.value === 1);
const isOff = (s: Step) => s.action === 'set' && s.value === 0;

export function lintMapping(m: Mapping): LintFinding[] {
	const out: LintFinding[] = [];
	const name = (b: Binding) => bindingName(m, b);
	const push = (rule: LintRule, bi: number, step: number | null, message: string) =>
		out.push({ rule, binding: bi, step, input: m.bindings[bi].input, message });
	clashes(m, push, name);
	m.bindings.forEach((b, bi) => {
		routes(m, b, bi, push, name);
		chainLoads(m, b, bi, push, name);
		counts(m, b, bi, push, name);
		deadSteps(m, b, bi, push, name);
	});
	legatoGroups(m, push);
	counterRoom(m, push);
	return out;
}

type Push = (rule: LintRule, bi: number, step: number | null, message: string) => void;
type Name = (b: Binding) => string;

function clashes(m: Mapping, push: Push, name: Name) {
	const rules = rulesFor(m);
	const firstAt = new Map<string, number>();
	m.bindings.forEach((b, bi) => {
		const addr = rules.addressOf.get(b.input);
		if (!addr) return;
		const first = firstAt.get(addr);
		if (first === undefined) return void firstAt.set(addr, bi);
		const input = m.profile.inputs.find((i) => i.id === b.input)!;
		const where = input.note !== undefined ? `note ${input.note}` : `CC ${input.cc}`;
		push(
			'clash',
			bi,
			null,
			`${name(b)} and ${name(m.bindings[first])} both answer ${where} on channel ${input.channel}: one press would run both`
		);
	});
}

function routes(m: Mapping, b: Binding, bi: number, push: Push, name: Name) {
	const decks = DECK_IDS.slice(0, m.decks);
	b.steps.forEach((s, si) => {
		if (s.target.kind !== 'rack-route' || !isOn(s)) return;
		const { rack, deck } = s.target;
		const missing = decks.filter(
			(d) =>
				d !== deck &&
				!b.steps.some(
					(o) => o.target.kind === 'rack-route' && o.target.rack === rack && o.target.deck === d && isOff(o)
				)
		);
		if (missing.length)
			push(
				'partial-route',
				bi,
				si,
				`${name(b)} routes rack ${rack} to deck ${deck} but not away from deck ${missing.join(', ')}: if an earlier pad left rack ${rack} on ${missing.length > 1 ? 'those decks' : 'that deck'}, this pad plays there too`
			);
	});
}

function chainLoads(m: Mapping, b: Binding, bi: number, push: Push, name: Name) {
	b.steps.forEach((s, si) => {
		if (s.target.kind !== 'rack-on' || !isOn(s)) return;
		const rack = s.target.rack;
		const onRack = b.steps.filter((o) => 'rack' in o.target && o.target.rack === rack);
		if (onRack.some((o) => o.target.kind === 'chain')) return;
		const setsUp = onRack.some((o) => o.target.kind !== 'rack-on');
		if (!b.intent && !setsUp) return;
		push(
			'no-chain-load',
			bi,
			si,
			`${name(b)} switches rack ${rack} on without loading its chain: it plays whatever effects the last pad left in rack ${rack}`
		);
	});
}

/** A hold group's counter must count every finger of the group, or a full chord clamps. */
function counterRoom(m: Mapping, push: Push) {
	const pads = new Map<string, { inputs: Set<string>; first: number }>();
	m.bindings.forEach((b, bi) => {
		for (const s of b.steps)
			if (s.target.kind === 'counter' && s.action === 'count-up') {
				const entry = pads.get(s.target.counter) ?? { inputs: new Set<string>(), first: bi };
				entry.inputs.add(b.input);
				pads.set(s.target.counter, entry);
			}
	});
	for (const [id, { inputs, first }] of pads) {
		const counter = m.counters.find((c) => c.id === id);
		if (!counter || counter.max >= inputs.size) continue;
		push(
			'counter-too-small',
			first,
			null,
			`counter ${id} goes up to ${counter.max}, but ${inputs.size} pads count it: holding them all at once overflows it`
		);
	}
}

function counts(m: Mapping, b: Binding, bi: number, push: Push, name: Name) {
	const changed = new Set(
		m.bindings.flatMap((o) => o.steps.flatMap((s) => (s.target.kind === 'counter' ? [s.target.counter] : [])))
	);
	b.steps.forEach((s, si) => {
		if (s.target.kind === 'counter' && s.action === 'count-up' && (s.phase ?? 'press') === 'press') {
			const c = s.target.counter;
			const down = b.steps.some(
				(o) =>
					o.target.kind === 'counter' && o.target.counter === c && o.action === 'count-down' && o.phase === 'release'
			);
			if (!down)
				push(
					'unbalanced-count',
					bi,
					si,
					`${name(b)} counts ${c} up on press but never down on release: ${c} creeps up with every press and its guards stop matching`
				);
		}
		const idle = [...new Set((s.guards ?? []).map((g) => g.counter).filter((c) => !changed.has(c)))];
		for (const c of idle)
			push(
				'idle-guard',
				bi,
				si,
				`step ${si + 1} of ${name(b)} is guarded on ${c}, but no step ever changes ${c}: the guard always reads its starting value`
			);
	});
}

function satisfiable(guards: Guard[], max: number): boolean {
	for (let v = 0; v <= max; v++) if (guards.every((g) => guardHolds(g.op, v, g.value))) return true;
	return false;
}

function deadSteps(m: Mapping, b: Binding, bi: number, push: Push, name: Name) {
	const kind = m.profile.inputs.find((i) => i.id === b.input)?.kind;
	b.steps.forEach((s, si) => {
		const label = `step ${si + 1} of ${name(b)}`;
		const byCounter = new Map<string, Guard[]>();
		for (const g of s.guards ?? []) byCounter.set(g.counter, [...(byCounter.get(g.counter) ?? []), g]);
		for (const [c, gs] of byCounter) {
			const max = m.counters.find((x) => x.id === c)?.max ?? 0;
			if (!satisfiable(gs, max))
				push(
					'dead-step',
					bi,
					si,
					`${label} can never run: no value of ${c} from 0 to ${max} passes ${gs.map((g) => `${c} ${g.op} ${g.value}`).join(' and ')}`
				);
		}
		if (s.action === 'toggle' && s.phase === 'release')
			push(
				'dead-step',
				bi,
				si,
				`${label} is a toggle set to release, but toggles flip on press only: it never runs on release`
			);
		const followsKnob = s.action === 'set' && s.value === undefined;
		if (followsKnob && (kind === 'pad' || kind === 'button'))
			push(
				'dead-step',
				bi,
				si,
				`${label} has no value, so it follows a knob, but ${inputName(m, b.input)} is a ${kind}: it never runs`
			);
	});
}

function legatoGroups(m: Mapping, push: Push) {
	const groups = new Map<string, number[]>();
	m.bindings.forEach((b, bi) => b.group && groups.set(b.group, [...(groups.get(b.group) ?? []), bi]));
	for (const [group, members] of groups) {
		if (new Set(members.map((bi) => m.bindings[bi].input)).size < 2) continue;
		const counted = members.some((bi) =>
			m.bindings[bi].steps.some((s) => s.action === 'count-up' || s.action === 'count-down')
		);
		if (counted) continue;
		const momentary = new Map<string, number[]>();
		for (const bi of members)
			m.bindings[bi].steps.forEach((s, si) => {
				if (s.action !== 'momentary' || s.target.kind !== 'rack-on') return;
				const key = `rack ${s.target.rack}`;
				momentary.set(key, [...(momentary.get(key) ?? []), bi * 1000 + si]);
			});
		for (const [what, hits] of momentary) {
			if (hits.length < 2) continue;
			const first = hits[0];
			push(
				'legato-without-counter',
				Math.floor(first / 1000),
				first % 1000,
				`the ${hits.length} pads of ${group} switch ${what} on and off as plain momentary steps with no held-pad counter: lifting any one finger cuts the effect while the others are still down`
			);
		}
	}
}
