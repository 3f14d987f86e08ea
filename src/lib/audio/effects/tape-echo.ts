import { Delay, Gain, WaveShaper, connect, connectSeries } from 'tone';
import { RackEffect, cycleLag, rampParam, type EffectOptions } from './effect';

const WOW_HZ = 0.6;

/** Echo through worn tape: the delay time wobbles (wow), repeats darken and saturate. */
export class TapeEcho extends RackEffect {
	readonly id = 'tape-echo';
	readonly blend = 'add';
	#lag = this.own(new Delay({ maxDelay: 0.01 }));
	#delay = this.own(new Delay({ maxDelay: 4 }));
	#head = this.biquad('lowpass', 12000, 0.5);
	#loss = this.biquad('lowpass', 6000, 0.5);
	#saturate = this.own(new WaveShaper((x) => Math.tanh(1.5 * x) / Math.tanh(1.5), 1024));
	#feedback = this.own(new Gain(0));
	#wow = this.sine(WOW_HZ);

	constructor(options: EffectOptions) {
		super(options);
		this.#lag.delayTime.value = cycleLag(this.input.context.sampleRate);
		connectSeries(this.input, this.#head, this.#lag, this.#delay, this.output);
		connectSeries(this.#delay, this.#loss, this.#saturate, this.#feedback, this.#delay);
		connect(this.#wow.depth, this.#delay.delayTime);
		this.init();
	}

	protected apply(param: string, value: number, time: number) {
		if (param === 'time') rampParam(this.#delay.delayTime, this.#loopTime(), time, 0);
		if (param === 'feedback') rampParam(this.#feedback.gain, 0.9 * value, time, 0.005);
		if (param === 'wear') {
			// More wear: deeper wow (up to 4 ms), duller head and loop.
			rampParam(this.#wow.depth.gain, 0.0005 + 0.0035 * value, time, 0.005);
			rampParam(this.#head.frequency, 12000 * Math.pow(0.25, value), time, 0.005);
			rampParam(this.#loss.frequency, 6000 * Math.pow(0.3, value), time, 0.005);
		}
	}

	protected retime(time: number) {
		rampParam(this.#delay.delayTime, this.#loopTime(), time, 0.05);
	}

	#loopTime() {
		return this.seconds('time') - cycleLag(this.input.context.sampleRate);
	}
}
