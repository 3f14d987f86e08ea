// Property tests (fast-check): the engine's promises hold for any press/release order, and for any
// valid mapping, not just the examples we thought of.
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { analyze } from '$lib/engine/analyze';
import { parseMapping } from '$lib/engine/mapping';
import { replay } from '$lib/engine/replay';
import { lintMapping } from '$lib/engine/lint';
import { verifyGroupSync } from '$lib/engine/verify';
import { ACTIONS, DECK_IDS, EFFECT_IDS, type InputEvent, type Mapping, type Step } from '$lib/engine/types';
import { legatoMapping, pads, racks } from './factories';

/** Random but physically possible play on the given pads: a pad is released only while held. */
const play = (ids: string[], maxLength = 60) =>
	fc.array(fc.tuple(fc.nat(ids.length - 1), fc.integer({ min: 0, max: 400 })), { maxLength }).map((moves) => {
		const held = new Set<string>();
		let t = 0;
		const events: InputEvent[] = [];
		for (const [k, gap] of moves) {
			const input = ids[k];
			t += gap;
			events.push({ t, input, type: held.has(input) ? 'release' : 'press' });
			if (held.has(input)) held.delete(input);
			else held.add(input);
		}
		for (const input of held) events.push({ t: (t += 10), input, type: 'release' });
		return events;
	});

const rackNo = fc.integer({ min: 1, max: 4 });
const position = fc.integer({ min: 1, max: 4 });
const target = fc.oneof(
	fc.record({ kind: fc.constantFrom('rack-on', 'chain', 'rack-mix'), rack: rackNo }),
	fc.record({ kind: fc.constant('rack-route'), rack: rackNo, deck: fc.constantFrom('A', 'B') }),
	fc.record({ kind: fc.constantFrom('effect', 'effect-on'), rack: rackNo, position }),
	fc.record({ kind: fc.constant('effect-param'), rack: rackNo, position, param: fc.integer({ min: 1, max: 3 }) }),
	fc.record({ kind: fc.constant('deck-play'), deck: fc.constantFrom('A', 'B') }),
	fc.record({ kind: fc.constant('counter'), counter: fc.constantFrom('c1', 'c2') })
) as fc.Arbitrary<Step['target']>;

/** A step whose action and value fit its target, as the schema demands. */
const step: fc.Arbitrary<Step> = fc
	.record({
		target,
		pick: fc.constantFrom(...ACTIONS),
		unit: fc.double({ min: 0, max: 1, noNaN: true }),
		n: fc.integer({ min: 0, max: 3 }),
		effect: fc.constantFrom(null, ...EFFECT_IDS),
		chain: fc.array(fc.constantFrom(...EFFECT_IDS), { minLength: 1, maxLength: 4 }),
		phase: fc.constantFrom('press', 'release'),
		guards: fc.array(
			fc.record({
				counter: fc.constantFrom('c1', 'c2'),
				op: fc.constantFrom('=', '!=', '<', '<=', '>', '>='),
				value: fc.integer({ min: 0, max: 4 })
			}),
			{ maxLength: 2 }
		)
	})
	.map(({ target, pick, unit, n, effect, chain, phase, guards }): Step => {
		const k = target.kind;
		const base = { target, phase, guards } as const;
		if (k === 'counter')
			return pick === 'set'
				? { ...base, action: 'set', value: n }
				: { ...base, action: pick === 'momentary' || pick === 'toggle' ? 'count-up' : pick };
		if (k === 'rack-on' || k === 'rack-route' || k === 'effect-on' || k === 'deck-play')
			return pick === 'momentary' || pick === 'toggle'
				? { ...base, action: pick }
				: { ...base, action: 'set', value: n % 2 };
		if (k === 'chain') return { ...base, action: 'set', value: chain };
		if (k === 'effect') return { ...base, action: 'set', value: effect };
		return { ...base, action: 'set', value: unit };
	});

const mapping: fc.Arbitrary<Mapping> = fc
	.record({
		bindings: fc.array(
			fc.record({
				input: fc.constantFrom('p1', 'p2', 'p3', 'p4'),
				intent: fc.constantFrom(undefined, 'while-held', 'latched'),
				deck: fc.constantFrom(undefined, ...DECK_IDS.slice(0, 2)),
				group: fc.constantFrom(undefined, 'g'),
				quantize: fc.constantFrom(undefined, 'off', '1/8', '1/16'),
				steps: fc.array(step, { maxLength: 8 })
			}),
			{ maxLength: 6 }
		)
	})
	.map(({ bindings }) => ({
		version: 2 as const,
		name: 'random',
		decks: 2 as const,
		profile: { name: 'grid', inputs: pads(4) },
		racks: racks(4),
		counters: [
			{ id: 'c1', max: 3, rest: 0 },
			{ id: 'c2', max: 15, rest: 1 }
		],
		// Leave unset fields out, as a document written by hand would (JSON has no undefined).
		bindings: bindings.map((b) => JSON.parse(JSON.stringify(b)) as Mapping['bindings'][0])
	}));

describe('properties', () => {
	const row = legatoMapping(4);
	const ids = ['p1', 'p2', 'p3', 'p4'];

	it('a legatoRow never drops out, sticks or drifts, whatever the order', () => {
		fc.assert(
			fc.property(play(ids), (events) => {
				const kinds = analyze(row, events).map((f) => f.kind);
				expect(kinds.filter((k) => k === 'dropout' || k === 'stuck' || k === 'drift')).toEqual([]);
			}),
			{ numRuns: 300 }
		);
	});

	it('the random mappings are ones the schema accepts', () => {
		fc.assert(
			fc.property(mapping, (m) => {
				expect(parseMapping(m).ok).toBe(true);
			}),
			{ numRuns: 200 }
		);
	});

	it('random valid mappings and events never throw, in replay, analysis, lint or the verifier', () => {
		fc.assert(
			fc.property(mapping, play(ids, 30), (m, events) => {
				const t = replay(m, events);
				expect(t.order).toHaveLength(events.length);
				for (const f of analyze(m, events)) {
					expect(f.event).toBeGreaterThanOrEqual(0);
					expect(f.event).toBeLessThan(events.length);
				}
				for (const f of lintMapping(m)) expect(m.bindings[f.binding].input).toBe(f.input);
				expect(['proved', 'broken']).toContain(verifyGroupSync(m, ['p1', 'p2']).status);
			}),
			{ numRuns: 200 }
		);
	});

	it('replay is deterministic: the same input gives identical JSON', () => {
		fc.assert(
			fc.property(mapping, play(ids, 40), (m, events) => {
				const copy = structuredClone(m);
				expect(JSON.stringify(replay(copy, structuredClone(events)))).toBe(JSON.stringify(replay(m, events)));
				expect(JSON.stringify(analyze(copy, events))).toBe(JSON.stringify(analyze(m, events)));
			}),
			{ numRuns: 150 }
		);
	});

	it('every counterexample the verifier returns replays into a finding at its last event', () => {
		fc.assert(
			fc.property(mapping, (m) => {
				const r = verifyGroupSync(m, ['p1', 'p2', 'p3']);
				if (r.status !== 'broken') return;
				const last = r.counterexample!.length - 1;
				const findings = analyze(m, r.counterexample!);
				expect(findings.some((f) => f.event === last)).toBe(true);
			}),
			{ numRuns: 200 }
		);
	});
});
