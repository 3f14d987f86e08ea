import { describe, expect, it } from 'vitest';
import { analyze } from '$lib/engine/analyze';
import { onePressEffect } from '$lib/engine/builders';
import type { Binding } from '$lib/engine/types';
import { brokenRowMapping, counter, legatoMapping, mappingWith, pads, press, release, turn } from './factories';

describe('analyze', () => {
	// Check value: common practice of the trade — four pads of one effect with plain momentary
	// on/off and no counter cut out when the first finger lifts while another is still down.
	it('finds the dropout at release 1 while pad 2 is held in a row without a counter', () => {
		const events = [press(1000, 'p1'), press(1500, 'p2'), release(12438, 'p1'), release(13000, 'p2')];
		const findings = analyze(brokenRowMapping(4), events);
		expect(findings).toEqual([
			{
				kind: 'dropout',
				start: 12438,
				end: 13000,
				event: 2,
				binding: 1,
				input: 'p2',
				deck: 'A',
				rack: 1,
				counter: null,
				message: 'release of pad 1 at 12.438 s turned rack 1 off while pad 2 was held'
			}
		]);
	});

	it('finds nothing in the same play on a row built with legatoRow', () => {
		const events = [press(1000, 'p1'), press(1500, 'p2'), release(12438, 'p1'), release(13000, 'p2')];
		expect(analyze(legatoMapping(4), events)).toEqual([]);
	});

	it('finds a rack still audible after the last release: stuck on', () => {
		// Switching on with a set step but off with nothing leaves the rack playing.
		const b = onePressEffect({ input: 'p1', rack: 2, effect: 'gate', mix: 1, deck: 'A', decks: 2 });
		b.steps[b.steps.length - 1] = { target: { kind: 'rack-on', rack: 2 }, action: 'set', value: 1 };
		const f = analyze(mappingWith([b]), [press(100, 'p1'), release(900, 'p1')]);
		expect(f).toEqual([
			expect.objectContaining({ kind: 'stuck-on', start: 900, end: null, event: 1, rack: 2, deck: 'A', input: 'p1' })
		]);
		expect(f[0].message).toBe(
			'release of pad 1 at 0.900 s left no pad of pad 1 held, yet rack 2 stays audible on deck A'
		);
	});

	it('finds a rack audible on a deck the pad does not target: bleed', () => {
		const toB = onePressEffect({ input: 'p1', rack: 1, effect: 'echo', mix: 1, deck: 'B', decks: 2 });
		const toA = onePressEffect({ input: 'p2', rack: 1, effect: 'echo', mix: 1, deck: 'A', decks: 2 });
		toA.steps = toA.steps.filter((s) => !(s.target.kind === 'rack-route' && s.target.deck === 'B'));
		const f = analyze(mappingWith([toB, toA]), [
			press(0, 'p1'),
			release(100, 'p1'),
			press(200, 'p2'),
			release(300, 'p2')
		]);
		expect(f).toEqual([
			expect.objectContaining({ kind: 'bleed', start: 200, end: 300, event: 2, rack: 1, deck: 'B', binding: 1 })
		]);
		expect(f[0].message).toMatch(/press of pad 2 at 0\.200 s left rack 1 audible on deck B, but pad 2 targets deck A/);
	});

	it('finds a counter off its rest value with no counting pad held: count left over', () => {
		const m = legatoMapping(2);
		// Lose pad 2's count-down: the counter never gets back to 0.
		m.bindings[1].steps = m.bindings[1].steps.filter((s) => s.action !== 'count-down');
		const f = analyze(m, [press(0, 'p1'), press(10, 'p2'), release(20, 'p2'), release(30, 'p1')]);
		expect(f.map((x) => [x.kind, x.start, x.event, x.counter])).toContainEqual(['count-left-over', 30, 3, 'held']);
		expect(f.find((x) => x.kind === 'count-left-over')!.message).toMatch(/reads 1 instead of 0/);
	});

	it('reports a clamped count as a count overflow', () => {
		const b: Binding = { input: 'p1', steps: [{ target: { kind: 'counter', counter: 'n' }, action: 'count-up' }] };
		const f = analyze(mappingWith([b], { counters: [counter('n', 1)] }), [press(0, 'p1'), press(50, 'p1')]);
		expect(f).toEqual([
			expect.objectContaining({ kind: 'count-overflow', start: 50, end: 50, event: 1, counter: 'n', binding: 0 })
		]);
		expect(f[0].message).toMatch(/tried to take n to 2, above its max 1/);
	});

	it('reports two pads on one MIDI address as a clash, once', () => {
		const inputs = pads(2);
		inputs[1].note = inputs[0].note;
		const m = mappingWith(
			[
				onePressEffect({ input: 'p1', rack: 1, effect: 'echo', mix: 1, deck: 'A', decks: 2 }),
				{ input: 'p2', steps: [] }
			],
			{ inputs }
		);
		const f = analyze(m, [press(0, 'p1'), release(10, 'p1'), press(20, 'p1')]);
		expect(f).toEqual([expect.objectContaining({ kind: 'clash', event: 0, input: 'p1' })]);
		expect(f[0].message).toMatch(/note 36 on channel 1, which pad 2 also answers/);
	});

	it('blames the pad that moved a shared rack away from a held pad', () => {
		const a = onePressEffect({ input: 'p1', label: 'Echo A', rack: 1, effect: 'echo', mix: 1, deck: 'A', decks: 2 });
		const b = onePressEffect({ input: 'p2', label: 'Echo B', rack: 1, effect: 'echo', mix: 1, deck: 'B', decks: 2 });
		const f = analyze(mappingWith([a, b]), [press(0, 'p1'), press(100, 'p2')]);
		expect(f[0]).toMatchObject({ kind: 'dropout', event: 1, input: 'p1', deck: 'A' });
		expect(f[0].message).toBe('press of pad 2 at 0.100 s routed rack 1 away from deck A while pad 1 was held');
	});

	it('explains a pad that never made its rack audible', () => {
		const b = onePressEffect({ input: 'p1', rack: 1, effect: 'echo', mix: 0, deck: 'A', decks: 2 });
		const f = analyze(mappingWith([b]), [press(0, 'p1')]);
		expect(f[0].message).toBe(
			"press of pad 1 at 0.000 s left pad 1 silent on deck A while pad 1 was held: rack 1's mix is at 0"
		);
	});

	it('keeps a stuck rack stuck when a knob turns its mix (turns never change who owns a rack)', () => {
		const b = onePressEffect({ input: 'p1', rack: 2, effect: 'gate', mix: 1, deck: 'A', decks: 2 });
		b.steps[b.steps.length - 1] = { target: { kind: 'rack-on', rack: 2 }, action: 'set', value: 1 };
		const knob: Binding = { input: 'k1', steps: [{ target: { kind: 'rack-mix', rack: 2 }, action: 'set' }] };
		const inputs = [...pads(2), { id: 'k1', kind: 'knob' as const, channel: 1, cc: 20 }];
		const f = analyze(mappingWith([b, knob], { inputs }), [
			press(100, 'p1'),
			release(900, 'p1'),
			turn(1000, 'k1', 0.7)
		]);
		expect(f).toEqual([expect.objectContaining({ kind: 'stuck-on', start: 900, end: null, event: 1 })]);
	});

	it('keeps a bleed going when a knob turns the rack mix', () => {
		const toB = onePressEffect({ input: 'p1', rack: 1, effect: 'echo', mix: 1, deck: 'B', decks: 2 });
		const toA = onePressEffect({ input: 'p2', rack: 1, effect: 'echo', mix: 1, deck: 'A', decks: 2 });
		toA.steps = toA.steps.filter((s) => !(s.target.kind === 'rack-route' && s.target.deck === 'B'));
		const knob: Binding = { input: 'k1', steps: [{ target: { kind: 'rack-mix', rack: 1 }, action: 'set' }] };
		const inputs = [...pads(2), { id: 'k1', kind: 'knob' as const, channel: 1, cc: 20 }];
		const f = analyze(mappingWith([toB, toA, knob], { inputs }), [
			press(0, 'p1'),
			release(100, 'p1'),
			press(200, 'p2'),
			turn(250, 'k1', 0.6),
			release(300, 'p2')
		]);
		expect(f).toEqual([expect.objectContaining({ kind: 'bleed', start: 200, end: 300, event: 2 })]);
	});

	it('names both pads when a momentary pad takes over a rack a latched pad holds on', () => {
		const hold = onePressEffect({
			input: 'p1',
			label: 'Wash',
			rack: 1,
			effect: 'reverb',
			mix: 1,
			deck: 'A',
			decks: 2,
			intent: 'latched'
		});
		const stab = onePressEffect({ input: 'p2', label: 'Stab', rack: 1, effect: 'echo', mix: 1, deck: 'A', decks: 2 });
		const events = [press(0, 'p1'), release(50, 'p1'), press(100, 'p2'), release(200, 'p2')];
		const f = analyze(mappingWith([hold, stab]), events);
		expect(f.filter((x) => x.kind === 'takeover')).toEqual([
			expect.objectContaining({ kind: 'takeover', start: 100, end: 100, event: 2, rack: 1, input: 'p2', binding: 1 })
		]);
		expect(f.find((x) => x.kind === 'takeover')!.message).toBe(
			"press of pad 2 at 0.100 s changed rack 1 while Wash held it on (latched): Stab took over Wash's effect"
		);
		const allowed = analyze(mappingWith([hold, { ...stab, takeover: true }]), events);
		expect(allowed.some((x) => x.kind === 'takeover')).toBe(false);
	});

	it('gives no takeover once the latched pad has let go of its rack', () => {
		const hold = onePressEffect({
			input: 'p1',
			rack: 1,
			effect: 'reverb',
			mix: 1,
			deck: 'A',
			decks: 2,
			intent: 'latched'
		});
		const stab = onePressEffect({ input: 'p2', rack: 1, effect: 'echo', mix: 1, deck: 'A', decks: 2 });
		const f = analyze(mappingWith([hold, stab]), [
			press(0, 'p1'),
			press(50, 'p1'),
			press(100, 'p2'),
			release(200, 'p2')
		]);
		expect(f.some((x) => x.kind === 'takeover')).toBe(false);
	});
});
