import { Delay, Gain, connect } from 'tone';
import { RackEffect, rampParam, type EffectOptions } from './effect';

const BASE = 0.0005; // seconds: the closest the sweep gets

/**
 * Flanger: the input plus a copy through a short delay swept by a tempo-synced LFO. Delays this
 * short can't sit in a Web Audio feedback loop (a cycle needs ≥ 128 frames), so "feedback" feeds
 * a second pass through the same sweep, which deepens the notches the same way.
 */
export class Flanger extends RackEffect {
	readonly id = 'flanger';
	readonly blend = 'replace';
	#dry = this.own(new Gain(0.5));
	#first = this.own(new Delay({ maxDelay: 0.02 }));
	#second = this.own(new Delay({ maxDelay: 0.02 }));
	#firstLevel = this.own(new Gain(0.5));
	#secondLevel = this.own(new Gain(0));
	#sweep = this.sine(1);

	constructor(options: EffectOptions) {
		super(options);
		this.input.chain(this.#dry, this.output);
		this.input.chain(this.#first, this.#firstLevel, this.output);
		this.#first.chain(this.#second, this.#secondLevel, this.output);
		connect(this.#sweep.depth, this.#first.delayTime);
		connect(this.#sweep.depth, this.#second.delayTime);
		this.init();
	}

	protected apply(param: string, value: number, time: number) {
		if (param === 'rate') this.retime(time);
		if (param === 'depth') {
			// The LFO swings ±half the span around each delay's own time: BASE to BASE + span.
			const span = 0.006 * Math.max(0.02, value);
			for (const d of [this.#first, this.#second]) rampParam(d.delayTime, BASE + span / 2, time, 0.005);
			rampParam(this.#sweep.depth.gain, span / 2, time, 0.005);
		}
		if (param === 'feedback') {
			rampParam(this.#firstLevel.gain, 0.5 - 0.15 * value, time, 0.005);
			rampParam(this.#secondLevel.gain, 0.35 * value, time, 0.005);
		}
	}

	protected retime(time: number) {
		rampParam(this.#sweep.frequency, 1 / this.seconds('rate'), time, 0);
	}
}
