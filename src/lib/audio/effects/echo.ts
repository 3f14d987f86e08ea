import { Delay, Gain, connectSeries } from 'tone';
import { RackEffect, cycleLag, rampParam, type EffectOptions } from './effect';

const GLIDE = 0.02; // seconds; a tempo change slides the delay instead of jumping (no click)

/** Beat-synced echo: repeats only. Tone loss sits in the feedback loop, so repeat 1 is exact. */
export class Echo extends RackEffect {
	readonly id = 'echo';
	readonly blend = 'add';
	#lag = this.own(new Delay({ maxDelay: 0.01 }));
	#delay = this.own(new Delay({ maxDelay: 4 }));
	#tone = this.biquad('lowpass', 8000, 0.5);
	#feedback = this.own(new Gain(0));

	constructor(options: EffectOptions) {
		super(options);
		this.#lag.delayTime.value = cycleLag(this.input.context.sampleRate);
		this.input.chain(this.#lag, this.#delay);
		this.#delay.connect(this.output);
		connectSeries(this.#delay, this.#tone, this.#feedback, this.#delay);
		this.init();
	}

	protected apply(param: string, _value: number, time: number) {
		if (param === 'time') rampParam(this.#delay.delayTime, this.#loopTime(), time, 0);
		if (param === 'feedback') rampParam(this.#feedback.gain, 0.95 * this.values.feedback, time, 0.005);
		if (param === 'tone') rampParam(this.#tone.frequency, this.scaled('tone'), time, 0.005);
	}

	protected retime(time: number) {
		rampParam(this.#delay.delayTime, this.#loopTime(), time, GLIDE);
	}

	#loopTime() {
		return this.seconds('time') - cycleLag(this.input.context.sampleRate);
	}
}
