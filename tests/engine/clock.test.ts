import { describe, expect, it } from 'vitest';
import { beatAt, constantClock, gridLine, timeAtBeat, withTempo } from '$lib/engine/clock';

// Check values: REFERENCES.md tempo arithmetic — a beat lasts 60000 / BPM ms (500 ms at 120, 1000 at 60).
describe('beat clock', () => {
	const changed = {
		zero: 250,
		tempos: [
			{ at: 0, bpm: 120 },
			{ at: 1250, bpm: 60 }
		]
	};

	it('counts beats from its zero across a tempo change', () => {
		expect(beatAt(changed, 250)).toBe(0);
		expect(beatAt(changed, 1250)).toBe(2);
		expect(beatAt(changed, 2250)).toBe(3);
		expect(beatAt(changed, 0)).toBe(-0.5);
	});

	it('turns beats back into times', () => {
		for (const beat of [-0.5, 0, 1.5, 2, 3.25]) expect(timeAtBeat(changed, beat)).toBeCloseTo(beatTime(beat), 9);
	});

	it('finds grid lines on either side of a tempo change, none before beat 0', () => {
		expect(gridLine(changed, 300, '1/4')).toBe(750);
		expect(gridLine(changed, 1300, '1/8')).toBe(1750);
		expect(gridLine(changed, 100, '1/16')).toBe(250);
	});

	it('keeps the beat where it is when the tempo changes', () => {
		const c = withTempo(constantClock(120, 0), 90, 1000);
		expect(beatAt(c, 1000)).toBe(2);
		expect(beatAt(c, 1000 + 60000 / 90)).toBeCloseTo(3, 9);
		expect(withTempo(constantClock(120, 0), 60, 0)).toEqual(constantClock(60, 0));
	});
});

function beatTime(beat: number): number {
	return beat <= 2 ? 250 + beat * 500 : 1250 + (beat - 2) * 1000;
}
