import { Gain, WaveShaper, connectSeries } from 'tone';
import { RackEffect, rampParam, scaleParam, spec, type EffectOptions } from './effect';

const OPEN_LOW = 20;
const OPEN_HIGH = 20000;
const FADE = 0.005;

/**
 * One-knob filter sweep: cutoff below the middle closes a low-pass, above it opens a high-pass,
 * the middle leaves both open. Resonance applies to whichever side is closing; drive adds grit.
 */
export class FilterSweep extends RackEffect {
	readonly id = 'filter';
	readonly blend = 'replace';
	#lowpass = [this.biquad('lowpass', OPEN_HIGH), this.biquad('lowpass', OPEN_HIGH)];
	#highpass = [this.biquad('highpass', OPEN_LOW), this.biquad('highpass', OPEN_LOW)];
	#clean = this.own(new Gain(1));
	#dirty = this.own(new Gain(0));
	#shaper = this.own(new WaveShaper((x) => Math.tanh(3 * x) / Math.tanh(3), 2048));

	constructor(options: EffectOptions) {
		super(options);
		// Two biquads a side: 24 dB per octave, a sweep you can hear.
		const last = this.#highpass[1];
		connectSeries(this.input, ...this.#lowpass, ...this.#highpass);
		connectSeries(last, this.#clean, this.output);
		connectSeries(last, this.#shaper, this.#dirty, this.output);
		this.init();
	}

	protected apply(param: string, value: number, time: number) {
		if (param === 'cutoff' || param === 'resonance') this.#sweep(time);
		if (param === 'drive') {
			rampParam(this.#clean.gain, 1 - value, time, FADE);
			rampParam(this.#dirty.gain, value, time, FADE);
		}
	}

	#sweep(time: number) {
		const { lowpass, highpass } = cutoffs(this.values.cutoff ?? 0.5);
		const q = this.values.resonance === undefined ? 0.707 : this.scaled('resonance');
		// The resonance goes on the second biquad of the closing side only.
		for (const f of this.#lowpass) rampParam(f.frequency, lowpass, time, FADE);
		for (const f of this.#highpass) rampParam(f.frequency, highpass, time, FADE);
		rampParam(this.#lowpass[1].Q, lowpass < OPEN_HIGH ? q : 0.707, time, FADE);
		rampParam(this.#highpass[1].Q, highpass > OPEN_LOW ? q : 0.707, time, FADE);
	}
}

/** The knob position (0..1) as the two corner frequencies, exponential over 20 Hz–20 kHz. */
export function cutoffs(value: number): { lowpass: number; highpass: number } {
	const range = spec('filter', 'cutoff');
	if (value < 0.5) return { lowpass: scaleParam(range, value * 2), highpass: OPEN_LOW };
	return { lowpass: OPEN_HIGH, highpass: scaleParam(range, (value - 0.5) * 2) };
}
