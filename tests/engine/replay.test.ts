import { describe, expect, it } from 'vitest';
import { replay } from '$lib/engine/replay';
import { onePressEffect } from '$lib/engine/builders';
import { brokenRowMapping, legatoMapping, mappingWith, press, release } from './factories';

describe('replay', () => {
	it('lists every change with its time and causing event', () => {
		const t = replay(legatoMapping(2), [press(100, 'p1'), release(400, 'p1')]);
		expect(t.changes.filter((c) => c.path === 'racks.0.on' || c.path === 'counters.held')).toEqual([
			{ t: 100, event: 0, path: 'counters.held', from: 0, to: 1 },
			{ t: 100, event: 0, path: 'racks.0.on', from: false, to: true },
			{ t: 400, event: 1, path: 'counters.held', from: 1, to: 0 },
			{ t: 400, event: 1, path: 'racks.0.on', from: true, to: false }
		]);
		expect(t.order).toEqual([0, 1]);
	});

	it('gives the audible intervals per rack and deck, open at the end when still on', () => {
		const t = replay(brokenRowMapping(2), [press(100, 'p1'), press(200, 'p2'), release(300, 'p1'), press(500, 'p1')]);
		expect(t.audible).toEqual([
			{ rack: 1, deck: 'A', start: 100, end: 300, startEvent: 0, endEvent: 2 },
			{ rack: 1, deck: 'A', start: 500, end: null, startEvent: 3, endEvent: null }
		]);
	});

	it('keeps separate intervals for each deck a rack is routed to', () => {
		const m = mappingWith([
			onePressEffect({ input: 'p1', rack: 3, effect: 'reverb', mix: 0.5, deck: 'A', decks: 2 }),
			{ input: 'p2', steps: [{ target: { kind: 'rack-route', rack: 3, deck: 'B' }, action: 'momentary' }] }
		]);
		const t = replay(m, [press(0, 'p1'), press(50, 'p2'), release(80, 'p2'), release(100, 'p1')]);
		expect(t.audible.map((a) => [a.rack, a.deck, a.start, a.end])).toEqual([
			[3, 'A', 0, 100],
			[3, 'B', 50, 80]
		]);
	});

	it('records clamps', () => {
		const m = mappingWith(
			[{ input: 'p1', steps: [{ target: { kind: 'counter', counter: 'n' }, action: 'count-down' }] }],
			{ counters: [{ id: 'n', max: 3, rest: 0 }] }
		);
		expect(replay(m, [press(10, 'p1')]).clamps).toHaveLength(1);
	});

	// Check values: REFERENCES.md tempo arithmetic — 1/16 at 120 BPM = 125 ms, a beat = 500 ms.
	describe('quantized engage (DESIGN.md §4.5)', () => {
		const quantized = (q: '1/4' | '1/16') => {
			const m = legatoMapping(2);
			return { ...m, tempo: 120, bindings: m.bindings.map((b) => ({ ...b, quantize: q })) };
		};

		it('moves a press to the next 1/16 grid line, and all its changes with it', () => {
			const t = replay(quantized('1/16'), [press(1010, 'p1'), release(2000, 'p1')]);
			expect(t.changes.filter((c) => c.event === 0).every((c) => c.t === 1125)).toBe(true);
			expect(t.audible[0]).toMatchObject({ start: 1125, end: 2000 });
		});

		it('keeps a press that falls exactly on a grid line where it is', () => {
			const t = replay(quantized('1/4'), [press(1500, 'p1')]);
			expect(t.audible[0].start).toBe(1500);
		});

		it('moves a release to the next grid line too: press 130 → 250, release 260 → 375 (1/16 at 120 BPM)', () => {
			const t = replay(quantized('1/16'), [press(130, 'p1'), release(260, 'p1')]);
			expect(t.audible).toEqual([{ rack: 1, deck: 'A', start: 250, end: 375, startEvent: 0, endEvent: 1 }]);
			expect(t.changes.filter((c) => c.event === 1).every((c) => c.t === 375)).toBe(true);
		});

		it('lets a binding release at once, never before its own press lands', () => {
			const m = quantized('1/16');
			const atOnce = { ...m, bindings: m.bindings.map((b) => ({ ...b, releaseAtOnce: true })) };
			expect(replay(atOnce, [press(130, 'p1'), release(260, 'p1')]).audible[0]).toMatchObject({
				start: 250,
				end: 260
			});
			expect(replay(atOnce, [press(130, 'p1'), release(200, 'p1')]).audible[0]).toMatchObject({
				start: 250,
				end: 250
			});
		});

		it('follows the tempo changes of the stored beat clock', () => {
			// 120 BPM until 1000 ms (beat 2), then 60 BPM: a 1/4 line every 1000 ms from there.
			const clock = {
				zero: 0,
				tempos: [
					{ at: 0, bpm: 120 },
					{ at: 1000, bpm: 60 }
				]
			};
			const t = replay(quantized('1/4'), [press(900, 'p1'), press(1010, 'p2')], { clock });
			expect(t.changes.find((c) => c.event === 0)!.t).toBe(1000);
			expect(t.changes.find((c) => c.event === 1)!.t).toBe(2000);
		});

		it('lets a release that beats its own waiting press land right after it', () => {
			const t = replay(quantized('1/4'), [press(1010, 'p1'), release(1100, 'p1')]);
			expect(t.order).toEqual([0, 1]);
			expect(t.audible[0]).toMatchObject({ start: 1500, end: 1500 });
		});

		it('applies an unquantized event that comes before a waiting press first', () => {
			const m = quantized('1/4');
			const withPlain = {
				...m,
				bindings: m.bindings.map((b, i) => (i === 1 ? { ...b, quantize: 'off' as const } : b))
			};
			const t = replay(withPlain, [press(1010, 'p1'), press(1200, 'p2')]);
			expect(t.order).toEqual([1, 0]);
			expect(t.changes.find((c) => c.path === 'counters.held')).toMatchObject({ t: 1200, event: 1 });
		});

		it('uses the tempo given for the session over the mapping tempo', () => {
			// 1/4 at 100 BPM = 600 ms.
			const t = replay(quantized('1/4'), [press(1010, 'p1')], { tempo: 100 });
			expect(t.audible[0].start).toBe(1200);
		});
	});

	it('is deterministic: the same input gives the same JSON', () => {
		const events = [press(1, 'p1'), press(2, 'p2'), release(3, 'p1'), release(4, 'p2')];
		expect(JSON.stringify(replay(legatoMapping(2), events))).toBe(JSON.stringify(replay(legatoMapping(2), events)));
	});
});
