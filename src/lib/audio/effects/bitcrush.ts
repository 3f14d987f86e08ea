import { WaveShaper, connect } from 'tone';
import { CRUSHER, crusherReady } from './crusher-worklet';
import { RackEffect, rampParam, type EffectOptions } from './effect';

/**
 * Fewer bits and a lower sample rate, then a tone control. Where the context has no audio
 * worklet (an insecure page), a stepped wave shaper still reduces the bits; the rate stays.
 */
export class Bitcrush extends RackEffect {
	readonly id = 'bitcrush';
	readonly blend = 'replace';
	#tone = this.biquad('lowpass', 12000, 0.5);
	#worklet: AudioWorkletNode | null = null;
	#fallback: WaveShaper | null = null;

	constructor(options: EffectOptions) {
		super(options);
		const context = this.input.context;
		if (crusherReady(context)) {
			this.#worklet = context.createAudioWorkletNode(CRUSHER, {
				numberOfInputs: 1,
				numberOfOutputs: 1,
				outputChannelCount: [2]
			});
			connect(this.input, this.#worklet);
			connect(this.#worklet, this.#tone);
		} else {
			this.#fallback = this.own(new WaveShaper(steps(8), 4096));
			this.input.chain(this.#fallback);
			connect(this.#fallback, this.#tone);
		}
		connect(this.#tone, this.output);
		this.init();
	}

	protected apply(param: string, value: number, time: number) {
		if (param === 'bits') {
			const bits = this.scaled('bits');
			const p = this.#worklet?.parameters.get('bits');
			if (p) p.setValueAtTime(bits, time);
			else if (this.#fallback) this.#fallback.curve = steps(bits);
		}
		if (param === 'rate') this.#worklet?.parameters.get('rate')?.setValueAtTime(this.scaled('rate'), time);
		if (param === 'tone') rampParam(this.#tone.frequency, 1500 * Math.pow(12, value), time, 0.005);
	}

	dispose() {
		this.#worklet?.disconnect();
		super.dispose();
	}
}

function steps(bits: number): Float32Array {
	const step = Math.pow(0.5, bits - 1);
	return Float32Array.from({ length: 4096 }, (_, i) => Math.round((i / 2047.5 - 1) / step) * step);
}
