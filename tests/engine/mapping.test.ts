import { describe, expect, it } from 'vitest';
import { parseMapping, parseMappingText } from '$lib/engine/mapping';
import { legatoMapping, mappingWith } from './factories';

const valid = () => JSON.parse(JSON.stringify(legatoMapping(4)));

describe('parseMapping', () => {
	it('accepts a mapping written by the builders', () => {
		const r = parseMapping(valid());
		expect(r.ok).toBe(true);
	});

	it('fills in counter defaults: max 15, rest 0', () => {
		const m = valid();
		m.counters = [{ id: 'held' }];
		const r = parseMapping(m);
		expect(r.ok && r.mapping.counters[0]).toEqual({ id: 'held', max: 15, rest: 0 });
	});

	it('refuses something that is not a mapping with one readable problem', () => {
		expect(parseMapping('hello')).toEqual({
			ok: false,
			problems: [{ path: '(document)', message: 'must be an object' }]
		});
	});

	it('names the path and says what is wrong in plain words', () => {
		const m = valid();
		m.decks = 3;
		m.profile.inputs[0].channel = 17;
		m.bindings[1].steps[0].target = { kind: 'rack-on', rack: 9 };
		delete m.name;
		const r = parseMapping(m);
		expect(r.ok).toBe(false);
		expect(!r.ok && r.problems).toEqual(
			expect.arrayContaining([
				{ path: 'name', message: 'is required' },
				{ path: 'decks', message: 'must be one of 2, 4' },
				{ path: 'profile.inputs[0].channel', message: 'must be at most 16' },
				{ path: 'bindings[1].steps[0].target.rack', message: 'must be at most 8' }
			])
		);
	});

	it.each([
		[
			'an input nobody declared',
			(m: any) => (m.bindings[0].input = 'ghost'),
			'bindings[0].input',
			/no input called "ghost"/
		],
		[
			'a counter nobody declared',
			(m: any) => (m.bindings[0].steps[0].target.counter = 'fingers'),
			'bindings[0].steps[0].target.counter',
			/no counter called "fingers"/
		],
		[
			'a guard on an unknown counter',
			(m: any) => (m.bindings[0].steps.at(-1).guards[0].counter = 'x'),
			'bindings[0].steps[8].guards[0].counter',
			/no counter called "x"/
		],
		[
			'deck C in a two-deck mapping',
			(m: any) => (m.bindings[0].deck = 'C'),
			'bindings[0].deck',
			/deck C doesn't exist in a 2-deck mapping/
		],
		[
			'a momentary mix',
			(m: any) => (m.bindings[0].steps[0] = { target: { kind: 'rack-mix', rack: 1 }, action: 'momentary' }),
			'bindings[0].steps[0]',
			/momentary only works on something that switches/
		],
		[
			'count-up on a rack',
			(m: any) => (m.bindings[0].steps[0] = { target: { kind: 'rack-on', rack: 1 }, action: 'count-up' }),
			'bindings[0].steps[0]',
			/only works on a counter/
		],
		[
			'a mix above 1',
			(m: any) => (m.bindings[0].steps[0] = { target: { kind: 'rack-mix', rack: 1 }, action: 'set', value: 1.5 }),
			'bindings[0].steps[0]',
			/from 0 to 1/
		],
		[
			'an unknown effect',
			(m: any) =>
				(m.bindings[0].steps[0] = {
					target: { kind: 'effect', rack: 1, position: 1 },
					action: 'set',
					value: 'chorus'
				}),
			'bindings[0].steps[0]',
			/must be one of|not an effect/
		],
		[
			'a rack the mapping does not declare',
			(m: any) => (m.bindings[0].steps[1].target.rack = 5),
			'bindings[0].steps[1].target.rack',
			/rack 5 isn't declared: this mapping has 4 rack\(s\)/
		],
		[
			'a chain of five effects',
			(m: any) => (m.bindings[0].steps[1].value = ['echo', 'gate', 'echo', 'gate', 'echo']),
			'bindings[0].steps[1]',
			/list of 1 to 4 effects/
		],
		[
			'a route set to 2',
			(m: any) =>
				(m.bindings[0].steps[0] = { target: { kind: 'rack-route', rack: 1, deck: 'A' }, action: 'set', value: 2 }),
			'bindings[0].steps[0]',
			/0 \(off\) or 1 \(on\)/
		],
		[
			'a counter set above its max',
			(m: any) => (m.bindings[0].steps[0] = { target: { kind: 'counter', counter: 'held' }, action: 'set', value: 99 }),
			'bindings[0].steps[0]',
			/from 0 to 15/
		],
		[
			'an on switch with no value',
			(m: any) => (m.bindings[0].steps[0] = { target: { kind: 'rack-on', rack: 1 }, action: 'set' }),
			'bindings[0].steps[0]',
			/needs a value/
		],
		[
			'two inputs with one id',
			(m: any) => (m.profile.inputs[1].id = 'p1'),
			'profile.inputs[1].id',
			/already called "p1"/
		],
		['an input with both note and CC', (m: any) => (m.profile.inputs[0].cc = 7), 'profile.inputs[0]', /exactly one/],
		['a rest value above max', (m: any) => (m.counters[0].rest = 40), 'counters[0].rest', /above the counter's max/],
		[
			'five guards on one step',
			(m: any) => (m.bindings[0].steps.at(-1).guards = Array(5).fill({ counter: 'held', op: '=', value: 1 })),
			'bindings[0].steps[8].guards',
			/at most 4/
		]
	])('refuses %s', (_, change, path, message) => {
		const m = valid();
		change(m);
		const r = parseMapping(m);
		expect(r.ok).toBe(false);
		const hit = !r.ok && r.problems.find((p) => p.path === path);
		expect(hit && hit.message).toMatch(message);
	});

	it('reports bad JSON text as a problem instead of throwing', () => {
		const r = parseMappingText('{ "version": 1,');
		expect(r.ok).toBe(false);
		expect(!r.ok && r.problems[0].message).toMatch(/not valid JSON/);
	});

	it('returns exactly the shapes of the shared types', () => {
		const m = mappingWith([
			{
				input: 'p1',
				intent: 'latched',
				quantize: '1/8',
				steps: [{ target: { kind: 'deck-play', deck: 'A' }, action: 'toggle' }]
			}
		]);
		const r = parseMapping(m);
		expect(r.ok && r.mapping).toEqual(m);
	});
});
