// `npm run padproof -- lint|verify|replay|score ...`: the engine from a terminal. Plain text by default,
// `--json` for machines. Exit codes: 0 nothing found, 1 findings, 2 unreadable input or bad usage.
// A mapping argument may also be `demo:<slug>` to use one of the demo mappings.
import { readFileSync } from 'node:fs';
import { pathToFileURL } from 'node:url';
import { analyze } from '../engine/analyze';
import { DEMO_MAPPINGS } from '../engine/demo';
import { lintMapping } from '../engine/lint';
import { parseMappingText, type Problem } from '../engine/mapping';
import { replay } from '../engine/replay';
import { parseDrill, scoreDrill, scoreSummary, type DrillDocument } from '../engine/score';
import { parseSession, sessionEvents, sessionReplay } from '../engine/session';
import { FINDING_INFO, numberedFinding } from '../engine/findings';
import { isStandardMidiFile, takeFromMidiFile } from '../midi/smf';
import { groupIds, groupInputs, verifyGroupSync, type VerifyResult } from '../engine/verify';
import type { Finding, Mapping } from '../engine/types';

export const HELP = `padproof — check pad mappings from the command line

Usage:
  padproof lint <mapping.json> [--json]
      Static checks: clashes, partial routing, pads that don't load their chain, counters too
      small for their hold group, hold groups without a counter, unbalanced counts, idle guards,
      steps that can never run.
  padproof verify <mapping.json> [--group ID | --inputs a,b,c] [--json]
      Try every press/release order of a hold group (all groups when none is named), from the
      starting rig, and print a proof or the shortest sequence that breaks it.
  padproof replay <mapping.json> <session.json | take.mid> [--json]
      Replay a recorded session (or a Standard MIDI File of pad presses, read as the web
      import reads it) from the rig and beat clock it was recorded with, and list its
      findings: ${Object.values(FINDING_INFO)
				.map((i) => i.label.toLowerCase())
				.join(', ')}.
  padproof score <drill.json> <mapping.json> <session.json> [--json]
      Score a session against a drill: hits, misses, extras, timing errors, hold lengths,
      findings, and whether it passes (exit 0 pass, 1 not passed).

A mapping may be demo:${DEMO_MAPPINGS.map((d) => d.slug).join(' | demo:')}.
Exit codes: 0 nothing found (score: passed), 1 findings (score: not passed), 2 unreadable input or bad usage.`;

export interface CliResult {
	code: 0 | 1 | 2;
	out: string;
	err: string;
}

class Unreadable extends Error {
	constructor(
		readonly file: string,
		readonly problems: Problem[]
	) {
		super(`${file} can't be used`);
	}
}

function readText(file: string): string {
	return new TextDecoder().decode(readBytes(file));
}

function readBytes(file: string): Uint8Array {
	try {
		return readFileSync(file);
	} catch (e) {
		throw new Unreadable(file, [
			{
				path: '(file)',
				message: (e as NodeJS.ErrnoException).code === 'ENOENT' ? 'does not exist' : (e as Error).message
			}
		]);
	}
}

/** What the run has to tell beside its answer (a version 1 mapping's upgrade notes); printed to stderr. */
let notices: string[] = [];

function loadMapping(arg: string): Mapping {
	const demo = arg.startsWith('demo:') ? DEMO_MAPPINGS.find((d) => d.slug === arg.slice(5)) : undefined;
	if (demo) return demo.mapping;
	const r = parseMappingText(readText(arg));
	if (!r.ok) throw new Unreadable(arg, r.problems);
	if (r.upgrade?.notes.length)
		notices.push(`${arg} is a version 1 mapping document, read as version 2:`, ...r.upgrade.notes.map((n) => `  ${n}`));
	return r.mapping;
}

function readJsonFile(file: string): unknown {
	try {
		return JSON.parse(readText(file));
	} catch (e) {
		if (e instanceof Unreadable) throw e;
		throw new Unreadable(file, [{ path: '(document)', message: `is not valid JSON: ${(e as Error).message}` }]);
	}
}

function loadDrill(file: string): DrillDocument {
	const r = parseDrill(readJsonFile(file));
	if (!r.ok) throw new Unreadable(file, r.problems);
	return r.drill;
}

/** A session document (JSON) or, as the web import reads it, a Standard MIDI File decoded with the mapping's profile. */
function loadSession(file: string, mapping: Mapping) {
	const bytes = readBytes(file);
	if (isStandardMidiFile(bytes)) {
		const r = takeFromMidiFile(bytes, mapping.profile);
		if (!r.ok) throw new Unreadable(file, [{ path: '(MIDI file)', message: r.error }]);
		return r.session;
	}
	let data: unknown;
	try {
		data = JSON.parse(new TextDecoder().decode(bytes));
	} catch (e) {
		if (e instanceof Unreadable) throw e;
		throw new Unreadable(file, [{ path: '(document)', message: `is not valid JSON: ${(e as Error).message}` }]);
	}
	const r = parseSession(data);
	if (!r.ok) throw new Unreadable(file, r.problems);
	return r.session;
}

interface Args {
	command: string | undefined;
	files: string[];
	json: boolean;
	help: boolean;
	group?: string;
	inputs?: string[];
}

function parseArgs(argv: string[]): Args {
	const a: Args = { command: undefined, files: [], json: false, help: false };
	for (let i = 0; i < argv.length; i++) {
		const x = argv[i];
		if (x === '--json') a.json = true;
		else if (x === '--help' || x === '-h') a.help = true;
		else if (x === '--group') a.group = argv[++i];
		else if (x === '--inputs') a.inputs = (argv[++i] ?? '').split(',').filter(Boolean);
		else if (x.startsWith('--')) throw new Usage(`unknown option ${x}`);
		else if (!a.command) a.command = x;
		else a.files.push(x);
	}
	return a;
}

class Usage extends Error {}

const json = (v: unknown) => JSON.stringify(v, null, 2);
const ms = (t: number | null) => (t === null ? 'end' : `${(t / 1000).toFixed(3)} s`);

function lint(a: Args): CliResult {
	const mapping = loadMapping(need(a.files[0], 'a mapping file'));
	const findings = lintMapping(mapping);
	const code = findings.length ? 1 : 0;
	// Numbered from 1 in JSON as in text: binding 1 is the first binding.
	const numbered = findings.map((f) => ({ ...f, binding: f.binding + 1, step: f.step === null ? null : f.step + 1 }));
	if (a.json) return { code, out: json({ mapping: mapping.name, findings: numbered }), err: '' };
	const lines = findings.map(
		(f) =>
			`  ${f.rule.padEnd(24)} binding ${f.binding + 1}${f.step !== null ? `, step ${f.step + 1}` : ''}: ${f.message}`
	);
	return { code, out: [`${mapping.name}: ${count(findings.length, 'finding')}`, ...lines].join('\n'), err: '' };
}

function verify(a: Args): CliResult {
	const mapping = loadMapping(need(a.files[0], 'a mapping file'));
	const groups: [string, string[]][] = a.inputs
		? [['inputs', a.inputs]]
		: (a.group ? [a.group] : groupIds(mapping)).map((g) => [g, groupInputs(mapping, g)]);
	for (const [g, inputs] of groups) if (!inputs.length) throw new Usage(`no binding belongs to group "${g}"`);
	let results: { group: string; inputs: string[]; result: VerifyResult }[];
	try {
		results = groups.map(([group, inputs]) => ({ group, inputs, result: verifyGroupSync(mapping, inputs) }));
	} catch (e) {
		throw new Usage((e as Error).message);
	}
	const code = results.some((r) => !r.result.ok) ? 1 : 0;
	if (a.json) {
		const groups = results.map(({ result: { finding, ...r }, ...g }) => ({
			...g,
			result: { ...r, ...(finding && { finding: numberedFinding(finding) }) }
		}));
		return { code, out: json({ mapping: mapping.name, groups }), err: '' };
	}
	if (!results.length)
		return { code, out: `${mapping.name}: no hold groups to verify (name inputs with --inputs)`, err: '' };
	const out = results.flatMap(({ group, inputs, result: r }) => {
		const head = `${group} (${inputs.length} inputs): `;
		const how = `${count(r.statesExplored, 'state')}, ${count(r.padsFolded, 'pad')} folded`;
		if (r.ok) return [`${head}proved for ${r.scope} (${how})`];
		if (r.status !== 'broken') return [`${head}${r.status === 'too-big' ? 'too big to check' : r.status} (${how})`];
		return [
			`${head}broken — shortest sequence (${r.counterexample!.length} events):`,
			...r.counterexample!.map((e, i) => `  ${i + 1}. ${e.type} ${e.input} at ${ms(e.t)}`),
			r.finding ? `  ${FINDING_INFO[r.finding.kind].label}: ${r.finding.message}` : '  (no finding on replay)'
		];
	});
	return { code, out: out.join('\n'), err: '' };
}

function replayCommand(a: Args): CliResult {
	const mapping = loadMapping(need(a.files[0], 'a mapping file'));
	const session = loadSession(need(a.files[1], 'a session file'), mapping);
	const { events, indexes } = sessionEvents(session);
	const options = sessionReplay(mapping, session);
	const timeline = replay(mapping, events, options);
	// Findings point at session events, so a reader can find them in the recording.
	const findings: Finding[] = analyze(mapping, events, options).map((f) => ({ ...f, event: indexes[f.event] }));
	const code = findings.length ? 1 : 0;
	// Session events are numbered from 1 in JSON as in text.
	const number = (k: number | null) => (k === null || k < 0 ? null : indexes[k] + 1);
	if (a.json)
		return {
			code,
			out: json({
				mapping: mapping.name,
				events: session.events.length,
				findings: findings.map(numberedFinding),
				audible: timeline.audible.map((iv) => ({
					...iv,
					startEvent: number(iv.startEvent),
					endEvent: number(iv.endEvent)
				})),
				clamps: timeline.clamps.length
			}),
			err: ''
		};
	const lines = findings.map(
		(f) =>
			`  ${FINDING_INFO[f.kind].label.padEnd(15)} ${ms(f.start)} – ${ms(f.end)}  event ${f.event + 1}: ${f.message}`
	);
	const head = `${mapping.name}: ${session.events.length} events, ${count(timeline.audible.length, 'audible stretch', 'audible stretches')}, ${count(findings.length, 'finding')}`;
	return { code, out: [head, ...lines].join('\n'), err: '' };
}

const fmt = (v: number | null, unit = ' ms') => (v === null ? '–' : `${v.toFixed(1)}${unit}`);

function scoreCommand(a: Args): CliResult {
	const drill = loadDrill(need(a.files[0], 'a drill file'));
	const mapping = loadMapping(need(a.files[1], 'a mapping file'));
	const session = loadSession(need(a.files[2], 'a session file'), mapping);
	const s = scoreSummary(scoreDrill(drill, mapping, session));
	const code = s.pass ? 0 : 1;
	if (a.json) return { code, out: json({ drill: drill.name, mapping: mapping.name, ...s }), err: '' };
	const kinds = Object.entries(s.findingKinds).map(([k, n]) => `${n} ${k}`);
	const out = [
		`${drill.name} on ${mapping.name}: ${s.pass ? 'passed' : 'not passed'}`,
		`  hits ${s.hits} of ${s.hits + s.misses} (${(s.hitRate * 100).toFixed(1)} %), misses ${s.misses}, extras ${s.extras}`,
		`  timing: mean ${fmt(s.meanSignedMs)} (negative = early), mean |error| ${fmt(s.meanAbsMs)}, median ${fmt(s.medianAbsMs)}, p95 ${fmt(s.p95AbsMs)}`,
		`  hold length: mean |error| ${fmt(s.holdMeanAbsMs)}`,
		`  findings: ${s.findings}${kinds.length ? ` (${kinds.join(', ')})` : ''}; allowed ${drill.pass.findings}, pass mark ${(drill.pass.hitRate * 100).toFixed(0)} % hits`
	];
	return { code, out: out.join('\n'), err: '' };
}

const count = (n: number, one: string, many = `${one}s`) => `${n} ${n === 1 ? one : many}`;

function need(v: string | undefined, what: string): string {
	if (!v) throw new Usage(`missing ${what}`);
	return v;
}

export function runCli(argv: string[]): CliResult {
	notices = [];
	const r = run(argv);
	return notices.length ? { ...r, err: [...notices, ...(r.err ? [r.err] : [])].join('\n') } : r;
}

function run(argv: string[]): CliResult {
	try {
		const a = parseArgs(argv);
		if (a.help || !a.command) return { code: a.help ? 0 : 2, out: a.help ? HELP : '', err: a.help ? '' : HELP };
		if (a.command === 'lint') return lint(a);
		if (a.command === 'verify') return verify(a);
		if (a.command === 'replay') return replayCommand(a);
		if (a.command === 'score') return scoreCommand(a);
		throw new Usage(`unknown command "${a.command}"`);
	} catch (e) {
		if (e instanceof Unreadable) {
			const lines = e.problems.map((p) => `  ${p.path}: ${p.message}`);
			return { code: 2, out: '', err: [`${e.file} can't be read:`, ...lines].join('\n') };
		}
		if (e instanceof Usage) return { code: 2, out: '', err: `${e.message}\n\n${HELP}` };
		throw e;
	}
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
	const r = runCli(process.argv.slice(2));
	if (r.out) process.stdout.write(r.out + '\n');
	if (r.err) process.stderr.write(r.err + '\n');
	process.exitCode = r.code;
}
