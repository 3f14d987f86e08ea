import { describe, expect, it } from 'vitest';
import { verifyGroup, verifyGroupSync } from '$lib/engine/verify';
import { analyze } from '$lib/engine/analyze';
import { onePressEffect } from '$lib/engine/builders';
import { brokenRowMapping, legatoMapping, mappingWith, press, release } from './factories';

describe('verifyGroup', () => {
	// Check value: common practice of the trade — the shortest way to break a row with plain
	// momentary on/off: press 1, press 2, release 1.
	it('returns exactly the three-event counterexample for a row without a counter', async () => {
		const r = await verifyGroup(brokenRowMapping(4), ['p1', 'p2', 'p3', 'p4']);
		expect(r.ok).toBe(false);
		expect(r.status).toBe('broken');
		expect(r.counterexample).toEqual([press(250, 'p1'), press(500, 'p2'), release(750, 'p1')]);
		expect(r.finding).toMatchObject({ kind: 'dropout', event: 2, start: 750 });
	});

	it('gives a counterexample that replays into the same finding', async () => {
		const m = brokenRowMapping(4);
		const r = await verifyGroup(m, ['p1', 'p2', 'p3', 'p4']);
		expect(analyze(m, r.counterexample!)[0].kind).toBe('dropout');
	});

	// Check value: common practice of the trade — a counted row stays on until the last lift.
	it('proves a legatoRow of 4 pads', async () => {
		const r = await verifyGroup(legatoMapping(4), ['p1', 'p2', 'p3', 'p4']);
		expect(r).toEqual({ ok: true, status: 'proved', statesExplored: 17 }); // 2^4 held sets + the start
	});

	it.each([2, 3, 5, 6])('proves a legatoRow of %i pads over every held set', (n) => {
		const ids = Array.from({ length: n }, (_, i) => `p${i + 1}`);
		expect(verifyGroupSync(legatoMapping(n), ids)).toMatchObject({ ok: true, statesExplored: 2 ** n + 1 });
	});

	it('finds a drift when one pad of the row forgets its count-down', () => {
		const m = legatoMapping(3);
		m.bindings[2].steps = m.bindings[2].steps.filter((s) => s.action !== 'count-down');
		const r = verifyGroupSync(m, ['p1', 'p2', 'p3']);
		expect(r.counterexample).toEqual([press(250, 'p3'), release(500, 'p3')]);
		expect(r.finding?.kind).toBe('drift');
	});

	it('finds a leak between two one-press pads when one forgets to route away', () => {
		const toB = onePressEffect({ input: 'p1', rack: 1, effect: 'echo', mix: 1, deck: 'B', decks: 2 });
		const toA = onePressEffect({ input: 'p2', rack: 1, effect: 'echo', mix: 1, deck: 'A', decks: 2 });
		toA.steps = toA.steps.filter((s) => !(s.target.kind === 'rack-route' && s.target.deck === 'B'));
		const r = verifyGroupSync(mappingWith([toB, toA]), ['p1', 'p2']);
		// p1 leaves rack 1 on deck B; p2 sets it up for A but never routes it away from B.
		expect(r.counterexample).toEqual([press(250, 'p1'), press(500, 'p2')]);
		expect(r.finding).toMatchObject({ kind: 'leak', deck: 'B', event: 1 });
		const alone = verifyGroupSync(mappingWith([toB, toA]), ['p2']);
		expect(alone.ok).toBe(true);
	});

	it('reports progress on long runs and can be cancelled', async () => {
		const controller = new AbortController();
		const seen: number[] = [];
		const r = await verifyGroup(
			legatoMapping(8),
			Array.from({ length: 8 }, (_, i) => `p${i + 1}`),
			{
				signal: controller.signal,
				chunk: 10,
				onProgress: (p) => {
					seen.push(p.statesExplored);
					controller.abort();
				}
			}
		);
		expect(r.status).toBe('cancelled');
		expect(r.ok).toBe(false);
		expect(seen.length).toBe(1);
		expect(r.statesExplored).toBeGreaterThan(0);
	});

	it('answers "too big" rather than a false proof when it runs out of room', () => {
		const r = verifyGroupSync(
			legatoMapping(8),
			Array.from({ length: 8 }, (_, i) => `p${i + 1}`),
			{ maxStates: 20 }
		);
		expect(r).toMatchObject({ ok: false, status: 'too-big' });
	});

	it('refuses inputs the mapping does not have', () => {
		expect(() => verifyGroupSync(legatoMapping(2), ['p1', 'nope'])).toThrow(/no input called nope/);
	});
});
