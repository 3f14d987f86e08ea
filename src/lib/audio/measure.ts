// Measurements on rendered sample buffers, used by the browser tests and the benchmark.
// Pure functions over Float32Array / number arrays; nothing here touches Web Audio.

export type Samples = ArrayLike<number>;

export function peak(x: Samples, from = 0, to = x.length): number {
	let p = 0;
	for (let i = from; i < to; i++) p = Math.max(p, Math.abs(x[i]));
	return p;
}

export function rms(x: Samples, from = 0, to = x.length): number {
	let sum = 0;
	for (let i = from; i < to; i++) sum += x[i] * x[i];
	return to > from ? Math.sqrt(sum / (to - from)) : 0;
}

export function toDb(v: number): number {
	return v > 0 ? 20 * Math.log10(v) : -Infinity;
}

/** Largest sample difference in dB full scale; −Infinity when the two are sample-identical. */
export function maxDifferenceDb(a: Samples, b: Samples): number {
	const n = Math.min(a.length, b.length);
	let d = 0;
	for (let i = 0; i < n; i++) d = Math.max(d, Math.abs(a[i] - b[i]));
	return toDb(d);
}

/** Index of the first sample at or after `from` whose magnitude exceeds `threshold`; −1 if none. */
export function firstAbove(x: Samples, threshold: number, from = 0): number {
	for (let i = Math.max(0, from); i < x.length; i++) if (Math.abs(x[i]) > threshold) return i;
	return -1;
}

/** Index of the largest magnitude in [from, to). */
export function argPeak(x: Samples, from = 0, to = x.length): number {
	let best = from;
	for (let i = from; i < to; i++) if (Math.abs(x[i]) > Math.abs(x[best])) best = i;
	return best;
}

/** Sample-by-sample difference a − b. */
export function difference(a: Samples, b: Samples): Float32Array {
	const n = Math.min(a.length, b.length);
	const out = new Float32Array(n);
	for (let i = 0; i < n; i++) out[i] = a[i] - b[i];
	return out;
}

/**
 * Period of a signal by normalized autocorrelation: the lag (in samples, refined by parabolic
 * interpolation) with the highest correlation between minLag and maxLag, over `x[from, to)`.
 */
export function autocorrelationPeriod(
	x: Samples,
	minLag: number,
	maxLag: number,
	from = 0,
	to = x.length - maxLag
): { lag: number; score: number } {
	const scores = new Float64Array(maxLag + 2);
	let energy = 0;
	for (let i = from; i < to; i++) energy += x[i] * x[i];
	let best = minLag;
	for (let lag = Math.max(1, minLag - 1); lag <= maxLag + 1; lag++) {
		let sum = 0;
		let lagged = 0;
		for (let i = from; i < to; i++) {
			sum += x[i] * x[i + lag];
			lagged += x[i + lag] * x[i + lag];
		}
		scores[lag] = sum / (Math.sqrt(energy * lagged) || 1);
		if (lag >= minLag && lag <= maxLag && scores[lag] > scores[best]) best = lag;
	}
	const [a, b, c] = [scores[best - 1], scores[best], scores[best + 1]];
	const denominator = a - 2 * b + c;
	const shift = denominator !== 0 ? (0.5 * (a - c)) / denominator : 0;
	return { lag: best + Math.max(-0.5, Math.min(0.5, shift)), score: b };
}

/** RMS energy envelope: one value per `hop` samples over windows of `hop` samples. */
export function energyEnvelope(x: Samples, hop: number, from = 0, to = x.length): Float32Array {
	const n = Math.floor((to - from) / hop);
	const out = new Float32Array(n);
	for (let k = 0; k < n; k++) out[k] = rms(x, from + k * hop, from + (k + 1) * hop);
	return out;
}

/** Subtracts the mean, so autocorrelation of an envelope finds its modulation, not its offset. */
export function centred(x: Samples): Float32Array {
	let mean = 0;
	for (let i = 0; i < x.length; i++) mean += x[i];
	mean /= x.length || 1;
	return Float32Array.from(x, (v) => v - mean);
}

/** Deterministic white noise in −1..1 (a small linear congruential generator). */
export function seededNoise(length: number, seed = 1): Float32Array {
	const out = new Float32Array(length);
	let s = seed >>> 0 || 1;
	for (let i = 0; i < length; i++) {
		s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
		out[i] = s / 2147483648 - 1;
	}
	return out;
}
