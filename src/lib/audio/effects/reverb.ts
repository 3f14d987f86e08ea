import { Delay, Gain, Merge, connectSeries } from 'tone';
import { seededNoise } from '../measure';
import { RackEffect, rampParam, type EffectOptions } from './effect';

const SWAP = 0.04; // seconds of crossfade when size or decay makes a new impulse response

/**
 * Convolution reverb over a generated impulse response: noise with an exponential decay to
 * −60 dB at the decay time. Size scales the decay and the pre-delay. A new response is swapped in
 * with a short crossfade between two convolvers; the second is made at the first swap, since a
 * convolver costs on every frame. The tail is convolved once, in mono (half the cost of a stereo
 * pair offline), and spread by giving the right side a few ms more delay.
 * Live, a new response is made in a task of its own after the press that asked for it (making it
 * and handing it to the convolver takes tens of milliseconds): the press sounds at once through
 * the room it had, and the new room fades in a moment later. Offline it is made at once.
 */
export class Reverb extends RackEffect {
	readonly id = 'reverb';
	readonly blend = 'add';
	#mono = this.own(new Gain(1));
	#predelay = this.own(new Delay({ maxDelay: 0.1 }));
	#spread = this.own(new Delay({ delayTime: 0.013, maxDelay: 0.02 }));
	#sides = this.own(new Merge());
	#damping = this.biquad('lowpass', 6000, 0.5);
	#rooms: { convolver: ConvolverNode; level: Gain }[] = [];
	#live = 1;
	#seed = 1;
	#shape = '';
	#pending: ReturnType<typeof setTimeout> | null = null;

	constructor(options: EffectOptions) {
		super(options);
		this.#mono.channelCount = 1;
		this.#mono.channelCountMode = 'explicit';
		connectSeries(this.input, this.#mono, this.#predelay, this.#damping);
		this.#spread.connect(this.#sides, 0, 1);
		this.#sides.connect(this.output);
		this.init();
	}

	protected apply(param: string, _value: number, time: number) {
		if (param === 'damping') rampParam(this.#damping.frequency, this.scaled('damping'), time, 0.005);
		if (param === 'size') rampParam(this.#predelay.delayTime, 0.005 + 0.05 * this.values.size, time, 0);
		if ((param === 'size' || param === 'decay') && this.values.size !== undefined && this.values.decay !== undefined) {
			if (this.context.isOffline || this.#rooms.length === 0) this.#swap(time);
			else this.#later(time);
		}
	}

	/** One swap per burst of changes, in a task after the current one, no earlier than `time`. */
	#later(time: number) {
		if (this.#pending !== null) return;
		this.#pending = setTimeout(() => {
			this.#pending = null;
			this.#swap(Math.max(time, this.context.currentTime));
		}, 0);
	}

	dispose() {
		if (this.#pending !== null) clearTimeout(this.#pending);
		this.#pending = null;
		super.dispose();
	}

	#swap(time: number) {
		const seconds = this.scaled('decay') * (0.4 + 0.8 * this.values.size);
		const shape = seconds.toFixed(3);
		if (shape === this.#shape) return;
		this.#shape = shape;
		const next = this.#rooms[1 - this.#live] ?? this.#room();
		next.convolver.buffer = impulse(this.context.rawContext, seconds, this.#seed++);
		const live = this.#rooms[this.#live];
		if (live) rampParam(live.level.gain, 0, time, SWAP);
		rampParam(next.level.gain, 1, time, SWAP);
		this.#live = 1 - this.#live;
	}

	#room() {
		const convolver = this.context.createConvolver();
		convolver.normalize = false;
		const level = this.own(new Gain(0));
		this.own({ dispose: () => convolver.disconnect() });
		connectSeries(this.#damping, convolver, level);
		level.connect(this.#sides, 0, 0);
		level.connect(this.#spread);
		this.#rooms.push({ convolver, level });
		return this.#rooms[this.#rooms.length - 1];
	}

	private get context() {
		return this.input.context;
	}
}

/** A mono impulse response whose energy is about −8 dB, so the tail sits under the dry signal. */
function impulse(context: BaseAudioContextLike, seconds: number, seed: number): AudioBuffer {
	const rate = context.sampleRate;
	const length = Math.max(1, Math.round(seconds * rate));
	const buffer = context.createBuffer(1, length, rate) as AudioBuffer;
	for (let c = 0; c < 1; c++) {
		const data = seededNoise(length, seed);
		let energy = 0;
		for (let i = 0; i < length; i++) {
			data[i] *= Math.exp((-6.91 * i) / length);
			energy += data[i] * data[i];
		}
		const scale = 0.4 / Math.sqrt(energy);
		for (let i = 0; i < length; i++) data[i] *= scale;
		buffer.getChannelData(c).set(data);
	}
	return buffer;
}

interface BaseAudioContextLike {
	sampleRate: number;
	createBuffer(channels: number, length: number, rate: number): unknown;
}
