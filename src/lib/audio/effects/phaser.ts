import { Gain, LFO, connect, connectSeries } from 'tone';
import { RackEffect, rampParam, type EffectOptions } from './effect';

const MAX_BIQUADS = 6; // a biquad all-pass is two classic first-order stages: 2–12 stages
const CENTRE = 900; // Hz

/**
 * Phaser: the input plus a copy through 2–12 all-pass stages whose corner sweeps with a
 * tempo-synced LFO. All six biquads run; `stages` picks which tap (an even count) is heard.
 * The swept path runs in mono: the sweep costs a coefficient update per sample and stage.
 */
export class Phaser extends RackEffect {
	readonly id = 'phaser';
	readonly blend = 'replace';
	#dry = this.own(new Gain(0.5));
	#mono = this.own(new Gain(1));
	#stages = Array.from({ length: MAX_BIQUADS }, () => this.#stage());
	#taps = Array.from({ length: MAX_BIQUADS }, () => this.own(new Gain(0)));
	#sweep = this.own(new LFO({ frequency: 1, min: CENTRE / 2, max: CENTRE * 2 }));

	constructor(options: EffectOptions) {
		super(options);
		this.input.chain(this.#dry, this.output);
		this.#mono.channelCount = 1;
		this.#mono.channelCountMode = 'explicit';
		connectSeries(this.input, this.#mono, ...this.#stages);
		this.#taps.forEach((tap, k) => connectSeries(this.#stages[k], tap, this.output));
		for (const stage of this.#stages) connect(this.#sweep, stage.frequency);
		this.#sweep.start(0);
		this.init();
	}

	#stage(): BiquadFilterNode {
		const stage = this.biquad('allpass', CENTRE, 0.6);
		stage.frequency.value = 0; // the LFO supplies the whole corner frequency
		return stage;
	}

	protected apply(param: string, value: number, time: number) {
		if (param === 'rate') this.retime(time);
		if (param === 'depth') {
			const octaves = 0.2 + 2.8 * value;
			this.#sweep.min = CENTRE / Math.pow(2, octaves / 2);
			this.#sweep.max = CENTRE * Math.pow(2, octaves / 2);
		}
		if (param === 'stages') {
			const pick = Math.round(this.scaled('stages') / 2) - 1;
			this.#taps.forEach((tap, k) => rampParam(tap.gain, k === pick ? 0.5 : 0, time, 0.005));
		}
	}

	protected retime(time: number) {
		rampParam(this.#sweep.frequency, 1 / this.seconds('rate'), time, 0);
	}
}
