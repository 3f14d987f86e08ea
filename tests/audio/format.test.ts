import { describe, expect, it } from 'vitest';
import { formatDb, formatParam } from '../../src/lib/audio/format';
import { BeatClock } from '../../src/lib/audio/beat-clock';
import { ceilingCurve } from '../../src/lib/audio/master';
import { paramForDivision } from '../../src/lib/engine/effects';

describe('parameter readouts', () => {
	it('shows a division with its length at the tempo', () => {
		// Tempo arithmetic (REFERENCES.md): 1/8 at 128 BPM = 234.375 ms.
		expect(formatParam('echo', 0, paramForDivision('echo', 1, '1/8'), 128)).toBe('1/8 · 234 ms');
		expect(formatParam('filter', 0, 1, 120)).toBe('20.0 kHz');
		expect(formatDb(-12)).toBe('−12.0 dB');
		expect(formatDb(-Infinity)).toBe('−∞ dB');
	});
});

describe('beat clock', () => {
	it('maps time to beats across a tempo change', () => {
		const clock = new BeatClock(120, 1);
		expect(clock.beatAt(3)).toBeCloseTo(4, 9); // 120 BPM: 2 beats a second
		clock.setTempo(60, 3);
		expect(clock.beatAt(5)).toBeCloseTo(6, 9);
		expect(clock.bpmAt(2)).toBe(120);
		expect(clock.bpmAt(4)).toBe(60);
	});
});

describe('master ceiling curve', () => {
	const curve = ceilingCurve(8193);
	const at = (x: number) => curve[Math.round(((x / 16 + 1) / 2) * 8192)];

	it('is exactly linear below −3 dBFS', () => {
		expect(at(0.5)).toBeCloseTo(0.5, 6);
		expect(at(-0.25)).toBeCloseTo(-0.25, 6);
	});

	it('never reaches −1 dBFS however hard it is driven (issue 4: limiter at −1 dBFS)', () => {
		const ceiling = Math.pow(10, -1 / 20);
		for (const v of curve) expect(Math.abs(v)).toBeLessThanOrEqual(ceiling);
		expect(at(16)).toBeGreaterThan(0.89);
	});
});
