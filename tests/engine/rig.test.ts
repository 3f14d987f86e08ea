import { describe, expect, it } from 'vitest';
import { applyEvent, applyEvents, initialRigState, isAudible } from '$lib/engine/rig';
import type { Step } from '$lib/engine/types';
import { counter, mappingWith, press, release, turn } from './factories';

const rackOn: Step['target'] = { kind: 'rack-on', rack: 1 };
const held: Step['target'] = { kind: 'counter', counter: 'held' };
const one = (steps: Step[], counters = [counter('held')]) => mappingWith([{ input: 'p1', steps }], { counters });

describe('applyEvent: actions (DESIGN.md §4.3)', () => {
	it('momentary is on at press and off at release, whatever its phase says', () => {
		const m = one([{ target: rackOn, action: 'momentary', phase: 'release' }]);
		const s1 = applyEvent(m, initialRigState(m), press(0, 'p1'), 0).state;
		expect(s1.racks[0].on).toBe(true);
		expect(applyEvent(m, s1, release(5, 'p1'), 1).state.racks[0].on).toBe(false);
	});

	it('toggle flips on each press and ignores releases', () => {
		const m = one([{ target: { kind: 'deck-play', deck: 'B' }, action: 'toggle' }]);
		const s = applyEvents(m, [press(0, 'p1'), release(1, 'p1')]);
		expect(s.decks.B.playing).toBe(false);
		expect(applyEvents(m, [press(2, 'p1')], s).decks.B.playing).toBe(true);
	});

	it('set writes its value at its phase only', () => {
		const m = one([{ target: { kind: 'rack-mix', rack: 1 }, action: 'set', value: 0.2, phase: 'release' }]);
		const s1 = applyEvents(m, [press(0, 'p1')]);
		expect(s1.racks[0].mix).toBe(0.5);
		expect(applyEvents(m, [release(1, 'p1')], s1).racks[0].mix).toBe(0.2);
	});

	it('count-up and count-down move by one and reset goes to 0', () => {
		const m = one([
			{ target: held, action: 'count-up' },
			{ target: held, action: 'count-up' },
			{ target: held, action: 'count-down', phase: 'release' }
		]);
		const s = applyEvents(m, [press(0, 'p1'), release(1, 'p1')]);
		expect(s.counters.held).toBe(1);
		const r = one([{ target: held, action: 'reset', phase: 'release' }], [counter('held', 15, 3)]);
		expect(applyEvents(r, [press(0, 'p1'), release(1, 'p1')]).counters.held).toBe(0);
	});

	it('clamps a count at its max and records the clamp', () => {
		const m = one([{ target: held, action: 'count-up' }], [counter('held', 1)]);
		const s = applyEvents(m, [press(0, 'p1'), release(1, 'p1')]);
		const r = applyEvent(m, s, press(2, 'p1'), 2);
		expect(r.state.counters.held).toBe(1);
		expect(r.clamps).toEqual([{ t: 2, event: 2, counter: 'held', binding: 0, step: 0, attempted: 2, value: 1 }]);
	});

	it('clamps a count below 0 and records the clamp', () => {
		const m = one([{ target: held, action: 'count-down' }]);
		const r = applyEvent(m, initialRigState(m), press(7, 'p1'), 0);
		expect(r.state.counters.held).toBe(0);
		expect(r.clamps[0]).toMatchObject({ counter: 'held', attempted: -1, value: 0 });
	});

	it('a set step without a value follows a knob turn and ignores presses', () => {
		const m = mappingWith([{ input: 'k1', steps: [{ target: { kind: 'rack-mix', rack: 2 }, action: 'set' }] }], {
			inputs: [{ id: 'k1', kind: 'knob', channel: 1, cc: 20 }]
		});
		expect(applyEvents(m, [turn(0, 'k1', 0.25)]).racks[1].mix).toBe(0.25);
		expect(applyEvent(m, initialRigState(m), press(0, 'k1'), 0).state.racks[1].mix).toBe(0.5);
	});
});

describe('applyEvent: one event at a time (DESIGN.md §4.2)', () => {
	it('guards read the counters as they stood before the event', () => {
		// Counting up first must not stop the on step guarded on 0 from running.
		const m = one([
			{ target: held, action: 'count-up' },
			{ target: rackOn, action: 'set', value: 1, guards: [{ counter: 'held', op: '=', value: 0 }] }
		]);
		const r = applyEvent(m, initialRigState(m), press(0, 'p1'), 0);
		expect(r.state.counters.held).toBe(1);
		expect(r.state.racks[0].on).toBe(true);
	});

	it('steps run in list order: the later of two sets wins', () => {
		const m = one([
			{ target: { kind: 'effect', rack: 1, position: 2 }, action: 'set', value: 'echo' },
			{ target: { kind: 'effect', rack: 1, position: 2 }, action: 'set', value: null },
			{ target: { kind: 'rack-mix', rack: 1 }, action: 'set', value: 0.1 },
			{ target: { kind: 'rack-mix', rack: 1 }, action: 'set', value: 0.9 }
		]);
		const r = applyEvent(m, initialRigState(m), press(0, 'p1'), 0);
		expect(r.state.racks[0].mix).toBe(0.9);
		// A change undone within the same event is no change at all; a path is reported once.
		expect(r.changes.filter((c) => c.path.startsWith('racks'))).toEqual([
			{ t: 0, event: 0, path: 'racks.0.mix', from: 0.5, to: 0.9 }
		]);
	});

	it('stamps every change of one event with its time and index', () => {
		const m = one([
			{ target: rackOn, action: 'momentary' },
			{ target: { kind: 'rack-route', rack: 1, deck: 'A' }, action: 'set', value: 1 },
			{ target: held, action: 'count-up' }
		]);
		const r = applyEvent(m, initialRigState(m), press(812.5, 'p1'), 41);
		expect(r.changes.map((c) => [c.path, c.t, c.event])).toEqual([
			['racks.0.on', 812.5, 41],
			['racks.0.routes.A', 812.5, 41],
			['counters.held', 812.5, 41],
			['held', 812.5, 41]
		]);
	});

	it('keeps the held pads in press order', () => {
		const m = one([]);
		const s = applyEvents(
			mappingWith([
				{ input: 'p1', steps: [] },
				{ input: 'p2', steps: [] }
			]),
			[press(0, 'p2'), press(1, 'p1'), press(2, 'p2')]
		);
		expect(s.held).toEqual(['p2', 'p1']);
		expect(applyEvents(m, [release(0, 'p9')]).held).toEqual([]);
	});

	it('leaves the old state untouched and shares what did not change', () => {
		const m = one([{ target: rackOn, action: 'momentary' }]);
		const before = initialRigState(m);
		const copy = JSON.stringify(before);
		const after = applyEvent(m, before, press(0, 'p1'), 0).state;
		expect(JSON.stringify(before)).toBe(copy);
		expect(after.racks[1]).toBe(before.racks[1]);
		expect(after.decks).toBe(before.decks);
	});

	it('ignores an input no binding answers', () => {
		const m = one([]);
		const s = initialRigState(m);
		const r = applyEvent(m, s, turn(0, 'nowhere', 1), 0);
		expect(r.state).toBe(s);
		expect(r.changes).toEqual([]);
	});

	it('runs every binding on an input, in binding order', () => {
		const m = mappingWith([
			{ input: 'p1', steps: [{ target: { kind: 'rack-mix', rack: 1 }, action: 'set', value: 0.3 }] },
			{ input: 'p1', steps: [{ target: { kind: 'rack-mix', rack: 1 }, action: 'set', value: 0.7 }] }
		]);
		expect(applyEvents(m, [press(0, 'p1')]).racks[0].mix).toBe(0.7);
	});
});

describe('isAudible (DESIGN.md §4.4)', () => {
	const m = mappingWith([]);
	const base = () => {
		const s = initialRigState(m);
		const rack = {
			...s.racks[0],
			on: true,
			mix: 1,
			routes: { ...s.racks[0].routes, A: true },
			chain: s.racks[0].chain.map((x, i) => (i === 1 ? { ...x, effect: 'echo' as const, on: true } : x))
		};
		return { ...s, racks: [rack, ...s.racks.slice(1)] };
	};
	const tweak = (f: (s: ReturnType<typeof base>) => void) => {
		const s = structuredClone(base());
		f(s);
		return s;
	};

	it('is audible when on, routed, playing, mixed in and a chain position is on with an effect', () => {
		expect(isAudible(base(), 1, 'A')).toBe(true);
	});

	it.each([
		['the rack is off', (s: ReturnType<typeof base>) => (s.racks[0].on = false)],
		['the rack is not routed to the deck', (s: ReturnType<typeof base>) => (s.racks[0].routes.A = false)],
		['the deck is not playing', (s: ReturnType<typeof base>) => (s.decks.A.playing = false)],
		['the mix is 0', (s: ReturnType<typeof base>) => (s.racks[0].mix = 0)],
		['no chain position is on with an effect', (s: ReturnType<typeof base>) => (s.racks[0].chain[1].on = false)],
		['the only position on has no effect', (s: ReturnType<typeof base>) => (s.racks[0].chain[1].effect = null)]
	])('is silent when %s', (_, f) => {
		expect(isAudible(tweak(f), 1, 'A')).toBe(false);
	});

	it('counts any position of the chain, the last one too', () => {
		const s = tweak((x) => {
			x.racks[0].chain[1].on = false;
			x.racks[0].chain[3] = { effect: 'gate', on: true, params: [0.5, 0.5, 0.5] };
		});
		expect(isAudible(s, 1, 'A')).toBe(true);
		expect(isAudible(s, 1, 'B')).toBe(false);
	});

	it('starts with the mapping decks playing and every rack silent', () => {
		const s = initialRigState(mappingWith([], { decks: 2 }));
		expect([s.decks.A.playing, s.decks.B.playing, s.decks.C.playing]).toEqual([true, true, false]);
		expect(s.racks.every((_, i) => !isAudible(s, i + 1, 'A'))).toBe(true);
	});
});
