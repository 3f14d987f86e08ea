// Findings over a replay (DESIGN.md §4.6). The state rules live in watch.ts; this module times
// them: a finding opens at the event after which its condition first holds (that event is its
// cause) and closes at the event after which it no longer does (end null if it lasts to the end).
// Count overflows, clashes and takeovers are instant findings at their event. Each finding says in plain words which
// press or release did what, e.g. "release of Pad 13 at 12.438 s turned rack 2 off while Pad 14
// was held".
import { runEvents, type ReplayOptions } from './replay';
import { initialRigState, isAudible } from './rig';
import {
	bindingName,
	conditions,
	initialWatch,
	inputName,
	observe,
	rackBits,
	rulesFor,
	takeovers,
	type Condition,
	type Takeover,
	type Rules,
	type WatchState
} from './watch';
import type { Clamp, DeckId, Finding, InputEvent, Mapping, RigChange, RigState } from './types';

export const seconds = (ms: number) => `${(ms / 1000).toFixed(3)} s`;

function cause(m: Mapping, e: InputEvent, at: number): string {
	const verb = e.type === 'turn' ? 'turn' : e.type;
	return `${verb} of ${inputName(m, e.input)} at ${seconds(at)}`;
}

const list = (names: string[]) =>
	names.length <= 1 ? (names[0] ?? '') : `${names.slice(0, -1).join(', ')} and ${names[names.length - 1]}`;

/** What a change did to a rack's sound on a deck, in words, or null if it didn't silence it. */
function silencing(c: RigChange, rack: number, deck: DeckId | null): string | null {
	const p = c.path.split('.');
	if (p[0] === 'decks' && c.to === false && (!deck || p[1] === deck)) return `stopped deck ${p[1]}`;
	if (p[0] !== 'racks' || Number(p[1]) !== rack - 1) return null;
	const k = p[2];
	if (k === 'on' && c.to === false) return `turned rack ${rack} off`;
	if (k === 'routes' && c.to === false && (!deck || p[3] === deck)) return `routed rack ${rack} away from deck ${p[3]}`;
	if (k === 'mix' && c.to === 0) return `set rack ${rack}'s mix to 0`;
	if (k === 'chain' && p[4] === 'effect' && c.to === null)
		return `emptied position ${Number(p[3]) + 1} of rack ${rack}'s chain`;
	if (k === 'chain' && p[4] === 'on' && c.to === false)
		return `switched position ${Number(p[3]) + 1} of rack ${rack}'s chain off`;
	return null;
}

/** Why a rack is silent on a deck, for messages. */
export function whySilent(s: RigState, rack: number, deck: DeckId): string {
	const r = s.racks[rack - 1];
	if (!r.on) return `rack ${rack} is off`;
	if (!r.routes[deck]) return `rack ${rack} isn't routed to deck ${deck}`;
	if (!s.decks[deck].playing) return `deck ${deck} isn't playing`;
	if (!(r.mix > 0)) return `rack ${rack}'s mix is at 0`;
	return `no position of rack ${rack}'s chain is on with an effect`;
}

function message(
	m: Mapping,
	rules: Rules,
	c: Condition,
	e: InputEvent,
	at: number,
	s: RigState,
	before: RigState,
	changes: RigChange[]
): string {
	const by = cause(m, e, at);
	if (c.kind === 'dropout') {
		const u = rules.units[c.unit];
		const held = s.held.filter((h) => u.inputs.has(h)).map((h) => inputName(m, h));
		const was = `while ${list(held)} ${held.length > 1 ? 'were' : 'was'} held`;
		// Blame a change only for a rack this very event silenced.
		for (const r of u.racks.filter((x) => (u.deck ? [u.deck] : rules.decks).some((d) => isAudible(before, x, d))))
			for (const ch of changes) {
				const what = silencing(ch, r, u.deck);
				if (what) return `${by} ${what} ${was}`;
			}
		const deck = u.deck ?? 'A';
		return `${by} left ${u.name} silent on deck ${deck} ${was}: ${whySilent(s, u.racks[0], deck)}`;
	}
	if (c.kind === 'stuck-on')
		return `${by} left no pad of ${rules.units[c.unit].name} held, yet rack ${c.rack} stays audible on deck ${c.deck}`;
	if (c.kind === 'bleed') {
		const b = rules.bindings[c.binding!];
		return `${by} left rack ${c.rack} audible on deck ${c.deck}, but ${bindingName(m, b)} targets deck ${b.deck}`;
	}
	const rest = rules.rest.get(c.counter!);
	return `${by} left no pad that counts ${c.counter} held, yet it reads ${s.counters[c.counter!]} instead of ${rest}`;
}

function clampMessage(m: Mapping, e: InputEvent, cl: Clamp): string {
	const max = m.counters.find((c) => c.id === cl.counter)?.max ?? cl.value;
	const where = cl.attempted > cl.value ? `above its max ${max}` : 'below 0';
	return `${cause(m, e, cl.t)} tried to take ${cl.counter} to ${cl.attempted}, ${where}; it stayed at ${cl.value}`;
}

function clashMessage(m: Mapping, rules: Rules, e: InputEvent, at: number): string {
	const others = rules.clashInputs.get(e.input)!;
	const input = m.profile.inputs.find((i) => i.id === e.input);
	const addr = input
		? (input.note !== undefined ? `note ${input.note}` : `CC ${input.cc}`) + ` on channel ${input.channel}`
		: 'its address';
	const who = others[0] === e.input ? 'two bindings of this pad' : list(others.map((o) => inputName(m, o)));
	return `${cause(m, e, at)} sounded ${addr}, which ${who} also answer${others.length > 1 || others[0] === e.input ? '' : 's'}`;
}

function takeoverMessage(m: Mapping, e: InputEvent, at: number, t: Takeover): string {
	const holder = m.bindings[t.holder];
	const by = m.bindings[t.by];
	const name = (b: typeof holder) => bindingName(m, b);
	return `${cause(m, e, at)} changed rack ${t.rack} while ${name(holder)} held it on (latched): ${name(by)} took over ${name(holder)}'s effect`;
}

const blank = { binding: null, input: null, deck: null, rack: null, counter: null } as const;

function unitBinding(m: Mapping, rules: Rules, c: Condition, input: string, state: RigState): number | null {
	if (c.binding !== null) return c.binding;
	if (c.unit < 0) return null;
	const u = rules.units[c.unit];
	const pick = (id: string) => m.bindings.findIndex((b) => b.input === id && b.intent === 'while-held');
	// A dropout belongs to a pad still held; a stuck rack to the pad just lifted.
	const held = c.kind === 'dropout' ? state.held.find((h) => u.inputs.has(h)) : undefined;
	const own = held ?? (u.inputs.has(input) ? input : [...u.inputs][0]);
	return pick(own);
}

export function analyze(mapping: Mapping, events: readonly InputEvent[], options: ReplayOptions = {}): Finding[] {
	const rules = rulesFor(mapping);
	const findings: Finding[] = [];
	const open = new Map<string, Finding>();
	const clashed = new Set<string>();
	// Which conditions held after the latest event, without a new Set per event.
	const lastSeen = new Map<string, number>();
	let stamp = 0;
	let watch: WatchState = initialWatch(rules);
	runEvents(
		mapping,
		events,
		{ ...options, from: options.from ?? initialRigState(mapping) },
		(result, prior, index, at) => {
			const e = events[index];
			const addr = rules.addressOf.get(e.input);
			if (rules.clashInputs.has(e.input) && e.type !== 'release' && addr && !clashed.has(addr)) {
				clashed.add(addr);
				findings.push({
					kind: 'clash',
					start: at,
					end: at,
					event: index,
					...blank,
					input: e.input,
					binding: mapping.bindings.findIndex((b) => b.input === e.input),
					message: clashMessage(mapping, rules, e, at)
				});
			}
			for (const cl of result.clamps)
				findings.push({
					kind: 'count-overflow',
					start: at,
					end: at,
					event: index,
					...blank,
					input: e.input,
					binding: cl.binding,
					counter: cl.counter,
					message: clampMessage(mapping, e, cl)
				});
			const seen = watch;
			const bits = rackBits(result.changes);
			for (const t of takeovers(rules, watch, e.input, e.type, bits.reshaped))
				findings.push({
					kind: 'takeover',
					start: at,
					end: at,
					event: index,
					...blank,
					input: e.input,
					binding: t.by,
					rack: t.rack,
					message: takeoverMessage(mapping, e, at, t)
				});
			watch = observe(rules, watch, e.input, e.type, result.setUp, result.state, bits.reshaped);
			// Same state and same watch: the same conditions hold, nothing opens or closes.
			if (!result.changes.length && watch === seen) return;
			const now = conditions(rules, result.state, watch);
			stamp++;
			for (const c of now) {
				lastSeen.set(c.key, stamp);
				if (open.has(c.key)) continue;
				const binding = unitBinding(mapping, rules, c, e.input, result.state);
				const f: Finding = {
					kind: c.kind,
					start: at,
					end: null,
					event: index,
					binding,
					input: binding !== null && binding >= 0 ? mapping.bindings[binding].input : null,
					deck: c.deck,
					rack: c.rack,
					counter: c.counter,
					message: message(mapping, rules, c, e, at, result.state, prior, result.changes)
				};
				open.set(c.key, f);
				findings.push(f);
			}
			for (const [key, f] of open)
				if (lastSeen.get(key) !== stamp) {
					f.end = at;
					open.delete(key);
				}
		}
	);
	return findings;
}
