import { describe, expect, it } from 'vitest';
import { dbToGain, equalPowerGains, gainToDb } from '../../src/lib/audio/mix';

describe('equal-power gains', () => {
	// Web Audio API equal-power law (StereoPannerNode): cos(x·π/2), sin(x·π/2); midpoint 0.70711.
	it.each([
		[0, 1, 0],
		[0.25, 0.92388, 0.38268],
		[0.5, 0.70711, 0.70711],
		[1, 0, 1]
	])('at mix %f gives dry %f and wet %f', (mix, dry, wet) => {
		const g = equalPowerGains(mix);
		expect(g.dry).toBeCloseTo(dry, 5);
		expect(g.wet).toBeCloseTo(wet, 5);
	});

	it('keeps the summed power at 1 everywhere between', () => {
		for (let m = 0; m <= 1; m += 0.05) {
			const g = equalPowerGains(m);
			expect(g.dry ** 2 + g.wet ** 2).toBeCloseTo(1, 12);
		}
	});

	it('is exact at the ends so a rack at 0 or 1 is sample-identical to one path', () => {
		expect(equalPowerGains(0)).toEqual({ dry: 1, wet: 0 });
		expect(equalPowerGains(1)).toEqual({ dry: 0, wet: 1 });
		expect(equalPowerGains(-3)).toEqual({ dry: 1, wet: 0 });
	});
});

describe('decibels', () => {
	// −3.0103 dB is the equal-power midpoint (Web Audio API: cos(π/4) = 0.70711 = −3.01 dB).
	it('converts both ways', () => {
		expect(gainToDb(Math.SQRT1_2)).toBeCloseTo(-3.0103, 4);
		expect(dbToGain(-12)).toBeCloseTo(0.251189, 6);
		expect(gainToDb(0)).toBe(-Infinity);
	});
});
