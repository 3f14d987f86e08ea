// Drills and scoring (DESIGN.md §4.8). A drill document, version 1 (our own format), names the
// presses a student should play on a beat grid; `scoreDrill` matches the presses of a recorded
// session to those targets and replays the session through the mapping for its findings.
//
// Matching: a press may match a target of the same input when |played − target| ≤ windowMs. The
// matching is one-to-one and takes the most matches, then the least total |error| — a maximum
// bipartite matching of least cost (REFERENCES.md, "Timing evaluation of played events":
// mir_eval.util.match_events computes the maximum matching with Hopcroft–Karp; a greedy
// nearest-first pairing can find fewer). Targets and presses of one input both lie on a line and
// the cost is |difference|, so two crossed pairs can always be uncrossed without leaving the
// window or raising the cost (|a−c| + |b−d| ≤ |a−d| + |b−c| for a ≤ b, c ≤ d). An optimal
// matching that keeps time order therefore exists, and an alignment over (targets × presses)
// finds it exactly (see matchTimes).
import { z } from 'zod';
import { analyze } from './analyze';
import type { Clock } from './clock';
import { toProblems, type Problem } from './mapping';
import { sessionEvents } from './session';
import type { Finding, InputEvent, Mapping, SessionDocument } from './types';

/** Beats per bar: drills are written in four-four time (common practice for dance music). */
export const BEATS_PER_BAR = 4;
export const MAX_TARGETS = 20_000;
/** The longest drill, in bars: the drill schema and the drill editor both hold to it. */
export const MAX_DRILL_BARS = 1024;

export const drillTargetSchema = z.object({
	input: z.string().trim().min(1, 'names no pad').max(64),
	beat: z.number().min(0, 'must be at beat 0 or later'),
	beats: z
		.number()
		.min(1 / 16, 'must last at least 1/16 of a beat')
		.max(64)
});

export const drillSchema = z
	.object({
		version: z.literal(1),
		name: z.string().trim().min(1, 'needs a name').max(120),
		tempo: z.number().min(40, 'must be at least 40 BPM').max(300, 'must be at most 300 BPM'),
		countInBars: z.number().int().min(0).max(8),
		lengthBars: z
			.number()
			.int()
			.min(1, 'must be at least 1 bar')
			.max(MAX_DRILL_BARS, `must be at most ${MAX_DRILL_BARS} bars`),
		windowMs: z.number().min(1).max(500).default(60),
		targets: z.array(drillTargetSchema).min(1, 'needs at least one target press').max(MAX_TARGETS),
		pass: z
			.object({
				hitRate: z.number().min(0).max(1).default(0.9),
				findings: z.number().int().min(0).default(0)
			})
			.default({ hitRate: 0.9, findings: 0 })
	})
	.superRefine((d, ctx) => {
		const end = d.lengthBars * BEATS_PER_BAR;
		d.targets.forEach((t, i) => {
			if (t.beat >= end)
				ctx.addIssue({
					code: 'custom',
					path: ['targets', i, 'beat'],
					message: `is past the drill's end (beat ${end}, after ${d.lengthBars} bars)`
				});
		});
	});

export type DrillDocument = z.output<typeof drillSchema>;
export type DrillTarget = DrillDocument['targets'][number];
export type DrillResult = { ok: true; drill: DrillDocument } | { ok: false; problems: Problem[] };

export function parseDrill(input: unknown): DrillResult {
	const r = drillSchema.safeParse(input);
	if (!r.success) return { ok: false, problems: toProblems(r.error) };
	const drill = r.data;
	// One canonical order: by beat, then input, so exports and scores never depend on entry order.
	drill.targets = [...drill.targets].sort(
		(a, b) => a.beat - b.beat || (a.input < b.input ? -1 : a.input > b.input ? 1 : 0)
	);
	return { ok: true, drill };
}

/**
 * The session's beat clock. Session documents version 2 store it (`clock.zero`, `clock.tempos`);
 * a version 1 session has none: its zero is time 0 and its tempo constant (DESIGN.md §4).
 */
export function sessionClock(session: SessionDocument): Clock {
	const stored = (session as { clock?: Partial<Clock> }).clock;
	const zero = stored?.zero ?? 0;
	const tempos = stored?.tempos?.length ? stored.tempos : [{ at: zero, bpm: session.tempo }];
	return { zero, tempos };
}

/** Where a target sits on the session clock: zero + beat × 60000 / tempo, lasting beats × 60000 / tempo. */
export function targetTime(drill: Pick<DrillDocument, 'tempo'>, target: { beat: number; beats: number }, zero: number) {
	const beatMs = 60_000 / drill.tempo;
	return { at: zero + target.beat * beatMs, length: target.beats * beatMs };
}

/** Length of the whole drill with its count-in, in ms. */
export function drillDuration(drill: Pick<DrillDocument, 'tempo' | 'countInBars' | 'lengthBars'>): number {
	return ((drill.countInBars + drill.lengthBars) * BEATS_PER_BAR * 60_000) / drill.tempo;
}

export interface Press {
	input: string;
	t: number;
	held: number; // ms until this input's next release (or the session's last event)
	event: number; // index into the session's events
}

export interface TargetOutcome {
	target: number; // index into drill.targets
	input: string;
	at: number;
	length: number;
	press: number | null; // index into `presses` of the matched press
	errorMs: number | null; // played − target
	holdErrorMs: number | null; // held − target length
}

export interface Score {
	hits: number;
	misses: number;
	extras: number;
	hitRate: number;
	meanSignedMs: number | null;
	meanAbsMs: number | null;
	medianAbsMs: number | null;
	p95AbsMs: number | null;
	holdMeanAbsMs: number | null;
	findings: number;
	pass: boolean;
	/** Findings counted by kind, whatever the engine calls them. */
	findingKinds: Record<string, number>;
	targets: TargetOutcome[];
	presses: Press[];
	/** Indexes into `presses` of the presses matched to nothing. */
	extraPresses: number[];
}

/** The presses of a session, each with how long it was held. */
export function sessionPresses(session: SessionDocument): Press[] {
	const presses: Press[] = [];
	const open = new Map<string, number[]>();
	const last = session.events.at(-1)?.t ?? 0;
	session.events.forEach((e, i) => {
		if (!e.input) return;
		const { input, type } = e.input;
		if (type === 'press') {
			presses.push({ input, t: e.t, held: last - e.t, event: i });
			const list = open.get(input) ?? [];
			list.push(presses.length - 1);
			open.set(input, list);
		} else if (type === 'release') {
			for (const k of open.get(input) ?? []) presses[k].held = e.t - presses[k].t;
			open.delete(input);
		}
	});
	return presses;
}

/**
 * The optimal one-to-one matching of sorted `targets` to sorted `presses` (times in ms) within
 * `window`: most pairs, then least total |error|. Returns for each target the matched press
 * index or -1. Exported for tests and the benchmark.
 *
 * best(i, j) = the best matching of the first i targets with the first j presses. Target i can
 * only pair with the presses in its window [lo, hi), so row i is kept only for j in [lo, hi]:
 * below lo it equals row i − 1, above hi it equals best(i, hi). Work and memory are
 * O(targets × presses per window), not O(targets × presses).
 */
export function matchTimes(targets: readonly number[], presses: readonly number[], window: number): Int32Array {
	const n = targets.length;
	const m = presses.length;
	const out = new Int32Array(n).fill(-1);
	if (!n || !m) return out;
	const lo = new Int32Array(n + 1);
	const hi = new Int32Array(n + 1);
	const off = new Int32Array(n + 2);
	off[1] = 1; // row 0: the single cell j = 0 (no targets, nothing matched)
	for (let i = 1, l = 0, h = 0; i <= n; i++) {
		const t = targets[i - 1];
		while (l < m && presses[l] < t - window) l++;
		while (h < m && presses[h] <= t + window) h++;
		lo[i] = l;
		hi[i] = Math.max(h, l);
		off[i + 1] = off[i] + hi[i] - lo[i] + 1;
	}
	const size = off[n + 1];
	const count = new Int32Array(size);
	const cost = new Float64Array(size);
	const move = new Uint8Array(size); // 1 leave the target, 2 leave the press, 3 pair them
	/** The cell holding best(i, j) for j ≥ lo[i] (above the row's end, its last cell). */
	const cell = (i: number, j: number) => off[i] + Math.min(j, hi[i]) - lo[i];
	for (let i = 1; i <= n; i++) {
		const t = targets[i - 1];
		for (let j = lo[i]; j <= hi[i]; j++) {
			const k = off[i] + j - lo[i];
			// Leave target i unmatched; or leave press j unused; ties keep the earlier choice.
			const up = cell(i - 1, j);
			let c = count[up];
			let s = cost[up];
			let mv = 1;
			if (j > lo[i] && (count[k - 1] > c || (count[k - 1] === c && cost[k - 1] < s))) {
				c = count[k - 1];
				s = cost[k - 1];
				mv = 2;
			}
			if (j > lo[i]) {
				const diag = cell(i - 1, j - 1);
				const pc = count[diag] + 1;
				const ps = cost[diag] + Math.abs(presses[j - 1] - t);
				if (pc > c || (pc === c && ps < s)) {
					c = pc;
					s = ps;
					mv = 3;
				}
			}
			count[k] = c;
			cost[k] = s;
			move[k] = mv;
		}
	}
	let i = n;
	let j = m;
	while (i > 0) {
		if (j > hi[i]) j = hi[i];
		if (j < lo[i]) {
			i--;
			continue;
		}
		const mv = move[off[i] + j - lo[i]];
		if (mv === 3) out[i - 1] = j - 1;
		if (mv !== 2) i--;
		if (mv !== 1) j--;
	}
	return out;
}

/** Nearest-rank percentile (REFERENCES.md): the value at rank ceil(P/100 × n), 1-based, of sorted values. */
export function nearestRank(sorted: readonly number[], p: number): number | null {
	if (!sorted.length) return null;
	const rank = Math.max(1, Math.ceil((p / 100) * sorted.length));
	return sorted[rank - 1];
}

/** The usual median: the middle value, or the mean of the two middle values. */
export function median(sorted: readonly number[]): number | null {
	const n = sorted.length;
	if (!n) return null;
	return n % 2 ? sorted[(n - 1) / 2] : (sorted[n / 2 - 1] + sorted[n / 2]) / 2;
}

const mean = (xs: readonly number[]) => (xs.length ? xs.reduce((a, b) => a + b, 0) / xs.length : null);

/** Timing part of the score: targets against presses, no replay. */
export function matchDrill(drill: DrillDocument, presses: readonly Press[], zero: number) {
	const outcomes: TargetOutcome[] = drill.targets.map((target, k) => {
		const { at, length } = targetTime(drill, target, zero);
		return { target: k, input: target.input, at, length, press: null, errorMs: null, holdErrorMs: null };
	});
	const byInput = new Map<string, { targets: number[]; presses: number[] }>();
	const group = (input: string) => {
		let g = byInput.get(input);
		if (!g) byInput.set(input, (g = { targets: [], presses: [] }));
		return g;
	};
	outcomes.forEach((o, k) => group(o.input).targets.push(k));
	presses.forEach((p, k) => group(p.input).presses.push(k));
	const used = new Uint8Array(presses.length);
	for (const g of byInput.values()) {
		if (!g.targets.length || !g.presses.length) continue;
		g.targets.sort((a, b) => outcomes[a].at - outcomes[b].at);
		g.presses.sort((a, b) => presses[a].t - presses[b].t || a - b);
		const pairs = matchTimes(
			g.targets.map((k) => outcomes[k].at),
			g.presses.map((k) => presses[k].t),
			drill.windowMs
		);
		pairs.forEach((pj, ti) => {
			if (pj < 0) return;
			const o = outcomes[g.targets[ti]];
			const p = g.presses[pj];
			used[p] = 1;
			o.press = p;
			o.errorMs = presses[p].t - o.at;
			o.holdErrorMs = presses[p].held - o.length;
		});
	}
	const extraPresses: number[] = [];
	used.forEach((u, k) => {
		if (!u) extraPresses.push(k);
	});
	return { outcomes, extraPresses };
}

/** Scores a session against a drill, replaying it through the mapping for its findings. */
export function scoreDrill(
	drill: DrillDocument,
	mapping: Mapping,
	session: SessionDocument,
	options: { zero?: number; findings?: readonly Finding[] } = {}
): Score {
	const clock = sessionClock(session);
	// Beat 0 of the drill: the session clock's zero, unless the practice run says where it fell.
	const zero = options.zero ?? clock.zero;
	const found = options.findings;
	const presses = sessionPresses(session);
	const { outcomes, extraPresses } = matchDrill(drill, presses, zero);
	const hitList = outcomes.filter((o) => o.errorMs !== null);
	const errors = hitList.map((o) => o.errorMs!);
	const abs = errors.map(Math.abs).sort((a, b) => a - b);
	const findings = found ?? analyze(mapping, sessionEvents(session).events as InputEvent[], { clock });
	const findingKinds: Record<string, number> = {};
	for (const f of findings) findingKinds[f.kind] = (findingKinds[f.kind] ?? 0) + 1;
	const hits = hitList.length;
	const hitRate = hits / drill.targets.length;
	return {
		hits,
		misses: drill.targets.length - hits,
		extras: extraPresses.length,
		hitRate,
		meanSignedMs: mean(errors),
		meanAbsMs: mean(abs),
		medianAbsMs: median(abs),
		p95AbsMs: nearestRank(abs, 95),
		holdMeanAbsMs: mean(hitList.map((o) => Math.abs(o.holdErrorMs!))),
		findings: findings.length,
		pass: hitRate >= drill.pass.hitRate && findings.length <= drill.pass.findings,
		findingKinds,
		targets: outcomes,
		presses,
		extraPresses
	};
}

/** The score fields of DESIGN.md §4.8 alone, for JSON exports and storage. */
export function scoreSummary(s: Score) {
	const {
		hits,
		misses,
		extras,
		hitRate,
		meanSignedMs,
		meanAbsMs,
		medianAbsMs,
		p95AbsMs,
		holdMeanAbsMs,
		findings,
		pass
	} = s;
	return {
		hits,
		misses,
		extras,
		hitRate,
		meanSignedMs,
		meanAbsMs,
		medianAbsMs,
		p95AbsMs,
		holdMeanAbsMs,
		findings,
		pass,
		findingKinds: s.findingKinds
	};
}
export type ScoreSummary = ReturnType<typeof scoreSummary>;
