// The instruments of the demo loops, synthesized sample by sample (no files): each returns one
// mono hit or note at the given sample rate. Deterministic: noise comes from a seeded generator.
import { seededNoise } from '../measure';

export function kick(rate: number): Float32Array {
	const out = new Float32Array(Math.round(0.45 * rate));
	let phase = 0;
	for (let i = 0; i < out.length; i++) {
		const t = i / rate;
		phase += (2 * Math.PI * (46 + 130 * Math.exp(-t / 0.03))) / rate;
		out[i] = Math.sin(phase) * Math.exp(-t / 0.22) * Math.min(1, i / 16);
	}
	return out;
}

export function snare(rate: number): Float32Array {
	const noise = seededNoise(Math.round(0.25 * rate), 7);
	let last = 0;
	return noise.map((n, i) => {
		const t = i / rate;
		const bright = n - last;
		last = n;
		return 0.5 * bright * Math.exp(-t / 0.07) + 0.45 * Math.sin(2 * Math.PI * 185 * t) * Math.exp(-t / 0.06);
	});
}

export function clap(rate: number): Float32Array {
	const noise = seededNoise(Math.round(0.3 * rate), 11);
	let low = 0;
	return noise.map((n, i) => {
		const t = i / rate;
		low += 0.25 * (n - low);
		const burst = t < 0.03 ? Math.exp(-((t % 0.01) / 0.003)) : Math.exp(-(t - 0.03) / 0.08);
		return 0.7 * (n - low) * burst;
	});
}

export function hat(rate: number, open = false): Float32Array {
	const noise = seededNoise(Math.round((open ? 0.35 : 0.07) * rate), open ? 5 : 3);
	const decay = open ? 0.1 : 0.018;
	let last = 0;
	return noise.map((n, i) => {
		const v = (n - last) * Math.exp(-i / rate / decay);
		last = n;
		return 0.28 * v;
	});
}

export function frequencyOf(note: number): number {
	return 440 * Math.pow(2, (note - 69) / 12);
}

/** A filtered saw with a short pluck on the filter; `seconds` long with a 10 ms release. */
export function bass(rate: number, note: number, seconds: number): Float32Array {
	const out = new Float32Array(Math.max(1, Math.round(seconds * rate)));
	const f = frequencyOf(note);
	let low = 0;
	for (let i = 0; i < out.length; i++) {
		const t = i / rate;
		const saw = 2 * ((f * t) % 1) - 1;
		const corner = 180 + 900 * Math.exp(-t / 0.08);
		low += (1 - Math.exp((-2 * Math.PI * corner) / rate)) * (saw - low);
		out[i] = 0.55 * low * release(i, out.length, rate) * Math.min(1, i / 32);
	}
	return out;
}

/** Detuned saws through a soft low-pass, slowly fading: a pad stab. */
export function chord(rate: number, notes: number[], seconds: number): Float32Array {
	const out = new Float32Array(Math.max(1, Math.round(seconds * rate)));
	const partials = notes.flatMap((n) => [frequencyOf(n) * 0.997, frequencyOf(n) * 1.003]);
	let low = 0;
	const k = 1 - Math.exp((-2 * Math.PI * 1800) / rate);
	for (let i = 0; i < out.length; i++) {
		const t = i / rate;
		let sum = 0;
		for (const f of partials) sum += 2 * ((f * t + f * 0.0137) % 1) - 1;
		low += k * (sum / partials.length - low);
		out[i] = 0.5 * low * Math.exp(-t / 1.2) * release(i, out.length, rate) * Math.min(1, i / 200);
	}
	return out;
}

function release(i: number, length: number, rate: number): number {
	const tail = Math.round(0.01 * rate);
	return i > length - tail ? (length - i) / tail : 1;
}
