import { describe, expect, it } from 'vitest';
import { verifyGroup, verifyGroupSync } from '$lib/engine/verify';
import { analyze } from '$lib/engine/analyze';
import { legatoRow, onePressEffect } from '$lib/engine/builders';
import type { Binding, Mapping } from '$lib/engine/types';
import { brokenRowMapping, counter, legatoMapping, mappingWith, pads, press, release } from './factories';

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
		expect(r).toMatchObject({ ok: true, status: 'proved', scope: 'this group, from the starting rig' });
		expect(r.statesExplored).toBeLessThanOrEqual(2 ** 4 + 1); // never more than every held set + the start
		expect(r.counterexample).toBeUndefined();
	});

	it.each([2, 3, 5, 6])('proves a legatoRow of %i pads over every held set', (n) => {
		const ids = Array.from({ length: n }, (_, i) => `p${i + 1}`);
		const r = verifyGroupSync(legatoMapping(n), ids);
		expect(r).toMatchObject({ ok: true, status: 'proved', padsFolded: n - 1 });
		expect(r.statesExplored).toBeLessThanOrEqual(2 ** n + 1);
	});

	it('finds a count left over when one pad of the row forgets its count-down', () => {
		const m = legatoMapping(3);
		m.bindings[2].steps = m.bindings[2].steps.filter((s) => s.action !== 'count-down');
		const r = verifyGroupSync(m, ['p1', 'p2', 'p3']);
		expect(r.counterexample).toEqual([press(250, 'p3'), release(500, 'p3')]);
		expect(r.finding?.kind).toBe('count-left-over');
	});

	it('finds a bleed between two one-press pads when one forgets to route away', () => {
		const toB = onePressEffect({ input: 'p1', rack: 1, effect: 'echo', mix: 1, deck: 'B', decks: 2 });
		const toA = onePressEffect({ input: 'p2', rack: 1, effect: 'echo', mix: 1, deck: 'A', decks: 2 });
		toA.steps = toA.steps.filter((s) => !(s.target.kind === 'rack-route' && s.target.deck === 'B'));
		const r = verifyGroupSync(mappingWith([toB, toA]), ['p1', 'p2']);
		// p1 leaves rack 1 on deck B; p2 sets it up for A but never routes it away from B.
		expect(r.counterexample).toEqual([press(250, 'p1'), press(500, 'p2')]);
		expect(r.finding).toMatchObject({ kind: 'bleed', deck: 'B', event: 1 });
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
			{ maxStates: 20, fold: false }
		);
		expect(r).toMatchObject({ ok: false, status: 'too-big' });
	});

	it('refuses inputs the mapping does not have', () => {
		expect(() => verifyGroupSync(legatoMapping(2), ['p1', 'nope'])).toThrow(/no input called nope/);
	});

	it('gives the same answer whatever order the inputs are listed in', () => {
		// p1 counts c1 and sets rack 1's mix for deck A, but belongs to no hold group; p2 plays rack 1
		// while held and switches it off only when c1 = 0. Holding p1 across p2's release leaves the
		// rack on; pressing and lifting p2 again leaves p2's own rack playing with no pad held.
		const m = mappingWith(
			[
				{
					input: 'p1',
					deck: 'A',
					steps: [
						{ target: { kind: 'counter', counter: 'c1' }, action: 'count-up' },
						{ target: { kind: 'rack-mix', rack: 1 }, action: 'set', value: 1 },
						{ target: { kind: 'counter', counter: 'c1' }, action: 'count-down', phase: 'release' }
					]
				},
				{
					input: 'p2',
					intent: 'while-held',
					deck: 'A',
					steps: [
						{ target: { kind: 'chain', rack: 1 }, action: 'set', value: ['gate'] },
						{ target: { kind: 'rack-route', rack: 1, deck: 'A' }, action: 'set', value: 1 },
						{ target: { kind: 'rack-on', rack: 1 }, action: 'set', value: 1 },
						{
							target: { kind: 'rack-on', rack: 1 },
							action: 'set',
							value: 0,
							phase: 'release',
							guards: [{ counter: 'c1', op: '=', value: 0 }]
						}
					]
				}
			],
			{ counters: [counter('c1')] }
		);
		const a = verifyGroupSync(m, ['p1', 'p2']);
		const b = verifyGroupSync(m, ['p2', 'p1']);
		expect(a.status).toBe('broken');
		expect(b.status).toBe('broken');
		expect(a.counterexample!.length).toBe(b.counterexample!.length);
		expect(a.finding?.kind).toBe('stuck-on');
	});

	it('proves a 64-pad hold group by folding its pads, and names the scope of the proof', () => {
		const ids = Array.from({ length: 64 }, (_, i) => `p${i + 1}`);
		const row = legatoRow({
			pads: ids,
			rack: 1,
			effect: 'stutter',
			variants: ids.map((_, i) => (i + 0.5) / 64),
			counter: 'held',
			deck: 'A',
			decks: 2
		});
		const m = mappingWith(row.bindings, { counters: [row.counter], inputs: pads(64) });
		const r = verifyGroupSync(m, ids);
		expect(r).toMatchObject({ ok: true, status: 'proved', padsFolded: 63, scope: 'this group, from the starting rig' });
		expect(r.statesExplored).toBeLessThan(1000); // unfolded it would be 2^64 held sets
	});

	it('finds the same three-event break in a 64-pad row without a counter', () => {
		const m = { ...brokenRowMapping(64), profile: { name: 'big', inputs: pads(64) } };
		const ids = Array.from({ length: 64 }, (_, i) => `p${i + 1}`);
		const r = verifyGroupSync(m, ids);
		expect(r.counterexample).toEqual([press(250, 'p1'), press(500, 'p2'), release(750, 'p1')]);
		expect(r.finding).toMatchObject({ kind: 'dropout', event: 2 });
	});

	it('places counterexample events on grid lines, so replay finds the same at the same event', () => {
		// p1 waits for the 1/4 grid at 124 BPM (a line every 483.87 ms); p2 acts at once. At a fixed
		// 250 ms spacing, p1's press would land after p2's release and the dropout would vanish.
		const q: Binding = {
			...onePressEffect({ input: 'p1', rack: 1, effect: 'echo', mix: 1, deck: 'A', decks: 2 }),
			quantize: '1/4'
		};
		const plain = onePressEffect({ input: 'p2', rack: 1, effect: 'echo', mix: 1, deck: 'A', decks: 2 });
		const m: Mapping = { ...mappingWith([q, plain]), tempo: 124 };
		const r = verifyGroupSync(m, ['p2', 'p1']);
		expect(r.status).toBe('broken');
		const line = (0.25 * 240000) / 124; // REFERENCES.md: a note value lasts fraction × 240000 / BPM
		for (const e of r.counterexample!) expect(Math.abs(e.t / line - Math.round(e.t / line))).toBeLessThan(1e-9);
		const last = r.counterexample!.length - 1;
		const replayed = analyze(m, r.counterexample!).find((f) => f.event === last);
		expect(replayed?.kind).toBe(r.finding?.kind);
		expect(replayed?.kind).toBeDefined();
	});

	it('finds a takeover of a latched pad, and none when the other pad may take over', () => {
		const latched = onePressEffect({
			input: 'p1',
			rack: 1,
			effect: 'reverb',
			mix: 1,
			deck: 'A',
			decks: 2,
			intent: 'latched'
		});
		const kill: Binding = { input: 'p2', steps: [{ target: { kind: 'rack-on', rack: 1 }, action: 'set', value: 0 }] };
		const r = verifyGroupSync(mappingWith([latched, kill]), ['p1', 'p2']);
		expect(r.counterexample).toEqual([press(250, 'p1'), press(500, 'p2')]);
		expect(r.finding).toMatchObject({ kind: 'takeover', event: 1, rack: 1 });
		expect(verifyGroupSync(mappingWith([latched, { ...kill, takeover: true }]), ['p1', 'p2']).ok).toBe(true);
	});
});
