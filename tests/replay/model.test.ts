import { describe, expect, it } from 'vitest';
import { buildReplay, changesBetween, EMPTY_PLOT_MS, eventAt, padLanes } from '$lib/replay/model';
import type { RigChange } from '$lib/engine';
import { brokenRow, chord, press, release, sessionOf, twoDeck } from './factories';

describe('buildReplay', () => {
	// Check value: common practice of the trade (DESIGN.md §1) — a row of plain momentary pads cuts
	// out when the first of two fingers lifts; a row with a held-pad counter keeps sounding.
	it('finds the dropout of the broken row at the release of the first finger', () => {
		const model = buildReplay(brokenRow(), sessionOf(chord()));
		expect(model.findings.map((f) => [f.kind, f.start, f.end, f.event])).toEqual([['dropout', 1500.25, 2000, 2]]);
	});

	it('finds nothing for the same chord on the two-deck set', () => {
		expect(buildReplay(twoDeck(), sessionOf(chord())).findings).toEqual([]);
	});

	it('draws one held span per press, from press to release, labelled from the profile', () => {
		const model = buildReplay(brokenRow(), sessionOf(chord()));
		expect(model.pads.map((p) => [p.label, p.detail, p.spans.map((s) => [s.start, s.end])])).toEqual([
			['Pad 13', 'Stutter 1/4', [[1000, 1500.25]]],
			['Pad 14', 'Stutter 1/8', [[1200, 2000]]]
		]);
	});

	it('gives the silenced rack its audible lane, cut at the release', () => {
		const model = buildReplay(brokenRow(), sessionOf(chord()));
		expect(model.audible.map((a) => [a.rack, a.deck, a.intervals.map((i) => [i.start, i.end])])).toEqual([
			[2, 'A', [[1000, 1500.25]]]
		]);
	});

	it('steps the held counter up and down with the fingers, scaled to its peak', () => {
		const model = buildReplay(twoDeck(), sessionOf(chord()));
		expect(model.counters[0].peak).toBe(2);
		expect(model.counters.map((c) => [c.id, c.steps.map((s) => [s.t, s.value])])).toEqual([
			[
				'held',
				[
					[0, 0],
					[1000, 1],
					[1200, 2],
					[1500.25, 1],
					[2000, 0]
				]
			]
		]);
	});

	it('leaves unmapped messages out of the replay but keeps the index back to the session', () => {
		const session = sessionOf(chord(), [{ t: 1100, midi: [0xb0, 7, 64], input: null }]);
		const model = buildReplay(brokenRow(), session);
		expect(model.events).toHaveLength(4);
		expect(model.indexes).toEqual([0, 2, 3, 4]);
		expect(session.events[model.indexes[model.findings[0].event]].input).toEqual({ input: 'pad-13', type: 'release' });
	});

	it('still draws the pads of a session whose mapping is gone, with no findings', () => {
		const model = buildReplay(null, sessionOf(chord()));
		expect(model.pads.map((p) => p.label)).toEqual(['pad-13', 'pad-14']);
		expect([model.findings, model.audible, model.counters, model.timeline]).toEqual([[], [], [], null]);
	});

	it('shows a little past the last event', () => {
		expect(buildReplay(brokenRow(), sessionOf(chord())).duration).toBe(2500);
	});

	it('gives one length: the last event, and 0 for a session with no events', () => {
		expect(buildReplay(brokenRow(), sessionOf(chord())).length).toBe(2000);
		const empty = buildReplay(brokenRow(), sessionOf([]));
		expect(empty.length).toBe(0);
		expect(empty.duration).toBe(EMPTY_PLOT_MS);
	});
});

describe('padLanes', () => {
	it('leaves a span open when its pad is never released', () => {
		expect(padLanes(null, [press(10, 'a')])[0].spans).toEqual([
			{ start: 10, end: null, pressEvent: 0, releaseEvent: null }
		]);
	});

	it('ignores a release with no press before it', () => {
		expect(padLanes(null, [release(10, 'a')])[0].spans).toEqual([]);
	});
});

describe('changesBetween', () => {
	const change = (t: number): RigChange => ({ t, event: t, path: 'racks.0.on', from: false, to: true });
	const changes = [change(100), change(200), change(200), change(300)];

	it('takes changes after the start and up to and including the end', () => {
		expect(changesBetween(changes, 100, 200).map((c) => c.t)).toEqual([200, 200]);
		expect(changesBetween(changes, 99, 300).map((c) => c.t)).toEqual([100, 200, 200, 300]);
		expect(changesBetween(changes, 300, 400)).toEqual([]);
	});
});

describe('eventAt', () => {
	it('finds the latest event at or before a time', () => {
		const events = [{ t: 10 }, { t: 20 }, { t: 20 }, { t: 30 }];
		expect([eventAt(events, 5), eventAt(events, 10), eventAt(events, 25), eventAt(events, 99)]).toEqual([-1, 0, 2, 3]);
	});
});
