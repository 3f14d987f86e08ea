// Property tests (fast-check): the engine's promises hold for any press/release order, and for any
// valid mapping, not just the examples we thought of.
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { analyze } from '$lib/engine/analyze';
import { parseMapping } from '$lib/engine/mapping';
import { replay } from '$lib/engine/replay';
import { lintMapping } from '$lib/engine/lint';
import { verifyGroupSync } from '$lib/engine/verify';
import type { InputEvent } from '$lib/engine/types';
import { mapping } from './arbitraries';
import { legatoMapping } from './factories';

/** Random but physically possible play on the given pads: a pad is released only while held. */
const play = (ids: string[], maxLength = 60) =>
	fc.array(fc.tuple(fc.nat(ids.length - 1), fc.integer({ min: 0, max: 400 })), { maxLength }).map((moves) => {
		const held = new Set<string>();
		let t = 0;
		const events: InputEvent[] = [];
		for (const [k, gap] of moves) {
			const input = ids[k];
			t += gap;
			events.push({ t, input, type: held.has(input) ? 'release' : 'press' });
			if (held.has(input)) held.delete(input);
			else held.add(input);
		}
		for (const input of held) events.push({ t: (t += 10), input, type: 'release' });
		return events;
	});

describe('properties', () => {
	const row = legatoMapping(4);
	const ids = ['p1', 'p2', 'p3', 'p4'];

	it('a legatoRow never drops out, sticks or drifts, whatever the order', () => {
		fc.assert(
			fc.property(play(ids), (events) => {
				const kinds = analyze(row, events).map((f) => f.kind);
				expect(kinds.filter((k) => k === 'dropout' || k === 'stuck-on' || k === 'count-left-over')).toEqual([]);
			}),
			{ numRuns: 300 }
		);
	});

	it('the random mappings are ones the schema accepts', () => {
		fc.assert(
			fc.property(mapping, (m) => {
				expect(parseMapping(m).ok).toBe(true);
			}),
			{ numRuns: 200 }
		);
	});

	it('random valid mappings and events never throw, in replay, analysis, lint or the verifier', () => {
		fc.assert(
			fc.property(mapping, play(ids, 30), (m, events) => {
				const t = replay(m, events);
				expect(t.order).toHaveLength(events.length);
				for (const f of analyze(m, events)) {
					expect(f.event).toBeGreaterThanOrEqual(0);
					expect(f.event).toBeLessThan(events.length);
					if (f.end !== null) expect(f.end).toBeGreaterThanOrEqual(f.start);
					expect(f.message.length).toBeGreaterThan(10);
				}
				for (const f of lintMapping(m)) expect(m.bindings[f.binding].input).toBe(f.input);
				expect(['proved', 'broken']).toContain(verifyGroupSync(m, ['p1', 'p2']).status);
			}),
			{ numRuns: 200 }
		);
	});

	it('replay is deterministic: the same input gives identical JSON', () => {
		fc.assert(
			fc.property(mapping, play(ids, 40), (m, events) => {
				const copy = structuredClone(m);
				expect(JSON.stringify(replay(copy, structuredClone(events)))).toBe(JSON.stringify(replay(m, events)));
				expect(JSON.stringify(analyze(copy, events))).toBe(JSON.stringify(analyze(m, events)));
			}),
			{ numRuns: 150 }
		);
	});

	it('every counterexample the verifier returns replays into a finding at its last event', () => {
		fc.assert(
			fc.property(mapping, (m) => {
				const r = verifyGroupSync(m, ['p1', 'p2', 'p3']);
				if (r.status !== 'broken') return;
				const last = r.counterexample!.length - 1;
				const findings = analyze(m, r.counterexample!);
				expect(findings.some((f) => f.event === last)).toBe(true);
			}),
			{ numRuns: 200 }
		);
	});
});
