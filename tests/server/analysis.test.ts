import {
	analyze,
	demoMapping,
	padId,
	parseDrill,
	scoreDrill,
	sessionEvents,
	sessionFromEvents,
	type SessionDocument,
	type SessionEvent
} from '$lib/engine';
import { countFindingsOffThread, scoreOffThread, stopAnalysisWorkers } from '$lib/server/analysis/pool';
import { afterAll, describe, expect, it } from 'vitest';

afterAll(() => stopAnalysisWorkers());

const press = (t: number, pad: number): SessionEvent => ({ t, input: { input: padId(pad), type: 'press' } });
const release = (t: number, pad: number): SessionEvent => ({ t, input: { input: padId(pad), type: 'release' } });

function session(events: SessionEvent[]): SessionDocument {
	return { ...sessionFromEvents([], 120, '2026-12-01T20:00:00Z'), events };
}

describe('whole-session analysis in a worker thread', () => {
	it('counts the same findings as the engine on this thread', { timeout: 60_000 }, async () => {
		const mapping = demoMapping('broken-row');
		// Chords on the broken top row (pads 13–16): each press-press-release cuts the held effect.
		const events = Array.from({ length: 40 }, (_, i) => [
			press(i * 1000, 13),
			press(i * 1000 + 100, 14),
			release(i * 1000 + 300, 13),
			release(i * 1000 + 600, 14)
		]).flat();
		const doc = session(events);
		const here = analyze(mapping, sessionEvents(doc).events, { tempo: 120 }).length;
		expect(here).toBeGreaterThan(0);
		expect(await countFindingsOffThread({ mapping, session: doc })).toBe(here);
	});

	it('answers many jobs at once, each with its own count', { timeout: 60_000 }, async () => {
		const mapping = demoMapping('broken-row');
		const docs = Array.from({ length: 12 }, (_, n) =>
			session(
				Array.from({ length: n }, (_, i) => [
					press(i * 1000, 13),
					press(i * 1000 + 100, 14),
					release(i * 1000 + 300, 13)
				])
					.flat()
					.concat(n ? [release(n * 1000, 14)] : [])
			)
		);
		const expected = docs.map((d) => analyze(mapping, sessionEvents(d).events, { tempo: 120 }).length);
		expect(await Promise.all(docs.map((d) => countFindingsOffThread({ mapping, session: d })))).toEqual(expected);
	});

	it('refuses a broken job with an error and keeps working', { timeout: 60_000 }, async () => {
		const mapping = demoMapping('two-deck');
		await expect(countFindingsOffThread({ mapping, session: null as never })).rejects.toThrow();
		expect(await countFindingsOffThread({ mapping, session: session([press(0, 1), release(100, 1)]) })).toBe(0);
	});
});

describe('scoring a take in a worker thread', () => {
	it('gives the same score as the engine on this thread', { timeout: 60_000 }, async () => {
		const mapping = demoMapping('two-deck');
		// Pads 1–4 on every beat of 16 bars at 120 BPM (a beat is 500 ms), played a little late and early.
		const parsed = parseDrill({
			version: 1,
			name: 'Steady row',
			tempo: 120,
			countInBars: 1,
			lengthBars: 16,
			targets: Array.from({ length: 64 }, (_, i) => ({ input: padId(1 + (i % 4)), beat: i, beats: 0.5 }))
		});
		if (!parsed.ok) throw new Error(JSON.stringify(parsed.problems));
		const zero = 2000;
		const take = session(
			Array.from({ length: 60 }, (_, i) => {
				const t = zero + i * 500 + ((i % 5) - 2) * 9;
				return [press(t, 1 + (i % 4)), release(t + 240, 1 + (i % 4))];
			}).flat()
		);
		const here = scoreDrill(parsed.drill, mapping, take, { zero });
		expect(here.hits).toBe(60);
		expect(await scoreOffThread({ drill: parsed.drill, mapping, session: take, zero })).toEqual(here);
	});
});
