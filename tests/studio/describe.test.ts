import { describe, expect, it } from 'vitest';
import { demoMapping, legatoRow, onePressEffect, paramForDivision, type Mapping } from '$lib/engine';
import { describeBinding, describeStep } from '$lib/studio/describe';
import { diffMappings } from '$lib/studio/diff';

const echo = onePressEffect({
	input: 'pad-1',
	rack: 2,
	effect: 'echo',
	params: [paramForDivision('echo', 1, '1/8')],
	mix: 0.8,
	deck: 'A',
	decks: 2
});

describe('describeBinding', () => {
	it('reads a one-press echo pad as one press sentence and one release sentence', () => {
		expect(describeBinding(echo, { decks: 2 }).text).toBe(
			'Press: load Echo 1/8 into rack 2, mix 80 %, route to deck A only, switch on. Release: switch off.'
		);
	});

	it('links every step of the pad to exactly one phrase', () => {
		const d = describeBinding(echo, { decks: 2 });
		const linked = [...d.press, ...d.release].flatMap((p) => p.steps);
		expect(new Set(linked)).toEqual(new Set(echo.steps.map((_, i) => i)));
	});

	it('names the guards of a hold-group row and keeps release steps in the release lane', () => {
		const row = legatoRow({
			pads: ['a', 'b'],
			rack: 1,
			effect: 'stutter',
			variants: ['1/4', '1/8'],
			counter: 'held',
			deck: 'B',
			decks: 4
		});
		const d = describeBinding(row.bindings[1], { decks: 4 });
		expect(d.text).toBe(
			'Press: count held up, load Stutter 1/8 into rack 1, mix 100 %, route to deck B only, switch on when held = 0. ' +
				'Release: count held down, switch off when held = 1.'
		);
	});

	it('says when a pad waits for the grid and when its release acts at once', () => {
		expect(describeBinding({ ...echo, quantize: '1/8', releaseAtOnce: true }, { decks: 2 }).text).toMatch(
			/^Press on the next 1\/8 grid line: .*Release: switch off\.$/
		);
	});

	it('describes an empty pad as doing nothing', () => {
		expect(describeBinding({ steps: [] }, { decks: 2 }).text).toBe('Does nothing yet.');
	});
});

describe('describeStep', () => {
	it.each([
		[{ target: { kind: 'rack-mix', rack: 3 }, action: 'set', value: 0.25 }, 'mix of rack 3 25 %'],
		[{ target: { kind: 'deck-play', deck: 'C' }, action: 'set', value: 0 }, 'stop deck C'],
		[{ target: { kind: 'counter', counter: 'held' }, action: 'reset', phase: 'release' }, 'reset held (on release)'],
		[{ target: { kind: 'effect', rack: 1, position: 2 }, action: 'set', value: null }, 'empty position 2 of rack 1']
	] as const)('reads %j as “%s”', (step, text) => {
		expect(describeStep(step as never)).toBe(text);
	});
});

describe('diffMappings', () => {
	it('lists a changed step of a pad by pad and step number', () => {
		const a = demoMapping('two-deck');
		const b: Mapping = structuredClone(a);
		b.bindings[0].steps[4] = { ...b.bindings[0].steps[4], value: 0.25 };
		const diff = diffMappings(a, b);
		expect(diff).toHaveLength(1);
		expect(diff[0].about).toBe('Echo A (Pad 1)');
		expect(diff[0].text).toMatch(/^step 5 changed from “.*” to “.*25 %”$/);
	});

	it('finds nothing between a version and itself', () => {
		expect(diffMappings(demoMapping('four-deck'), demoMapping('four-deck'))).toEqual([]);
	});
});
