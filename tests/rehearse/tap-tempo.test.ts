import { describe, expect, it } from 'vitest';
import { TapTempo } from '$lib/rehearse/tap-tempo';
import { barBeat, RoomClock } from '$lib/rehearse/room-clock';

// BPM = 60000 / ms per beat (common practice; REFERENCES.md tempo arithmetic): 500 ms → 120 BPM.
describe('TapTempo', () => {
	it('needs two taps before it names a tempo', () => {
		const taps = new TapTempo();
		expect(taps.tap(1000)).toBeNull();
		expect(taps.tap(1500)).toBe(120);
	});

	it('averages the last intervals of a run', () => {
		const taps = new TapTempo();
		let bpm: number | null = null;
		for (const t of [0, 480, 1000, 1480, 2000]) bpm = taps.tap(t); // 2000 ms over 4 beats
		expect(bpm).toBe(120);
	});

	it('starts a new run after a long pause, so an old tap never drags the tempo', () => {
		const taps = new TapTempo();
		taps.tap(0);
		taps.tap(500);
		expect(taps.tap(10_000)).toBeNull();
		expect(taps.tap(10_400)).toBe(150); // 60000 / 400
	});

	it('keeps the tempo within 60–200 BPM', () => {
		const taps = new TapTempo();
		taps.tap(0);
		expect(taps.tap(100)).toBe(200);
	});
});

describe('RoomClock', () => {
	it('keeps the beat position when the tempo changes', () => {
		const clock = new RoomClock(120); // 500 ms a beat
		expect(clock.beatAt(2250)).toBe(4.5);
		clock.retime(90, 2250);
		expect(clock.beatAt(2250)).toBeCloseTo(4.5, 9);
		// At 90 BPM a beat lasts 60000 / 90 ms.
		expect(clock.timeOfBeat(5.5) - 2250).toBeCloseTo(60000 / 90, 9);
	});

	it('counts bars of four beats from 1.1', () => {
		expect(barBeat(0)).toEqual({ bar: 1, beat: 1 });
		expect(barBeat(3.9)).toEqual({ bar: 1, beat: 4 });
		expect(barBeat(4)).toEqual({ bar: 2, beat: 1 });
		expect(barBeat(-2)).toEqual({ bar: 1, beat: 1 });
	});
});
