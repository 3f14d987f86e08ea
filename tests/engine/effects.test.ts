import { describe, expect, it } from 'vitest';
import {
	EFFECTS,
	divisionFraction,
	divisionFromValue,
	divisionMs,
	divisionValue,
	msPerBeat,
	nextGridLine,
	paramForDivision
} from '$lib/engine/effects';
import { EFFECT_IDS } from '$lib/engine/types';

// Check values: REFERENCES.md "Tempo arithmetic" table (common practice; formula
// ms = whole-note fraction × 240000 / BPM, every production handbook).
describe('tempo math', () => {
	it.each([
		[120, 500],
		[128, 468.75]
	])('a beat at %i BPM lasts %f ms', (bpm, ms) => {
		expect(msPerBeat(bpm)).toBe(ms);
	});

	it.each([
		[120, '1/4', 500],
		[120, '1/8', 250],
		[120, '1/8.', 375],
		[120, '1/16', 125],
		[120, '1/8t', 166.667],
		[120, '1/4t', 333.333],
		[120, '1/16t', 83.333],
		[120, '1/1', 2000],
		[128, '1/4', 468.75],
		[128, '1/8', 234.375],
		[128, '1/8.', 351.5625],
		[128, '1/16', 117.1875],
		[128, '1/8t', 156.25],
		[128, '1/4t', 312.5],
		[128, '1/16t', 78.125],
		[128, '1/1', 1875]
	])('at %i BPM a %s lasts %f ms', (bpm, division, ms) => {
		expect(divisionMs(division, bpm)).toBeCloseTo(ms, 3);
	});

	it('refuses something that is not a note value', () => {
		expect(() => divisionFraction('eighth')).toThrow(/note value/);
	});

	it('finds the next grid line at or after a time', () => {
		// 1/16 at 120 BPM = 125 ms (REFERENCES.md table).
		expect(nextGridLine(1010, '1/16', 120)).toBe(1125);
		expect(nextGridLine(1125, '1/16', 120)).toBe(1125);
		expect(nextGridLine(1010, '1/4', 120, 20)).toBe(1020);
	});
});

describe('beat-synced parameters', () => {
	const slices = ['1/4', '1/8', '1/16', '1/32'];

	it.each([
		[0, '1/4'],
		[0.24, '1/4'],
		[0.25, '1/8'],
		[0.6, '1/16'],
		[0.99, '1/32'],
		[1, '1/32']
	])('value %f picks %s', (v, d) => {
		expect(divisionFromValue(slices, v)).toBe(d);
	});

	it('maps each division to the middle of its band and back', () => {
		for (const d of slices) expect(divisionFromValue(slices, divisionValue(slices, d))).toBe(d);
		expect(paramForDivision('stutter', 1, '1/16')).toBe(0.625);
	});

	it('refuses a division on a parameter that is not beat-synced', () => {
		expect(() => paramForDivision('reverb', 1, '1/8')).toThrow(/not beat-synced/);
	});

	it('describes every effect with three parameters whose defaults are 0..1', () => {
		for (const id of EFFECT_IDS) {
			expect(EFFECTS[id].id).toBe(id);
			expect(EFFECTS[id].params).toHaveLength(3);
			for (const p of EFFECTS[id].params) {
				expect(p.default).toBeGreaterThanOrEqual(0);
				expect(p.default).toBeLessThanOrEqual(1);
			}
		}
	});
});
