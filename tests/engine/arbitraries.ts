// fast-check arbitraries: random mappings the schema accepts (four pads, four racks, two counters).
import fc from 'fast-check';
import { ACTIONS, DECK_IDS, EFFECT_IDS, type Mapping, type Step } from '$lib/engine/types';
import { pads, racks } from './factories';

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

export const mapping: fc.Arbitrary<Mapping> = fc
	.record({
		bindings: fc.array(
			fc.record({
				input: fc.constantFrom('p1', 'p2', 'p3', 'p4'),
				intent: fc.constantFrom(undefined, 'while-held', 'latched'),
				deck: fc.constantFrom(undefined, ...DECK_IDS.slice(0, 2)),
				group: fc.constantFrom(undefined, 'g'),
				quantize: fc.constantFrom(undefined, 'off', '1/8', '1/16'),
				releaseAtOnce: fc.constantFrom(undefined, true),
				takeover: fc.constantFrom(undefined, true),
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
