import { Gain, connect, connectSeries } from 'tone';
import { RackEffect, rampParam, type EffectOptions } from './effect';

const MAX_BIQUADS = 6; // a biquad all-pass is two classic first-order stages: 2–12 stages
const CENTRE = 900; // Hz

/**
 * Phaser: the input plus a copy through 2–12 all-pass stages whose corner sweeps with a
 * tempo-synced LFO. `stages` picks which tap (an even count) is heard; biquads join the chain
 * only once a count needs them, since the browser runs every connected one. The swept path runs
 * in mono: each stage costs a coefficient update per render quantum.
 */
export class Phaser extends RackEffect {
	readonly id = 'phaser';
	readonly blend = 'replace';
	#dry = this.own(new Gain(0.5));
	#mono = this.own(new Gain(1));
	#stages: BiquadFilterNode[] = [];
	#taps: Gain[] = [];
	#sweep = this.sine(1);
	#corner = CENTRE; // Hz: the middle of the sweep

	constructor(options: EffectOptions) {
		super(options);
		this.input.chain(this.#dry, this.output);
		this.#mono.channelCount = 1;
		this.#mono.channelCountMode = 'explicit';
		connect(this.input, this.#mono);
		this.init();
	}

	/** Biquads up to `count`, each with its tap (silent until picked) and the sweep on its corner. */
	#grow(count: number) {
		while (this.#stages.length < count) {
			const stage = this.sweptBiquad('allpass', 0.6);
			const tap = this.own(new Gain(0));
			connect(this.#stages.at(-1) ?? this.#mono, stage);
			connectSeries(stage, tap, this.output);
			connect(this.#sweep.depth, stage.frequency);
			stage.frequency.value = this.#corner;
			this.#stages.push(stage);
			this.#taps.push(tap);
		}
	}

	protected apply(param: string, value: number, time: number) {
		if (param === 'rate') this.retime(time);
		if (param === 'depth') {
			const octaves = 0.2 + 2.8 * value;
			const [min, max] = [CENTRE / Math.pow(2, octaves / 2), CENTRE * Math.pow(2, octaves / 2)];
			// The LFO swings ±depth around each corner's own value: the middle of min and max.
			this.#corner = (min + max) / 2;
			rampParam(this.#sweep.depth.gain, (max - min) / 2, time, 0.005);
			for (const stage of this.#stages) rampParam(stage.frequency, this.#corner, time, 0.005);
		}
		if (param === 'stages') {
			const pick = Math.round(this.scaled('stages') / 2) - 1;
			this.#grow(Math.min(MAX_BIQUADS, pick + 1));
			this.#taps.forEach((tap, k) => rampParam(tap.gain, k === pick ? 0.5 : 0, time, 0.005));
		}
	}

	protected retime(time: number) {
		rampParam(this.#sweep.frequency, 1 / this.seconds('rate'), time, 0);
	}
}
