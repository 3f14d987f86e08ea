// Drill scoring speed: a 10-minute drill at 120 BPM (300 bars) with 2,000 target presses on four
// one-press pads, played with seeded timing jitter, some misses and some extra presses. The
// figure is the median of five runs of the whole score (matching and the replay for findings).
// Measures only.
import { demoMapping } from '../../src/lib/engine/demo';
import { parseDrill, scoreDrill } from '../../src/lib/engine/score';
import { sessionFromEvents } from '../../src/lib/engine/session';
import type { InputEvent } from '../../src/lib/engine/types';
import type { Figure } from './run';

export default async function (report: (f: Figure) => void) {
	let seed = 4242;
	const rand = () => (seed = (seed * 1103515245 + 12345) & 0x7fffffff) / 0x7fffffff;
	const tempo = 120;
	const beatMs = 60_000 / tempo;
	const lengthBars = 300; // 1,200 beats at 120 BPM = 10 minutes
	// 2,000 targets spread over 1,200 beats on the eighth-note grid, each a quarter of a beat long.
	const slots = Array.from({ length: lengthBars * 8 }, (_, i) => i / 2).filter(() => rand() < 2000 / 2400);
	const targets = slots
		.slice(0, 2000)
		.map((beat) => ({ input: `pad-${1 + Math.floor(rand() * 4)}`, beat, beats: 0.25 }));
	while (targets.length < 2000) targets.push({ input: 'pad-1', beat: lengthBars * 4 - 0.5, beats: 0.25 });
	const parsed = parseDrill({ version: 1, name: 'Ten minutes', tempo, countInBars: 1, lengthBars, targets });
	if (!parsed.ok) throw new Error(JSON.stringify(parsed.problems.slice(0, 3)));
	const drill = parsed.drill;
	const events: InputEvent[] = [];
	for (const t of drill.targets) {
		if (rand() < 0.05) continue; // missed
		const at = Math.max(0, t.beat * beatMs + (rand() - 0.5) * 90);
		events.push({ t: at, input: t.input, type: 'press' });
		events.push({ t: at + t.beats * beatMs * (0.7 + rand() * 0.5), input: t.input, type: 'release' });
		if (rand() < 0.05) {
			events.push({ t: at + 40, input: t.input, type: 'press' }); // a double press
			events.push({ t: at + 60, input: t.input, type: 'release' });
		}
	}
	events.sort((a, b) => a.t - b.t);
	const session = sessionFromEvents(events, tempo);
	const mapping = demoMapping('two-deck');
	const times: number[] = [];
	let hits = 0;
	for (let run = 0; run < 5; run++) {
		const t0 = performance.now();
		hits = scoreDrill(drill, mapping, session).hits;
		times.push(performance.now() - t0);
	}
	if (hits < 1500) throw new Error(`expected most targets hit, got ${hits}`);
	times.sort((a, b) => a - b);
	report({ name: 'score.drill_ms', value: Math.round(times[2] * 10) / 10, unit: 'ms' });
}
