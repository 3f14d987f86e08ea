import { describe, expect, it } from 'vitest';
import * as M from '../../src/lib/audio/measure';

const RATE = 48000;

describe('measurements', () => {
	it('finds the period of a repeated noise slice by autocorrelation', () => {
		// 125 ms slice (1/16 at 120 BPM, tempo arithmetic) repeated: the peak must sit at 6000 frames.
		const slice = M.seededNoise(6000, 3);
		const x = new Float32Array(6000 * 8).map((_, i) => slice[i % 6000]);
		const { lag, score } = M.autocorrelationPeriod(x, 2400, 9600, 0, 24000);
		expect(lag).toBeCloseTo(6000, 3);
		expect(score).toBeCloseTo(1, 6);
	});

	it('does not find a period in plain noise', () => {
		const { score } = M.autocorrelationPeriod(M.seededNoise(RATE), 2400, 9600, 0, 24000);
		expect(score).toBeLessThan(0.1);
	});

	it('measures a chopped envelope period between hops', () => {
		// Gate at 1/8, 120 BPM: 250 ms period (tempo arithmetic); open the first half of each.
		const noise = M.seededNoise(RATE * 2, 4);
		const gated = noise.map((v, i) => (i % 12000 < 6000 ? v : 0));
		const env = M.centred(M.energyEnvelope(gated, 48));
		const { lag } = M.autocorrelationPeriod(env, 100, 400, 0, env.length - 400);
		expect(Math.abs(lag - 250)).toBeLessThan(0.5);
	});

	it('reports sample-identical buffers as −∞ dB apart and scales differences in dBFS', () => {
		const a = Float32Array.from([0.1, 0.2, 0.3]);
		expect(M.maxDifferenceDb(a, a.slice())).toBe(-Infinity);
		expect(M.maxDifferenceDb(a, Float32Array.from([0.1, 0.2, 0.2]))).toBeCloseTo(-20, 4); // 0.1 = −20 dBFS
	});

	it('finds the first sample above a threshold and the largest in a range', () => {
		const x = Float32Array.from([0, 0.01, -0.6, 0.9, 0.2]);
		expect(M.firstAbove(x, 0.5)).toBe(2);
		expect(M.argPeak(x)).toBe(3);
		expect(M.firstAbove(x, 1)).toBe(-1);
		expect(M.peak(x)).toBeCloseTo(0.9, 6);
	});

	it('makes the same noise for the same seed', () => {
		expect(Array.from(M.seededNoise(5, 7))).toEqual(Array.from(M.seededNoise(5, 7)));
		expect(Array.from(M.seededNoise(5, 7))).not.toEqual(Array.from(M.seededNoise(5, 8)));
	});
});
