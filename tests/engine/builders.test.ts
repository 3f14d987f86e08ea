import { describe, expect, it } from 'vitest';
import { legatoRow, onePressEffect } from '$lib/engine/builders';
import { applyEvent, applyEvents, initialRigState, isAudible } from '$lib/engine/rig';
import { replay } from '$lib/engine/replay';
import { parseMapping } from '$lib/engine/mapping';
import { legatoMapping, mappingWith, press, release } from './factories';

// Check values: common practice of the trade — a one-press effect pad sets the whole rack in a
// single press (its chain, parameters, dry/wet, routing to its deck and away from every other
// deck, on) and its release switches it off; the effect is heard from the press itself.
describe('onePressEffect', () => {
	const pad = (decks: 2 | 4) =>
		mappingWith(
			[
				onePressEffect({
					input: 'p1',
					rack: 1,
					effect: 'echo',
					params: [0.6],
					mix: 0.8,
					deck: 'A',
					decks
				})
			],
			{ decks }
		);

	it.each([
		[2, ['B']],
		[4, ['B', 'C', 'D']]
	] as const)('sets the whole rack in one press in a %i-deck mapping', (decks, others) => {
		const m = pad(decks);
		let s = initialRigState(m);
		// An earlier pad left the rack on the other decks with a longer chain of its own.
		const left = s.racks[0].chain.map(() => ({ effect: 'reverb' as const, on: true, params: [0.1, 0.1, 0.1] }));
		for (const d of others)
			s = {
				...s,
				racks: [{ ...s.racks[0], chain: left, routes: { ...s.racks[0].routes, [d]: true } }, ...s.racks.slice(1)]
			};
		const r = applyEvent(m, s, press(1000, 'p1'), 0);
		const rack = r.state.racks[0];
		expect(rack.chain[0]).toMatchObject({ effect: 'echo', on: true });
		expect(rack.chain[0].params[0]).toBe(0.6);
		expect(rack.chain.slice(1).every((p) => p.effect === null && !p.on)).toBe(true);
		expect(rack.mix).toBe(0.8);
		expect(rack.routes.A).toBe(true);
		for (const d of others) expect(rack.routes[d]).toBe(false);
		expect(rack.on).toBe(true);
		expect(r.changes.every((c) => c.t === 1000)).toBe(true);
	});

	it('switches the rack off on release', () => {
		const m = pad(2);
		const s = applyEvents(m, [press(1000, 'p1'), release(1500, 'p1')]);
		expect(s.racks[0].on).toBe(false);
		expect(isAudible(s, 1, 'A')).toBe(false);
	});

	it('is audible from the press time exactly, and until the release', () => {
		const t = replay(pad(2), [press(1234.5, 'p1'), release(2000, 'p1')]);
		expect(t.audible).toEqual([{ rack: 1, deck: 'A', start: 1234.5, end: 2000, startEvent: 0, endEvent: 1 }]);
	});

	it('loads a chain of several effects with parameters per position', () => {
		const b = onePressEffect({
			input: 'p1',
			rack: 2,
			chain: ['filter', 'echo'],
			params: [[0.3], [undefined, 0.9]],
			mix: 1,
			deck: 'B',
			decks: 2
		});
		const s = applyEvents(mappingWith([b]), [press(0, 'p1')]);
		expect(s.racks[1].chain.map((x) => [x.effect, x.on])).toEqual([
			['filter', true],
			['echo', true],
			[null, false],
			[null, false]
		]);
		expect(s.racks[1].chain[0].params[0]).toBe(0.3);
		expect(s.racks[1].chain[1].params[1]).toBe(0.9);
		expect(isAudible(s, 2, 'B')).toBe(true);
	});

	it('refuses a chain of no effects or more than four', () => {
		expect(() => onePressEffect({ input: 'p1', rack: 1, chain: [], mix: 1, deck: 'A', decks: 2 })).toThrow(/1 to 4/);
		expect(() =>
			onePressEffect({
				input: 'p1',
				rack: 1,
				chain: ['echo', 'gate', 'echo', 'gate', 'echo'],
				mix: 1,
				deck: 'A',
				decks: 2
			})
		).toThrow(/1 to 4/);
	});

	it('writes a binding the mapping schema accepts', () => {
		expect(parseMapping(pad(4)).ok).toBe(true);
	});
});

// Check values: common practice of the trade — a legato row counts held pads up on press and
// down on release, switching on at a count of 0 and off at 1 (read before the event).
describe('legatoRow', () => {
	it('reads 4 with all four pads held and returns to 0 after the last release', () => {
		const m = legatoMapping(4);
		const down = ['p1', 'p2', 'p3', 'p4'].map((p, i) => press(i * 100, p));
		const held = applyEvents(m, down);
		expect(held.counters.held).toBe(4);
		expect(isAudible(held, 1, 'A')).toBe(true);
		const up = ['p3', 'p1', 'p4', 'p2'].map((p, i) => release(1000 + i * 100, p));
		const after = applyEvents(m, up, held);
		expect(after.counters.held).toBe(0);
		expect(after.racks[0].on).toBe(false);
	});

	it('stays on while any pad of the row is still held', () => {
		const m = legatoMapping(4);
		const s = applyEvents(m, [press(0, 'p1'), press(10, 'p2'), release(20, 'p1')]);
		expect(isAudible(s, 1, 'A')).toBe(true);
	});

	it('takes note divisions for a beat-synced parameter', () => {
		const row = legatoRow({
			pads: ['p1', 'p2'],
			rack: 1,
			effect: 'stutter',
			variants: ['1/4', '1/32'],
			counter: 'held',
			deck: 'A',
			decks: 2
		});
		const s = applyEvents(mappingWith(row.bindings, { counters: [row.counter] }), [press(0, 'p2')]);
		expect(s.racks[0].chain[0].params[0]).toBe(0.875); // the 1/32 band's middle in SLICES (our own choice)
	});

	it('gives the counter room for every pad of a long row', () => {
		const ids = Array.from({ length: 20 }, (_, i) => `p${i}`);
		const row = legatoRow({
			pads: ids,
			rack: 1,
			effect: 'gate',
			variants: ids.map(() => 0.5),
			counter: 'n',
			deck: 'A',
			decks: 2
		});
		expect(row.counter.max).toBe(20);
	});

	it('needs one variant per pad', () => {
		expect(() =>
			legatoRow({ pads: ['a', 'b'], rack: 1, effect: 'gate', variants: [0.5], counter: 'n', deck: 'A', decks: 2 })
		).toThrow();
	});
});
