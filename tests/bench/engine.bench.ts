// Engine speed: applyEvent throughput and per-event p99 on the 16-pad two-deck demo mapping, and
// the server-side analysis of a 100,000-event session (time and heap growth). Measures only.
import { setFlagsFromString } from 'node:v8';
import { runInNewContext } from 'node:vm';
import { analyze } from '../../src/lib/engine/analyze';
import { demoMapping } from '../../src/lib/engine/demo';
import { applyEvent, initialRigState } from '../../src/lib/engine/rig';
import { parseSession, sessionEvents, sessionFromEvents } from '../../src/lib/engine/session';
import type { InputEvent } from '../../src/lib/engine/types';
import type { Figure } from './run';

/**
 * Plausible play with a fixed seed: chords on the stutter row, one-press pads one at a time (a
 * second one-press pad while one is held would be a real dropout: they share rack 1).
 */
function rehearsal(n: number): InputEvent[] {
	let seed = 12345;
	const rand = () => (seed = (seed * 1103515245 + 12345) & 0x7fffffff) / 0x7fffffff;
	const held = new Set<string>();
	const events: InputEvent[] = [];
	let t = 0;
	let onePress: string | null = null;
	while (events.length < n) {
		const row = rand() < 0.7;
		const input: string = row
			? `pad-${13 + Math.floor(rand() * 4)}`
			: (onePress ?? `pad-${1 + Math.floor(rand() * 12)}`);
		if (!row) onePress = held.has(input) ? null : input;
		t += 5 + Math.floor(rand() * 120);
		events.push({ t, input, type: held.has(input) ? 'release' : 'press' });
		if (held.has(input)) held.delete(input);
		else held.add(input);
	}
	return events;
}

function getGc(): (() => void) | undefined {
	try {
		setFlagsFromString('--expose-gc');
		return runInNewContext('gc') as () => void;
	} catch {
		return undefined;
	}
}

export default async function (report: (f: Figure) => void) {
	const mapping = demoMapping('two-deck');
	const events = rehearsal(400_000);

	// Warm up the JIT before measuring.
	let s = initialRigState(mapping);
	for (let i = 0; i < 50_000; i++) s = applyEvent(mapping, s, events[i], i).state;

	s = initialRigState(mapping);
	const start = performance.now();
	for (let i = 0; i < events.length; i++) s = applyEvent(mapping, s, events[i], i).state;
	const elapsed = performance.now() - start;
	report({ name: 'engine.events_per_s', value: Math.round(events.length / (elapsed / 1000)), unit: 'events/s' });

	const per = new Float64Array(100_000);
	s = initialRigState(mapping);
	for (let i = 0; i < per.length; i++) {
		const t0 = process.hrtime.bigint();
		s = applyEvent(mapping, s, events[i], i).state;
		per[i] = Number(process.hrtime.bigint() - t0) / 1000;
	}
	per.sort();
	report({ name: 'engine.event_p99_us', value: Number(per[Math.floor(per.length * 0.99)].toFixed(2)), unit: 'us' });

	const doc = JSON.parse(JSON.stringify(sessionFromEvents(rehearsal(100_000), 124)));
	const gc = getGc();
	gc?.();
	const heap0 = process.memoryUsage().heapUsed;
	const a0 = performance.now();
	const parsed = parseSession(doc);
	if (!parsed.ok) throw new Error('bench session did not parse');
	const findings = analyze(mapping, sessionEvents(parsed.session).events);
	const a1 = performance.now();
	const heap1 = process.memoryUsage().heapUsed;
	report({ name: 'replay.analyze_100k_ms', value: Math.round(a1 - a0), unit: 'ms' });
	report({ name: 'replay.analyze_100k_mb', value: Number(((heap1 - heap0) / 2 ** 20).toFixed(1)), unit: 'MB' });
	if (findings.length !== 0) throw new Error(`the bench session should play clean, got ${findings[0].message}`);
}
