import { Filter, Gain, LFO } from 'tone';
import { RackEffect, rampParam, type EffectOptions } from './effect';

const MAX_STAGES = 12;
const CENTRE = 900; // Hz

/**
 * Phaser: the input plus a copy through 2–12 all-pass stages whose corner sweeps with a
 * tempo-synced LFO. All twelve stages run; `stages` picks which tap (an even count) is heard.
 */
export class Phaser extends RackEffect {
	readonly id = 'phaser';
	readonly blend = 'replace';
	#dry = this.own(new Gain(0.5));
	#stages = Array.from({ length: MAX_STAGES }, () => this.own(new Filter({ type: 'allpass', rolloff: -12, Q: 0.6 })));
	#taps = Array.from({ length: MAX_STAGES / 2 }, () => this.own(new Gain(0)));
	#sweep = this.own(new LFO({ frequency: 1, min: CENTRE / 2, max: CENTRE * 2 }));

	constructor(options: EffectOptions) {
		super(options);
		this.input.chain(this.#dry, this.output);
		this.input.chain(...this.#stages);
		this.#taps.forEach((tap, k) => this.#stages[2 * k + 1].chain(tap, this.output));
		for (const stage of this.#stages) this.#sweep.connect(stage.frequency);
		this.#sweep.start(0);
		this.init();
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
