import { Delay, Gain, Merge, Split } from 'tone';
import { RackEffect, cycleLag, rampParam, type EffectOptions } from './effect';

/**
 * Echo that alternates left, right, left…; width folds the two sides toward the middle. One
 * stereo delay whose sides swap on the way round: the loop has a single node that anything
 * outside it reads (the splitter), so the quantum the browser adds to a cycle always falls on
 * the same edge and every pass, left or right, lasts exactly the beat-synced time.
 */
export class PingPong extends RackEffect {
	readonly id = 'ping-pong';
	readonly blend = 'add';
	#mono = this.own(new Gain(1));
	#lag = this.own(new Delay({ maxDelay: 0.01 }));
	#toLeft = this.own(new Merge());
	#delay = this.own(new Delay({ maxDelay: 4 }));
	#sides = this.own(new Split(2));
	#swap = this.own(new Merge());
	#feedback = this.own(new Gain(0));
	#self = [this.own(new Gain(1)), this.own(new Gain(1))];
	#cross = [this.own(new Gain(0)), this.own(new Gain(0))];
	#out = this.own(new Merge());

	constructor(options: EffectOptions) {
		super(options);
		// Both sides fold into one signal (speaker down-mix) before the first, left, repeat.
		this.#mono.channelCount = 1;
		this.#mono.channelCountMode = 'explicit';
		this.#lag.delayTime.value = cycleLag(this.input.context.sampleRate);
		this.input.chain(this.#mono, this.#lag);
		this.#lag.connect(this.#toLeft, 0, 0);
		this.#toLeft.chain(this.#delay, this.#sides);
		this.#sides.connect(this.#swap, 0, 1);
		this.#sides.connect(this.#swap, 1, 0);
		this.#swap.chain(this.#feedback, this.#delay);
		for (const side of [0, 1]) {
			this.#sides.connect(this.#self[side], side);
			this.#sides.connect(this.#cross[side], side);
			this.#self[side].connect(this.#out, 0, side);
			this.#cross[side].connect(this.#out, 0, 1 - side);
		}
		this.#out.connect(this.output);
		this.init();
	}

	protected apply(param: string, value: number, time: number) {
		if (param === 'time') this.retime(time, 0);
		if (param === 'feedback') rampParam(this.#feedback.gain, 0.95 * value, time, 0.005);
		if (param === 'width') {
			const self = (1 + value) / 2;
			for (const g of this.#self) rampParam(g.gain, self, time, 0.005);
			for (const g of this.#cross) rampParam(g.gain, 1 - self, time, 0.005);
		}
	}

	protected retime(time: number, glide = 0.02) {
		rampParam(this.#delay.delayTime, this.seconds('time') - cycleLag(this.input.context.sampleRate), time, glide);
	}
}
