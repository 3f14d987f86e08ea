// Drill scoring (DESIGN.md §4.8). Every expected figure is worked out by hand beside the test.
// The matching rule — one-to-one, most matches, then least total |error|, not greedy — follows
// REFERENCES.md "Timing evaluation of played events": mir_eval.util.match_events (mir_eval,
// Raffel et al., ISMIR 2014) finds the maximum bipartite matching within a window, and a greedy
// nearest-first pairing can find fewer matches when one press lies within reach of two targets.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { demoMapping } from '$lib/engine/demo';
import {
	matchTimes,
	median,
	nearestRank,
	parseDrill,
	scoreDrill,
	sessionClock,
	sessionPresses,
	type DrillDocument
} from '$lib/engine/score';
import type { SessionDocument, SessionEvent } from '$lib/engine/types';

const twoDeck = demoMapping('two-deck');
const brokenRow = demoMapping('broken-row');

function drill(targets: DrillDocument['targets'], extra: Partial<DrillDocument> = {}): DrillDocument {
	const r = parseDrill({
		version: 1,
		name: 'Test drill',
		tempo: 120,
		countInBars: 1,
		lengthBars: 4,
		targets,
		...extra
	});
	if (!r.ok) throw new Error(JSON.stringify(r.problems));
	return r.drill;
}

/** A session from [time, input, 'press' | 'release'] triples. */
function session(
	events: [number, string, 'press' | 'release'][],
	extra: Record<string, unknown> = {}
): SessionDocument {
	const list: SessionEvent[] = events.map(([t, input, type]) => ({ t, input: { input, type } }));
	return {
		version: 1,
		tempo: 120,
		startedAt: '2026-01-01T00:00:00.000Z',
		events: list,
		...extra
	} as unknown as SessionDocument;
}

/** Press and release one pad: the press at `t`, held for `held` ms. */
const tap = (t: number, input: string, held: number): [number, string, 'press' | 'release'][] => [
	[t, input, 'press'],
	[t + held, input, 'release']
];
const byTime = (e: [number, string, 'press' | 'release'][]) => [...e].sort((a, b) => a[0] - b[0]);

describe('drill documents', () => {
	it('fills the defaults of DESIGN §4.8: window 60 ms, pass at hit rate 0.9 with no findings', () => {
		const d = drill([{ input: 'pad-1', beat: 0, beats: 1 }]);
		expect(d.windowMs).toBe(60);
		expect(d.pass).toEqual({ hitRate: 0.9, findings: 0 });
	});

	it('refuses a target past the end and a drill without targets, with the path', () => {
		const past = parseDrill({
			version: 1,
			name: 'x',
			tempo: 120,
			countInBars: 1,
			lengthBars: 1,
			targets: [{ input: 'pad-1', beat: 4, beats: 1 }]
		});
		expect(past.ok).toBe(false);
		if (!past.ok) expect(past.problems[0]).toMatchObject({ path: 'targets[0].beat' });
		const empty = parseDrill({ version: 1, name: 'x', tempo: 120, countInBars: 1, lengthBars: 1, targets: [] });
		expect(empty.ok).toBe(false);
	});

	it('sorts targets by beat so the stored order never matters', () => {
		const d = drill([
			{ input: 'pad-2', beat: 2, beats: 1 },
			{ input: 'pad-1', beat: 0, beats: 1 }
		]);
		expect(d.targets.map((t) => t.beat)).toEqual([0, 2]);
	});
});

describe('scoreDrill: worked example', () => {
	// Tempo 120 BPM: one beat is 60000 / 120 = 500 ms. Zero is 0 (a version 1 session).
	// Targets pad-1 at beats 0, 1, 2, 3, each half a beat long → at 0, 500, 1000, 1500 ms, 250 ms long.
	// Presses: pad-1 at 10 (held 240), 480 (held 270), 1530 (held 200); pad-2 at 800 (not in the drill).
	//   10   → target 0 ms:    error +10, hold error 240 − 250 = −10
	//   480  → target 500 ms:  error −20, hold error 270 − 250 = +20
	//   1530 → target 1500 ms: error +30, hold error 200 − 250 = −50 (1000 ms is 530 away: too far)
	//   target 1000 ms: no press within 60 ms → miss; pad-2 at 800 → extra.
	// hits 3, misses 1, extras 1, hit rate 3 / 4 = 0.75
	// mean signed (10 − 20 + 30) / 3 = 20 / 3; mean |e| (10 + 20 + 30) / 3 = 20
	// median of [10, 20, 30] = 20; p95 nearest rank: ceil(0.95 × 3) = 3rd value = 30
	// hold mean |e| (10 + 20 + 50) / 3 = 80 / 3
	const d = drill([0, 1, 2, 3].map((beat) => ({ input: 'pad-1', beat, beats: 0.5 })));
	const s = session(
		byTime([...tap(10, 'pad-1', 240), ...tap(480, 'pad-1', 270), ...tap(1530, 'pad-1', 200), ...tap(800, 'pad-2', 100)])
	);
	const score = scoreDrill(d, twoDeck, s);

	it('counts hits, misses and extras', () => {
		expect(score).toMatchObject({ hits: 3, misses: 1, extras: 1, hitRate: 0.75 });
	});

	it('gives the timing figures', () => {
		expect(score.meanSignedMs).toBeCloseTo(20 / 3, 10);
		expect(score.meanAbsMs).toBeCloseTo(20, 10);
		expect(score.medianAbsMs).toBe(20);
		expect(score.p95AbsMs).toBe(30);
		expect(score.holdMeanAbsMs).toBeCloseTo(80 / 3, 10);
	});

	it('fails the pass mark at 0.75 < 0.9, with no findings from clean one-press pads', () => {
		expect(score.findings).toBe(0);
		expect(score.pass).toBe(false);
		expect(scoreDrill({ ...d, pass: { hitRate: 0.75, findings: 0 } }, twoDeck, s).pass).toBe(true);
	});

	it('says which target each press met', () => {
		expect(score.targets.map((t) => t.errorMs)).toEqual([10, -20, null, 30]);
		expect(score.extraPresses.map((k) => score.presses[k].input)).toEqual(['pad-2']);
	});
});

describe('scoreDrill: edge cases', () => {
	const four = drill([0, 1, 2, 3].map((beat) => ({ input: 'pad-1', beat, beats: 0.5 })));

	it('no presses: every target missed, no timing figures', () => {
		const score = scoreDrill(four, twoDeck, session([]));
		expect(score).toMatchObject({
			hits: 0,
			misses: 4,
			extras: 0,
			hitRate: 0,
			meanSignedMs: null,
			meanAbsMs: null,
			medianAbsMs: null,
			p95AbsMs: null,
			holdMeanAbsMs: null,
			pass: false
		});
	});

	it('all early by 40 ms (inside the window): all hit, mean signed −40', () => {
		// Presses at 0 + 460, 960, 1460 and the first target at 0 can't be 40 ms early on a zero-based
		// clock, so the clock zero is 1000 (a version 2 session): targets at 1000, 1500, 2000, 2500.
		const s = session(byTime([960, 1460, 1960, 2460].flatMap((t) => tap(t, 'pad-1', 250))), {
			clock: { zero: 1000, tempos: [{ at: 0, bpm: 120 }] }
		});
		const score = scoreDrill(four, twoDeck, s);
		expect(score).toMatchObject({ hits: 4, misses: 0, extras: 0, meanSignedMs: -40, meanAbsMs: 40, holdMeanAbsMs: 0 });
	});

	it('all early by 80 ms (outside the 60 ms window): all missed, every press an extra', () => {
		const s = session(byTime([920, 1420, 1920, 2420].flatMap((t) => tap(t, 'pad-1', 250))), {
			clock: { zero: 1000, tempos: [{ at: 0, bpm: 120 }] }
		});
		expect(scoreDrill(four, twoDeck, s)).toMatchObject({ hits: 0, misses: 4, extras: 4, hitRate: 0 });
	});

	it('a double press: the closer one hits, the other is an extra', () => {
		// Target beat 2 → 1000 ms. Presses 990 (error −10) and 1025 (error +25), both within 60 ms.
		const d = drill([{ input: 'pad-1', beat: 2, beats: 0.5 }]);
		const score = scoreDrill(d, twoDeck, session(byTime([...tap(990, 'pad-1', 20), ...tap(1025, 'pad-1', 200)])));
		expect(score).toMatchObject({ hits: 1, misses: 0, extras: 1, meanSignedMs: -10 });
		// Held 20 ms against 250 ms: hold error 230.
		expect(score.holdMeanAbsMs).toBe(230);
	});

	it('one press within reach of two targets counts once', () => {
		// Targets at beats 2 and 2.1 → 1000 and 1050 ms; one press at 1030 reaches both (30 and 20 away).
		// It matches the nearer (1050, error −20); 1000 is missed.
		const d = drill([
			{ input: 'pad-1', beat: 2, beats: 0.1 },
			{ input: 'pad-1', beat: 2.1, beats: 0.1 }
		]);
		const score = scoreDrill(d, twoDeck, session(tap(1030, 'pad-1', 50)));
		expect(score).toMatchObject({ hits: 1, misses: 1, extras: 0, meanSignedMs: -20 });
	});

	it('a press of the wrong pad at the right time is an extra, not a hit', () => {
		const d = drill([{ input: 'pad-1', beat: 2, beats: 0.5 }]);
		expect(scoreDrill(d, twoDeck, session(tap(1000, 'pad-2', 250)))).toMatchObject({ hits: 0, misses: 1, extras: 1 });
	});

	it('counts findings from the replay and fails the pass mark on them', () => {
		// broken-row: pad-13 and pad-14 share rack 2 with plain on/off and no counter; lifting
		// pad-13 while pad-14 is held turns the rack off: one dropout (common practice).
		const d = drill([
			{ input: 'pad-13', beat: 2, beats: 2 },
			{ input: 'pad-14', beat: 3, beats: 2 }
		]);
		const s = session([
			[1000, 'pad-13', 'press'],
			[1500, 'pad-14', 'press'],
			[2000, 'pad-13', 'release'],
			[2500, 'pad-14', 'release']
		]);
		const score = scoreDrill(d, brokenRow, s);
		expect(score.hits).toBe(2);
		expect(score.findings).toBeGreaterThanOrEqual(1);
		expect(Object.values(score.findingKinds).reduce((a, b) => a + b, 0)).toBe(score.findings);
		expect(score.pass).toBe(false);
		expect(scoreDrill({ ...d, pass: { hitRate: 0.9, findings: score.findings } }, brokenRow, s).pass).toBe(true);
	});
});

describe('matching is optimal, not greedy', () => {
	/** Pairs each press in time order with the nearest free target in the window. */
	function greedyNearestPerPress(targets: number[], presses: number[], w: number): number {
		const used = new Set<number>();
		for (const p of presses) {
			let best = -1;
			targets.forEach((t, i) => {
				if (!used.has(i) && Math.abs(p - t) <= w && (best < 0 || Math.abs(p - t) < Math.abs(p - targets[best])))
					best = i;
			});
			if (best >= 0) used.add(best);
		}
		return used.size;
	}
	/** Takes the globally smallest |error| pair first, then the next, and so on. */
	function greedySmallestFirst(targets: number[], presses: number[], w: number): number {
		const pairs = targets
			.flatMap((t, i) => presses.map((p, j) => ({ i, j, e: Math.abs(p - t) })))
			.filter((x) => x.e <= w)
			.sort((a, b) => a.e - b.e);
		const ti = new Set<number>();
		const pj = new Set<number>();
		for (const x of pairs)
			if (!ti.has(x.i) && !pj.has(x.j)) {
				ti.add(x.i);
				pj.add(x.j);
			}
		return ti.size;
	}

	it('finds 2 hits where both greedy pairings find 1', () => {
		// Window 60. Targets at 0 and 100; presses at 55 and 155.
		// Press 55 is 55 from target 0 and 45 from target 100: greedy takes 100 for it (45 < 55);
		// press 155 then only reaches target 100 (55 away), which is taken → greedy: 1 hit.
		// Optimal: 55 → 0 (55), 155 → 100 (55): 2 hits, total |error| 110.
		const targets = [0, 100];
		const presses = [55, 155];
		expect(greedyNearestPerPress(targets, presses, 60)).toBe(1);
		expect(greedySmallestFirst(targets, presses, 60)).toBe(1);
		expect([...matchTimes(targets, presses, 60)]).toEqual([0, 1]);
	});

	it('the same through scoreDrill: 2 hits, mean signed (55 + 55) / 2 = 55', () => {
		// Tempo 120, zero 1000: beat 0 → 1000 ms, beat 0.2 → 1000 + 0.2 × 500 = 1100 ms.
		const d = drill([
			{ input: 'pad-1', beat: 0, beats: 0.1 },
			{ input: 'pad-1', beat: 0.2, beats: 0.1 }
		]);
		const s = session(byTime([...tap(1055, 'pad-1', 30), ...tap(1155, 'pad-1', 30)]), {
			clock: { zero: 1000, tempos: [{ at: 0, bpm: 120 }] }
		});
		expect(scoreDrill(d, twoDeck, s)).toMatchObject({ hits: 2, misses: 0, extras: 0, meanSignedMs: 55 });
	});

	it('with equal matches, takes the least total |error|', () => {
		// Window 60. Targets 0 and 50, presses 20 and 40. Both pairings match two:
		// 20→0, 40→50: 20 + 10 = 30; 20→50, 40→0: 30 + 40 = 70. The first wins.
		expect([...matchTimes([0, 50], [20, 40], 60)]).toEqual([0, 1]);
	});

	it('agrees with an exhaustive search on random small cases', () => {
		function exhaustive(targets: number[], presses: number[], w: number) {
			let best = { count: 0, cost: 0 };
			const used = new Array(presses.length).fill(false);
			const go = (i: number, count: number, cost: number) => {
				if (i === targets.length) {
					if (count > best.count || (count === best.count && cost < best.cost - 1e-9)) best = { count, cost };
					return;
				}
				go(i + 1, count, cost);
				presses.forEach((p, j) => {
					const e = Math.abs(p - targets[i]);
					if (used[j] || e > w) return;
					used[j] = true;
					go(i + 1, count + 1, cost + e);
					used[j] = false;
				});
			};
			go(0, 0, 0);
			return best;
		}
		const times = fc.array(fc.integer({ min: 0, max: 400 }), { maxLength: 6 }).map((a) => a.sort((x, y) => x - y));
		fc.assert(
			fc.property(times, times, fc.integer({ min: 10, max: 120 }), (targets, presses, w) => {
				const pairs = matchTimes(targets, presses, w);
				const seen = new Set<number>();
				let count = 0;
				let cost = 0;
				pairs.forEach((j, i) => {
					if (j < 0) return;
					expect(seen.has(j)).toBe(false);
					seen.add(j);
					expect(Math.abs(presses[j] - targets[i])).toBeLessThanOrEqual(w);
					count++;
					cost += Math.abs(presses[j] - targets[i]);
				});
				const best = exhaustive(targets, presses, w);
				expect(count).toBe(best.count);
				expect(cost).toBeCloseTo(best.cost, 9);
			}),
			{ numRuns: 300 }
		);
	});
});

describe('percentiles and clock', () => {
	it('nearest rank (REFERENCES.md): rank ceil(P/100 × n), 1-based', () => {
		// n = 20: ceil(0.95 × 20) = 19 → the 19th value; n = 1 → the only value.
		const values = Array.from({ length: 20 }, (_, i) => i + 1);
		expect(nearestRank(values, 95)).toBe(19);
		expect(nearestRank([7], 95)).toBe(7);
		expect(nearestRank([], 95)).toBeNull();
		// n = 4: median is the mean of the 2nd and 3rd values, (2 + 4) / 2 = 3.
		expect(median([1, 2, 4, 9])).toBe(3);
	});

	it('reads a version 1 session as zero 0 and a version 2 clock as stored', () => {
		expect(sessionClock(session([]))).toEqual({ zero: 0, tempos: [{ at: 0, bpm: 120 }] });
		const clock = { zero: 2000, tempos: [{ at: 0, bpm: 128 }] };
		expect(sessionClock(session([], { clock }))).toEqual(clock);
	});

	it('measures each press held until its release', () => {
		const p = sessionPresses(session(byTime([...tap(0, 'pad-1', 300), ...tap(100, 'pad-2', 50)])));
		expect(p.map((x) => [x.input, x.held])).toEqual([
			['pad-1', 300],
			['pad-2', 50]
		]);
	});
});
