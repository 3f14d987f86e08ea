import { describe, expect, it, beforeAll } from 'vitest';
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runCli } from '$lib/cli/padproof';
import { demoMapping } from '$lib/engine/demo';
import { sessionFromEvents } from '$lib/engine/session';
import { exportSessionFile, takeFromMidiFile } from '$lib/midi/smf';

let dir = '';
const file = (name: string, content: unknown) => {
	const path = join(dir, name);
	writeFileSync(path, typeof content === 'string' || content instanceof Buffer ? content : JSON.stringify(content));
	return path;
};

beforeAll(() => {
	dir = mkdtempSync(join(tmpdir(), 'padproof-cli-'));
});

describe('padproof CLI', () => {
	it('prints help and exits 0', () => {
		const r = runCli(['--help']);
		expect(r.code).toBe(0);
		expect(r.out).toMatch(/padproof lint <mapping.json>/);
	});

	it('lints a clean mapping with exit 0 and a broken one with exit 1', () => {
		expect(runCli(['lint', file('good.json', demoMapping('two-deck'))])).toMatchObject({
			code: 0,
			out: 'Two-deck pad set: 0 findings'
		});
		const bad = runCli(['lint', file('bad.json', demoMapping('broken-row'))]);
		expect(bad.code).toBe(1);
		expect(bad.out).toMatch(/legato-without-counter/);
	});

	it('gives machines JSON with --json', () => {
		const r = runCli(['lint', file('bad.json', demoMapping('broken-row')), '--json']);
		// Numbered from 1, as in the text output: pad-13's binding is the 13th, its momentary step the 6th.
		expect(JSON.parse(r.out).findings[0]).toMatchObject({
			rule: 'legato-without-counter',
			input: 'pad-13',
			binding: 13,
			step: 6,
			message: expect.stringMatching(/plain momentary steps/)
		});
	});

	it('verifies a group and prints the shortest breaking sequence', () => {
		const r = runCli(['verify', file('bad.json', demoMapping('broken-row')), '--group', 'stutter-row', '--json']);
		expect(r.code).toBe(1);
		const [g] = JSON.parse(r.out).groups;
		expect(g.result.counterexample.map((e: { type: string; input: string }) => `${e.type} ${e.input}`)).toEqual([
			'press pad-13',
			'press pad-14',
			'release pad-13'
		]);
		expect(runCli(['verify', 'demo:two-deck']).out).toMatch(
			/^stutter-row \(4 inputs\): proved for this group, from the starting rig \(\d+ states, 3 pads folded\)$/
		);
	});

	it('replays a session and points findings at session events', () => {
		const s = sessionFromEvents(
			[
				{ t: 1000, input: 'pad-13', type: 'press' },
				{ t: 1500, input: 'pad-14', type: 'press' },
				{ t: 12438, input: 'pad-13', type: 'release' },
				{ t: 13000, input: 'pad-14', type: 'release' }
			],
			124
		);
		s.events.splice(1, 0, { t: 1200, midi: [0xb0, 1, 64], input: null }); // an unmapped message
		const r = runCli(['replay', 'demo:broken-row', file('session.json', s)]);
		expect(r.code).toBe(1);
		expect(r.out).toMatch(
			/Dropout +12\.438 s – 13\.000 s {2}event 4: release of Pad 13 at 12\.438 s turned rack 2 off while Pad 14 was held/
		);
		expect(runCli(['replay', 'demo:two-deck', file('session.json', s)]).code).toBe(0);
	});

	it('prints the audible intervals and plain-worded findings numbered from 1 with replay --json', () => {
		const s = sessionFromEvents(
			[
				{ t: 1000, input: 'pad-13', type: 'press' },
				{ t: 1500, input: 'pad-14', type: 'press' },
				{ t: 12438, input: 'pad-13', type: 'release' },
				{ t: 13000, input: 'pad-14', type: 'release' }
			],
			124
		);
		const out = JSON.parse(runCli(['replay', 'demo:broken-row', file('s.json', s), '--json']).out);
		expect(out.audible).toEqual([{ rack: 2, deck: 'A', start: 1000, end: 12438, startEvent: 1, endEvent: 3 }]);
		expect(out.findings).toEqual([
			expect.objectContaining({
				kind: 'dropout',
				label: 'Dropout',
				explain: expect.stringMatching(/held, yet its effect is not heard/),
				event: 3,
				binding: 14,
				input: 'pad-14'
			})
		]);
	});

	it('replays a Standard MIDI File the way the web import reads it', () => {
		// 125 BPM at 480 ticks per quarter is 1 ms a tick (ms per beat = 60000 / BPM, REFERENCES.md),
		// so the file holds the presses at exactly these times.
		const take = sessionFromEvents(
			[
				{ t: 1000, input: 'pad-13', type: 'press' },
				{ t: 1500, input: 'pad-14', type: 'press' },
				{ t: 12438, input: 'pad-13', type: 'release' },
				{ t: 13000, input: 'pad-14', type: 'release' }
			],
			125
		);
		const profile = demoMapping('broken-row').profile;
		const mid = file('take.mid', Buffer.from(exportSessionFile(take, profile).bytes));
		const r = runCli(['replay', 'demo:broken-row', mid]);
		expect(r.code).toBe(1);
		expect(r.out).toMatch(/Dropout +12\.438 s – 13\.000 s .*release of Pad 13 at 12\.438 s/);
		const web = takeFromMidiFile(readFileSync(mid), profile);
		expect(web.ok).toBe(true);
		const asJson = file('take.session.json', web.ok ? web.session : null);
		expect(runCli(['replay', 'demo:broken-row', mid, '--json']).out).toBe(
			runCli(['replay', 'demo:broken-row', asJson, '--json']).out
		);
	});

	it('refuses a MIDI file that is cut short, naming the truncation', () => {
		const take = sessionFromEvents([{ t: 0, input: 'pad-13', type: 'press' }], 120);
		const bytes = exportSessionFile(take, demoMapping('broken-row').profile).bytes;
		const r = runCli(['replay', 'demo:broken-row', file('cut.mid', Buffer.from(bytes.slice(0, 30)))]);
		expect(r.code).toBe(2);
		expect(r.err).toMatch(/cut\.mid can't be read:\n {2}\(MIDI file\): The file is truncated/);
	});

	it.each([
		['a missing file', ['lint', '/no/such/mapping.json'], /does not exist/],
		['a file that is not JSON', ['lint', 'NOT_JSON'], /not valid JSON/],
		['a mapping with problems', ['lint', 'BAD_MAPPING'], /decks: must be one of 2, 4/],
		['a bad session', ['replay', 'demo:two-deck', 'BAD_SESSION'], /tempo: is required/],
		['an unknown command', ['dance'], /unknown command/],
		['a missing argument', ['replay', 'demo:two-deck'], /missing a session file/]
	])('exits 2 on %s', (_, argv, message) => {
		const paths: Record<string, string> = {
			NOT_JSON: file('x.json', '{ nope'),
			BAD_MAPPING: file('m.json', { ...demoMapping('two-deck'), decks: 3 }),
			BAD_SESSION: file('s.json', { version: 1, startedAt: '2025-01-01T00:00:00Z', events: [] })
		};
		const r = runCli(argv.map((a) => paths[a] ?? a));
		expect(r.code).toBe(2);
		expect(r.err).toMatch(message);
	});

	it('reads a valid version 1 mapping as the version 2 document it upgrades to, with nothing on stderr', () => {
		const v1 = JSON.parse(readFileSync(new URL('../engine/fixtures/v1-demos.json', import.meta.url), 'utf8'));
		const clean = runCli(['lint', file('old-two-deck.json', v1['two-deck'])]);
		expect(clean).toEqual({ code: 0, out: 'Two-deck pad set: 0 findings', err: '' });
		const take = sessionFromEvents(
			[
				{ t: 1000, input: 'pad-13', type: 'press' },
				{ t: 1500, input: 'pad-14', type: 'press' },
				{ t: 12438, input: 'pad-13', type: 'release' },
				{ t: 13000, input: 'pad-14', type: 'release' }
			],
			124
		);
		const old = runCli(['replay', file('old-row.json', v1['broken-row']), file('row-take.json', take), '--json']);
		expect(old.code).toBe(1);
		expect(old.err).toBe('');
		const now = runCli(['replay', 'demo:broken-row', file('row-take.json', take), '--json']);
		expect(JSON.parse(old.out).findings).toEqual(JSON.parse(now.out).findings);
		expect(JSON.parse(old.out).audible).toEqual(JSON.parse(now.out).audible);
	});

	it('prints the upgrade notes of a version 1 mapping on stderr, leaving stdout as it was', () => {
		const mixed = new URL('../fixtures/v1-focus-and-slot-2.mapping.json', import.meta.url).pathname;
		const note = /is a version 1 mapping document, read as version 2:\n {2}Rack 1 played only its first effect/;
		const lint = runCli(['lint', mixed]);
		expect(lint.out).toMatch(/^Old focus rack: \d+ findings?/);
		expect(lint.err).toMatch(note);
		const take = sessionFromEvents([{ t: 0, input: 'pad-2', type: 'press' }], 124);
		const replayed = runCli(['replay', mixed, file('pad-2.json', take), '--json']);
		expect(replayed.err).toMatch(note);
		expect(JSON.parse(replayed.out).mapping).toBe('Old focus rack');
		expect(runCli(['verify', mixed]).err).toMatch(note);
		// The notes come before a refusal of another file, so neither is lost.
		const refused = runCli(['replay', mixed, '/no/such/take.json']);
		expect(refused.code).toBe(2);
		expect(refused.err).toMatch(/Rack 1 played[\s\S]*take\.json can't be read/);
	});

	it('sets the process exit code when run through npm', () => {
		const r = spawnSync('npx', ['tsx', 'src/lib/cli/padproof.ts', 'lint', 'demo:broken-row'], { encoding: 'utf8' });
		expect(r.status).toBe(1);
		expect(r.stdout).toMatch(/Broken stutter row: 1 finding/);
	}, 60_000); // starts a whole Node process through npx: slow on a busy machine
});
