import { Delay, Gain } from 'tone';
import { RackEffect, cycleLag, rampParam, setAt, type EffectOptions } from './effect';

const MAX_DROP = 0.25; // pitch drop at full knob: playback at 75 % speed (about −5 semitones)
const HORIZON = 60; // seconds a held stutter can keep dropping before the ramp ends

/**
 * Slice repeat: when it engages at t, the next slice (a beat division long) plays through and is
 * captured in a delay loop of exactly that length, which then repeats it until release. Smooth
 * fades the captured slice's edges; pitch drop slows the repeats by a steadily growing delay.
 */
export class Stutter extends RackEffect {
	readonly id = 'stutter';
	readonly blend = 'replace';
	#live = this.own(new Gain(1));
	#capture = this.own(new Gain(0));
	#lag = this.own(new Delay({ maxDelay: 0.01 }));
	#loop = this.own(new Delay({ maxDelay: 2.5 }));
	#recycle = this.own(new Gain(0));
	#repeats = this.own(new Gain(0));
	#drop = this.own(new Delay({ maxDelay: HORIZON * MAX_DROP + 1 }));
	#engagedAt: number | null = null;

	constructor(options: EffectOptions) {
		super(options);
		this.input.chain(this.#live, this.output);
		this.#lag.delayTime.value = cycleLag(this.input.context.sampleRate);
		this.input.chain(this.#capture, this.#lag, this.#loop);
		this.#loop.chain(this.#recycle, this.#loop);
		this.#loop.chain(this.#repeats, this.#drop, this.output);
		this.#drop.delayTime.setValueAtTime(0, 0);
		this.init();
	}

	protected apply(param: string, _value: number, time: number) {
		// A new slice length (another pad of a legato row) starts a fresh capture.
		if (param === 'slice' && this.#engagedAt !== null) this.engage(time);
	}

	engage(time: number) {
		this.#engagedAt = time;
		const slice = this.seconds('slice');
		const edge = Math.min(0.01, slice / 4) * (this.values.smooth ?? 0);
		const repeatAt = time + slice;
		rampParam(this.#loop.delayTime, slice - cycleLag(this.input.context.sampleRate), time, 0);
		const capture = this.#capture.gain;
		if (edge > 0) {
			setAt(capture, 0, time);
			capture.linearRampToValueAtTime(1, time + edge);
			capture.setValueAtTime(1, repeatAt - edge);
			capture.linearRampToValueAtTime(0, repeatAt);
		} else {
			setAt(capture, 1, time);
			capture.setValueAtTime(0, repeatAt);
		}
		this.#switch(this.#recycle.gain, 0, 1, time, repeatAt);
		this.#switch(this.#live.gain, 1, 0, time, repeatAt);
		this.#switch(this.#repeats.gain, 0, 1, time, repeatAt);
		const drop = this.#drop.delayTime;
		setAt(drop, 0, time);
		const rate = MAX_DROP * (this.values.pitch ?? 0);
		if (rate > 0) {
			drop.setValueAtTime(0, repeatAt);
			drop.linearRampToValueAtTime(rate * HORIZON, repeatAt + HORIZON);
		}
	}

	release(time: number) {
		this.#engagedAt = null;
		rampParam(this.#capture.gain, 0, time, 0);
		rampParam(this.#recycle.gain, 0, time, 0);
		rampParam(this.#live.gain, 1, time, 0);
		rampParam(this.#repeats.gain, 0, time, 0);
		rampParam(this.#drop.delayTime, 0, time, 0);
	}

	#switch(param: Gain['gain'], first: number, then: number, time: number, at: number) {
		setAt(param, first, time);
		param.setValueAtTime(then, at);
	}
}
