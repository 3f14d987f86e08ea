import { Gain, type BaseContext } from 'tone';
import { divisionFraction, divisionFromValue } from '$lib/engine/effects';
import type { BeatClock } from '../beat-clock';
import { RackEffect, spec, type EffectOptions } from './effect';

const MIN_EDGE = 0.001; // seconds; even the hardest chop ramps this long so it never clicks
const AHEAD = 0.5; // seconds of cycles kept scheduled past the context's current time

/**
 * Tempo-synced chop: open for the first half of every division on the beat clock, closed (by
 * `depth`) for the second half. Shape softens the edges. Cycles sit on the rig's beat clock, so
 * the rate follows tempo changes and stays on the grid. They are written as gain automation a
 * little ahead of the context's clock as it ticks (Tone's transport would do the same, at several
 * times the script time of a whole offline render).
 */
export class Gate extends RackEffect {
	readonly id = 'gate';
	readonly blend = 'replace';
	#gain = this.own(new Gain(1));
	#context: BaseContext;
	#clock: BeatClock;
	#until = 0; // context time up to which cycles are written
	#tick = () => this.#write(this.#context.currentTime + AHEAD);

	constructor(options: EffectOptions) {
		super(options);
		this.#clock = options.clock;
		this.#context = this.#gain.context;
		this.input.chain(this.#gain, this.output);
		this.init();
		this.#context.on('tick', this.#tick);
	}

	protected apply(_param: string, _value: number, time: number) {
		this.#rewrite(time);
	}

	protected retime(time: number) {
		this.#rewrite(time);
	}

	/** Drops the cycles written from `time` on and writes them again with the current values. */
	#rewrite(time: number) {
		if (this.values.rate === undefined) return;
		this.#gain.gain.cancelAndHoldAtTime(time);
		this.#until = time;
		this.#write(Math.max(time, this.#context.currentTime) + AHEAD);
	}

	/** Writes every cycle that starts in [#until, end). */
	#write(end: number) {
		if (end <= this.#until || this.values.rate === undefined) return;
		const beats = 4 * divisionFraction(divisionFromValue(spec('gate', 'rate').divisions ?? [], this.values.rate));
		let k = Math.max(0, Math.ceil(this.#clock.beatAt(this.#until) / beats - 1e-9));
		for (let start = this.#clock.timeAt(k * beats); start < end; start = this.#clock.timeAt(++k * beats)) {
			this.#cycle(start, (beats * 60) / this.#clock.bpmAt(start));
		}
		this.#until = end;
	}

	#cycle(time: number, period: number) {
		const closed = 1 - (this.values.depth ?? 1);
		const edge = Math.max(MIN_EDGE, (this.values.shape ?? 0) * period * 0.25);
		const g = this.#gain.gain;
		g.setValueAtTime(closed, time);
		g.linearRampToValueAtTime(1, time + edge);
		g.setValueAtTime(1, time + period / 2 - edge);
		g.linearRampToValueAtTime(closed, time + period / 2);
	}

	dispose() {
		this.#context.off('tick', this.#tick);
		super.dispose();
	}
}
