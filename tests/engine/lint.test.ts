import { describe, expect, it } from 'vitest';
import { lintMapping } from '$lib/engine/lint';
import { onePressEffect } from '$lib/engine/builders';
import type { Binding, Mapping } from '$lib/engine/types';
import { brokenRowMapping, counter, legatoMapping, mappingWith, pads } from './factories';

const echo = (input: string, deck: 'A' | 'B' | 'C' | 'D' = 'A', decks: 2 | 4 = 2) =>
	onePressEffect({ input, rack: 1, effect: 'echo', params: [0.6], mix: 0.8, deck, decks });
const without = (b: Binding, drop: (s: Binding['steps'][0]) => boolean): Binding => ({
	...b,
	steps: b.steps.filter((s) => !drop(s))
});

describe('lintMapping', () => {
	it('finds nothing in pads built with the builders', () => {
		expect(lintMapping(mappingWith([echo('p1'), echo('p2', 'B')]))).toEqual([]);
		expect(lintMapping(legatoMapping(4))).toEqual([]);
	});

	const cases: [string, () => Mapping, { rule: string; binding: number; step: number | null; message: RegExp }][] = [
		[
			'two bindings on one MIDI address',
			() => {
				const inputs = pads(2);
				inputs[1].note = 36;
				return mappingWith([echo('p1'), echo('p2')], { inputs });
			},
			{ rule: 'clash', binding: 1, step: null, message: /pad 2 and pad 1 both answer note 36 on channel 1/ }
		],
		[
			'a pad that routes to its deck but not away from the others (four decks)',
			() =>
				mappingWith(
					[
						without(
							echo('p1', 'A', 4),
							(s) => s.target.kind === 'rack-route' && s.target.deck !== 'A' && s.target.deck !== 'B'
						)
					],
					{ decks: 4 }
				),
			{ rule: 'partial-route', binding: 0, step: 3, message: /routes rack 1 to deck A but not away from deck C, D/ }
		],
		[
			'a one-press pad that does not load its chain',
			() => mappingWith([without(echo('p1'), (s) => s.target.kind === 'chain')]),
			{ rule: 'no-chain-load', binding: 0, step: 4, message: /switches rack 1 on without loading its chain/ }
		],
		[
			'a counter smaller than its hold group',
			() => {
				const m = legatoMapping(4);
				m.counters[0].max = 3;
				return m;
			},
			{ rule: 'counter-too-small', binding: 0, step: null, message: /goes up to 3, but 4 pads count it/ }
		],
		[
			'a legato group sharing momentary on/off without a counter',
			() => brokenRowMapping(4),
			{
				rule: 'legato-without-counter',
				binding: 0,
				step: 5,
				message: /the 4 pads of row switch rack 1 on and off as plain momentary steps/
			}
		],
		[
			'count-up without a count-down on release',
			() => {
				const m = legatoMapping(2);
				m.bindings[1].steps = m.bindings[1].steps.filter((s) => s.action !== 'count-down');
				return m;
			},
			{ rule: 'unbalanced-count', binding: 1, step: 0, message: /counts held up on press but never down on release/ }
		],
		[
			'a guard on a counter nothing changes',
			() =>
				mappingWith(
					[
						{
							input: 'p1',
							steps: [
								{
									target: { kind: 'rack-on', rack: 2 },
									action: 'momentary',
									guards: [{ counter: 'page', op: '=', value: 1 }]
								}
							]
						}
					],
					{
						counters: [counter('page')]
					}
				),
			{ rule: 'idle-guard', binding: 0, step: 0, message: /guarded on page, but no step ever changes page/ }
		],
		[
			'a step whose guards no value can pass',
			() => {
				const m = legatoMapping(1);
				m.bindings[0].steps[0].guards = [{ counter: 'held', op: '>', value: 15 }];
				return m;
			},
			{
				rule: 'dead-step',
				binding: 0,
				step: 0,
				message: /can never run: no value of held from 0 to 15 passes held > 15/
			}
		],
		[
			'a toggle set to run on release',
			() =>
				mappingWith([
					{ input: 'p1', steps: [{ target: { kind: 'deck-play', deck: 'A' }, action: 'toggle', phase: 'release' }] }
				]),
			{ rule: 'dead-step', binding: 0, step: 0, message: /toggles flip on press only/ }
		],
		[
			'a knob-following step on a pad',
			() => mappingWith([{ input: 'p1', steps: [{ target: { kind: 'rack-mix', rack: 1 }, action: 'set' }] }]),
			{ rule: 'dead-step', binding: 0, step: 0, message: /follows a knob, but pad 1 is a pad/ }
		]
	];

	it.each(cases)('points out %s', (_, build, want) => {
		const found = lintMapping(build()).filter((f) => f.rule === want.rule);
		expect(found).toHaveLength(1);
		expect(found[0]).toMatchObject({ binding: want.binding, step: want.step });
		expect(found[0].message).toMatch(want.message);
	});
});
