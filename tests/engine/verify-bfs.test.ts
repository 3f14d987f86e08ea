// The verifier against a plain breadth-first search that keys states on everything (the whole rig
// and the whole watch, parameter values and press order included) and folds nothing. Whatever the
// verifier's key leaves out and whichever pads it folds, its answers must be the plain search's.
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { applyEvent, initialRigState } from '$lib/engine/rig';
import { verifyGroupSync } from '$lib/engine/verify';
import { conditions, initialWatch, observe, rackBits, rulesFor, takeovers } from '$lib/engine/watch';
import { legatoRow, onePressEffect } from '$lib/engine/builders';
import type { InputEvent, Mapping } from '$lib/engine/types';
import { mapping } from './arbitraries';
import { mappingWith, pads } from './factories';

function plainSearch(m: Mapping, inputs: string[]): { status: 'proved' | 'broken'; moves: string[] } {
	const rules = rulesFor(m);
	const start = { s: initialRigState(m), w: initialWatch(rules), moves: [] as string[] };
	const seen = new Set<string>();
	const keyOf = (x: typeof start) =>
		JSON.stringify([x.s, Array.from(x.w.used), Array.from(x.w.toucher), Array.from(x.w.latched)]);
	seen.add(keyOf(start));
	const queue = [start];
	for (let head = 0; head < queue.length; head++) {
		const { s, w, moves } = queue[head];
		for (const input of inputs) {
			const type = s.held.includes(input) ? 'release' : 'press';
			const r = applyEvent(m, s, { t: moves.length + 1, input, type }, moves.length);
			const bits = rackBits(r.changes);
			const next = observe(rules, w, input, type, bits.touched, r.state, bits.reshaped);
			const path = [...moves, `${type} ${input}`];
			if (
				r.clamps.length ||
				(type === 'press' && rules.clashInputs.has(input)) ||
				takeovers(rules, w, input, type, bits.reshaped).length ||
				conditions(rules, r.state, next).length
			)
				return { status: 'broken', moves: path };
			const node = { s: r.state, w: next, moves: path };
			const key = keyOf(node);
			if (seen.has(key)) continue;
			seen.add(key);
			queue.push(node);
		}
	}
	return { status: 'proved', moves: [] };
}

const moves = (events: InputEvent[] | undefined) => (events ?? []).map((e) => `${e.type} ${e.input}`);

describe('verifier ≡ plain search', () => {
	it('gives the plain search’s answer and counterexample on random groups, in both input orders', () => {
		fc.assert(
			fc.property(
				mapping,
				fc.shuffledSubarray(['p1', 'p2', 'p3', 'p4'], { minLength: 2, maxLength: 3 }),
				(m, group) => {
					for (const order of [group, [...group].reverse()]) {
						const plain = plainSearch(m, order);
						const folded = verifyGroupSync(m, order);
						expect(folded.status).toBe(plain.status);
						expect(moves(folded.counterexample)).toEqual(plain.moves);
						expect(moves(verifyGroupSync(m, order, { fold: false }).counterexample)).toEqual(plain.moves);
					}
				}
			),
			{ numRuns: 200 }
		);
	}, 60_000);

	it('folds hold-group pads that differ only in parameter values and labels, with the same answers', () => {
		fc.assert(
			fc.property(fc.integer({ min: 2, max: 5 }), fc.boolean(), fc.nat(3), (n, broken, extra) => {
				const ids = Array.from({ length: n }, (_, i) => `p${i + 1}`);
				const row = legatoRow({
					pads: ids,
					rack: 1,
					effect: 'stutter',
					variants: ids.map((_, i) => (i + 0.5) / n),
					counter: 'held',
					deck: 'A',
					decks: 2
				});
				// A broken row loses one pad's guard on the off step; an extra plain pad shares the rack.
				if (broken) row.bindings[n - 1].steps = row.bindings[n - 1].steps.map((s) => ({ ...s, guards: [] }));
				const other = onePressEffect({ input: 'p8', rack: 1, effect: 'echo', mix: 1, deck: 'B', decks: 2 });
				const m = mappingWith(extra ? [...row.bindings, other] : row.bindings, {
					counters: [row.counter],
					inputs: pads(8)
				});
				const group = extra ? [...ids, 'p8'] : ids;
				const plain = plainSearch(m, group);
				const r = verifyGroupSync(m, group);
				expect(r.status).toBe(plain.status);
				expect(moves(r.counterexample)).toEqual(plain.moves);
			}),
			{ numRuns: 60 }
		);
	}, 60_000);
});
