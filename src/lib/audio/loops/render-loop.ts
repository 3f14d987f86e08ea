// Mixes a demo loop into one stereo buffer at a given tempo: the whole loop (1–2 bars), with
// hits that run past the end wrapped to the start so it repeats seamlessly.
import type { DemoLoop, DrumLane } from './patterns';
import { bass, chord, clap, hat, kick, snare } from './voices';

const DRUMS: Record<DrumLane, { make: (rate: number) => Float32Array; pan: number }> = {
	kick: { make: kick, pan: 0 },
	snare: { make: snare, pan: 0.05 },
	clap: { make: clap, pan: -0.05 },
	hat: { make: (r) => hat(r), pan: 0.3 },
	open: { make: (r) => hat(r, true), pan: 0.3 }
};

const cache = new Map<string, Float32Array>();
function cached(key: string, make: () => Float32Array): Float32Array {
	let v = cache.get(key);
	if (!v) cache.set(key, (v = make()));
	return v;
}

export function stepSeconds(bpm: number): number {
	return 60 / bpm / 4;
}

export function loopFrames(loop: DemoLoop, bpm: number, rate: number): number {
	return Math.round(loop.bars * 16 * stepSeconds(bpm) * rate);
}

const mixes = new Map<string, [Float32Array, Float32Array]>();

/** The loop mixed at `bpm`, kept for the next deck or render that asks for the same. */
export function renderLoop(loop: DemoLoop, bpm: number, rate: number): [Float32Array, Float32Array] {
	const key = `${loop.id}@${bpm}@${rate}`;
	let mix = mixes.get(key);
	if (!mix) {
		if (mixes.size > 32) mixes.clear();
		mixes.set(key, (mix = mixLoop(loop, bpm, rate)));
	}
	return mix;
}

function mixLoop(loop: DemoLoop, bpm: number, rate: number): [Float32Array, Float32Array] {
	const frames = loopFrames(loop, bpm, rate);
	const left = new Float32Array(frames);
	const right = new Float32Array(frames);
	const step = stepSeconds(bpm) * rate;
	const add = (hit: Float32Array, at: number, gain: number, pan: number) => {
		const l = gain * Math.cos(((pan + 1) * Math.PI) / 4) * Math.SQRT2;
		const r = gain * Math.sin(((pan + 1) * Math.PI) / 4) * Math.SQRT2;
		const start = Math.round(at);
		for (let i = 0; i < hit.length; i++) {
			const j = (start + i) % frames;
			left[j] += hit[i] * l;
			right[j] += hit[i] * r;
		}
	};
	for (const [lane, pattern] of Object.entries(loop.drums) as [DrumLane, string][]) {
		const voice = DRUMS[lane];
		const hit = cached(`${lane}@${rate}`, () => voice.make(rate));
		[...pattern].forEach((c, i) => {
			if (c !== '.') add(hit, i * step, c === 'X' ? 1 : 0.65, voice.pan);
		});
	}
	for (const [at, note, length] of loop.bass) add(bass(rate, note, (length * step) / rate), at * step, 0.9, 0);
	for (const [at, notes, length] of loop.chords) {
		const stab = chord(rate, notes, (length * step) / rate);
		add(stab, at * step, 0.5, -0.15);
	}
	return [left, right];
}
