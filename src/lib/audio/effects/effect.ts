// The contract every rack effect class keeps. An effect's `output` is its wet signal only; the
// slot around it decides how dry and wet meet (see rack-insert.ts). Parameters arrive as the
// rig stores them, 0..1 per catalog parameter id (engine/effects.ts), and each class scales them.
import { Gain } from 'tone';
import { EFFECTS, divisionFromValue, divisionMs } from '$lib/engine/effects';
import { scaleParam, spec } from '../params';
import type { EffectId } from '$lib/engine/types';
import type { BeatClock } from '../beat-clock';

/** `add`: the slot keeps the dry signal and adds the wet (echoes, reverb); `replace`: wet only. */
export type ChainBlend = 'add' | 'replace';

export interface EffectOptions {
	bpm: number;
	/** The rig's beat clock, for effects that cycle on its grid. */
	clock: BeatClock;
}

export { scaleParam, spec };

export abstract class RackEffect {
	abstract readonly id: EffectId;
	abstract readonly blend: ChainBlend;
	readonly input = new Gain(1);
	readonly output = new Gain(1);
	protected bpm: number;
	protected values: Record<string, number> = {};
	#owned: { dispose(): unknown }[] = [this.input, this.output];

	constructor(options: EffectOptions) {
		this.bpm = options.bpm;
	}

	/** Registers nodes that `dispose()` must release. */
	protected own<T extends { dispose(): unknown }>(node: T): T {
		this.#owned.push(node);
		return node;
	}

	/**
	 * A native biquad. Tone's Filter drives its corner through an audio-rate signal, which makes
	 * the browser recompute coefficients every sample; a plain parameter costs a fraction of that.
	 */
	protected biquad(type: BiquadFilterType, frequency: number, Q = 0.707): BiquadFilterNode {
		const node = this.input.context.createBiquadFilter();
		node.type = type;
		node.frequency.value = frequency;
		node.Q.value = Q;
		this.#owned.push({ dispose: () => node.disconnect() });
		return node;
	}

	/**
	 * A swept biquad: its corner is read once per render quantum (128 frames) instead of every
	 * frame. A slow sweep moves a few cents per quantum, and the browser then recomputes the
	 * coefficients once per quantum rather than once per sample (about a fifth of the cost).
	 */
	protected sweptBiquad(type: BiquadFilterType, Q: number): BiquadFilterNode {
		let node: BiquadFilterNode | null = null;
		const native = browserBiquad(() => (node = this.biquad(type, 0, Q)));
		native.frequency.automationRate = 'k-rate';
		return node ?? native;
	}

	/**
	 * A sine LFO in two native nodes (an oscillator and its depth), running from the start; its
	 * output adds to the value of the parameter it is connected to.
	 */
	protected sine(hz: number): { frequency: AudioParam; depth: GainNode } {
		const context = this.input.context;
		const oscillator = context.createOscillator();
		const depth = context.createGain();
		oscillator.frequency.value = hz;
		depth.gain.value = 0;
		oscillator.connect(depth);
		oscillator.start(0);
		this.#owned.push({
			dispose: () => {
				oscillator.stop();
				oscillator.disconnect();
				depth.disconnect();
			}
		});
		return { frequency: oscillator.frequency, depth };
	}

	/** Sets one catalog parameter (0..1) at `time`. */
	set(param: string, value: number, time: number): void {
		if (this.values[param] === value) return;
		this.values[param] = value;
		this.apply(param, value, time);
	}

	protected abstract apply(param: string, value: number, time: number): void;

	/** Subclasses call this last in their constructor: every parameter at its catalog default. */
	protected init(): void {
		for (const p of EFFECTS[this.id].params) this.set(p.id, p.default, 0);
	}

	/** Beat-synced classes re-apply their divisions; others ignore tempo. */
	setTempo(bpm: number, time: number): void {
		if (bpm === this.bpm) return;
		this.bpm = bpm;
		this.retime(time);
	}

	protected retime(_time: number): void {}

	/** The effect became audible (stutter captures its slice here). */
	engage(_time: number): void {}

	/** The effect stopped being audible. */
	release(_time: number): void {}

	/** A beat-synced parameter's current length in seconds. */
	protected seconds(param: string): number {
		return divisionMs(divisionFromValue(spec(this.id, param).divisions ?? [], this.values[param]), this.bpm) / 1000;
	}

	protected scaled(param: string): number {
		return scaleParam(spec(this.id, param), this.values[param]);
	}

	dispose(): void {
		for (const node of this.#owned) node.dispose();
		this.#owned = [];
	}
}

export interface Automatable {
	cancelAndHoldAtTime(time: number): unknown;
	cancelScheduledValues(time: number): unknown;
	setValueAtTime(value: number, time: number): unknown;
	linearRampToValueAtTime(value: number, time: number): unknown;
}

/** Moves a parameter to `value` at `time` over `fade` seconds, from whatever it holds then. */
export function rampParam(param: Automatable, value: number, time: number, fade: number): void {
	if (fade > 0) {
		param.cancelAndHoldAtTime(time);
		param.linearRampToValueAtTime(value, time + fade);
	} else setAt(param, value, time);
}

/**
 * Jumps a parameter to `value` exactly at `time`. A hold event and a set at the same time leave
 * the old value on that first frame in Chromium, so this drops later events instead of holding.
 */
export function setAt(param: Automatable, value: number, time: number): void {
	param.cancelScheduledValues(time);
	param.setValueAtTime(value, time);
}

/**
 * Chromium renders a feedback cycle through a DelayNode one render quantum (128 frames, Web Audio
 * API §2.4) later than its delay time. Loops subtract it inside the cycle and add it back as a
 * plain pre-delay outside, so every pass lasts exactly the beat-synced time (measured in e2e).
 */
export const CYCLE_LAG_FRAMES = 128;

export function cycleLag(sampleRate: number): number {
	return CYCLE_LAG_FRAMES / sampleRate;
}

/**
 * The browser's own biquad behind one that Tone's context makes (connections still go to the one
 * Tone made): the wrapper hides a parameter's `automationRate`, so the native factory is watched
 * while `make` runs. Where the context is already native, that is the node `make` returns.
 */
function browserBiquad(make: () => BiquadFilterNode): BiquadFilterNode {
	const proto = globalThis.BaseAudioContext?.prototype;
	if (!proto) return make();
	const original = proto.createBiquadFilter;
	const made: BiquadFilterNode[] = [];
	proto.createBiquadFilter = function (this: BaseAudioContext) {
		const node = original.call(this);
		made.push(node);
		return node;
	};
	try {
		const node = make();
		return made[0] ?? node;
	} finally {
		proto.createBiquadFilter = original;
	}
}
