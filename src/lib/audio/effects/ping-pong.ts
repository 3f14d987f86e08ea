import { Delay, Gain, Merge } from 'tone';
import { RackEffect, cycleLag, rampParam, type EffectOptions } from './effect';

/** Echo that alternates left, right, left…; width folds the two sides toward the middle. */
export class PingPong extends RackEffect {
	readonly id = 'ping-pong';
	readonly blend = 'add';
	#mono = this.own(new Gain(1));
	#lag = this.own(new Delay({ maxDelay: 0.01 }));
	#left = this.own(new Delay({ maxDelay: 4 }));
	#right = this.own(new Delay({ maxDelay: 4 }));
	#toRight = this.own(new Gain(0));
	#toLeft = this.own(new Gain(0));
	#leftSelf = this.own(new Gain(1));
	#leftCross = this.own(new Gain(0));
	#rightSelf = this.own(new Gain(1));
	#rightCross = this.own(new Gain(0));
	#merge = this.own(new Merge());

	constructor(options: EffectOptions) {
		super(options);
		// Both sides fold into one signal (speaker down-mix) before the first, left, repeat.
		this.#mono.channelCount = 1;
		this.#mono.channelCountMode = 'explicit';
		this.#lag.delayTime.value = cycleLag(this.input.context.sampleRate);
		this.input.chain(this.#mono, this.#lag, this.#left);
		this.#left.chain(this.#toRight, this.#right);
		this.#right.chain(this.#toLeft, this.#left);
		this.#left.fan(this.#leftSelf, this.#rightCross);
		this.#right.fan(this.#rightSelf, this.#leftCross);
		this.#leftSelf.connect(this.#merge, 0, 0);
		this.#leftCross.connect(this.#merge, 0, 0);
		this.#rightSelf.connect(this.#merge, 0, 1);
		this.#rightCross.connect(this.#merge, 0, 1);
		this.#merge.connect(this.output);
		this.init();
	}

	protected apply(param: string, value: number, time: number) {
		if (param === 'time') this.retime(time, 0);
		if (param === 'feedback') {
			rampParam(this.#toRight.gain, 0.95 * value, time, 0.005);
			rampParam(this.#toLeft.gain, 0.95 * value, time, 0.005);
		}
		if (param === 'width') {
			const self = (1 + value) / 2;
			for (const g of [this.#leftSelf, this.#rightSelf]) rampParam(g.gain, self, time, 0.005);
			for (const g of [this.#leftCross, this.#rightCross]) rampParam(g.gain, 1 - self, time, 0.005);
		}
	}

	protected retime(time: number, glide = 0.02) {
		// The left→right→left cycle runs one quantum late once per round: only one side pays it.
		const seconds = this.seconds('time');
		rampParam(this.#left.delayTime, seconds - cycleLag(this.input.context.sampleRate), time, glide);
		rampParam(this.#right.delayTime, seconds, time, glide);
	}
}
