// `padproof score <drill.json> <mapping.json> <session.json> [--json]` from a terminal.
import { spawnSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { runCli } from '$lib/cli/padproof';
import { sessionFromEvents } from '$lib/engine/session';

let dir = '';
const file = (name: string, content: unknown) => {
	const path = join(dir, name);
	writeFileSync(path, typeof content === 'string' ? content : JSON.stringify(content));
	return path;
};

// Tempo 120: one beat = 500 ms. Targets pad-1 at beats 0, 2 → 0 and 1000 ms, one beat (500 ms) long.
const drill = {
	version: 1,
	name: 'Two echoes',
	tempo: 120,
	countInBars: 1,
	lengthBars: 1,
	targets: [
		{ input: 'pad-1', beat: 0, beats: 1 },
		{ input: 'pad-1', beat: 2, beats: 1 }
	]
};
// Presses at 20 (error +20, held 480: hold error −20) and 990 (error −10, held 500: hold error 0).
// hits 2, hit rate 1; mean signed (20 − 10) / 2 = 5; mean |e| 15; median 15; p95 rank ceil(1.9) = 2 → 20.
const session = sessionFromEvents(
	[
		{ t: 20, input: 'pad-1', type: 'press' },
		{ t: 500, input: 'pad-1', type: 'release' },
		{ t: 990, input: 'pad-1', type: 'press' },
		{ t: 1490, input: 'pad-1', type: 'release' }
	],
	120
);

beforeAll(() => {
	dir = mkdtempSync(join(tmpdir(), 'padproof-score-'));
});

describe('padproof score', () => {
	it('prints the score fields of DESIGN §4.8 as JSON and exits 0 on a pass', () => {
		const r = runCli(['score', file('drill.json', drill), 'demo:two-deck', file('s.json', session), '--json']);
		expect(r.code).toBe(0);
		expect(JSON.parse(r.out)).toMatchObject({
			hits: 2,
			misses: 0,
			extras: 0,
			hitRate: 1,
			meanSignedMs: 5,
			meanAbsMs: 15,
			medianAbsMs: 15,
			p95AbsMs: 20,
			holdMeanAbsMs: 10,
			findings: 0,
			pass: true
		});
	});

	it('exits 1 when the take does not pass, and says so in plain text', () => {
		const one = sessionFromEvents(
			session.events.slice(0, 2).map((e) => ({ t: e.t, ...e.input! })),
			120
		);
		const r = runCli(['score', file('drill.json', drill), 'demo:two-deck', file('one.json', one)]);
		expect(r.code).toBe(1);
		expect(r.out).toMatch(/not passed/);
		expect(r.out).toMatch(/hits 1 of 2 \(50\.0 %\), misses 1, extras 0/);
	});

	it('refuses a broken drill with its problem and exit 2', () => {
		const r = runCli(['score', file('bad.json', { ...drill, tempo: 10 }), 'demo:two-deck', file('s.json', session)]);
		expect(r.code).toBe(2);
		expect(r.err).toMatch(/tempo: must be at least 40/);
		expect(runCli(['score', file('drill.json', drill), 'demo:two-deck']).err).toMatch(/missing a session file/);
	});

	it('runs through npm run padproof', () => {
		const r = spawnSync(
			'npm',
			[
				'run',
				'--silent',
				'padproof',
				'--',
				'score',
				file('drill.json', drill),
				'demo:two-deck',
				file('s.json', session),
				'--json'
			],
			{ encoding: 'utf8' }
		);
		expect(r.status).toBe(0);
		expect(JSON.parse(r.stdout).hits).toBe(2);
	}, 60_000);
});
