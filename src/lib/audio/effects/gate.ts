import { Gain, type BaseContext } from 'tone';
import { divisionFromValue } from '$lib/engine/effects';
import { RackEffect, spec, type EffectOptions } from './effect';

const MIN_EDGE = 0.001; // seconds; even the hardest chop ramps this long so it never clicks

/**
 * Tempo-synced chop: open for the first half of every division on the beat clock, closed (by
 * `depth`) for the second half. Shape softens the edges. Cycles are scheduled on the transport,
 * so the rate follows tempo changes and stays on the grid.
 */
export class Gate extends RackEffect {
	readonly id = 'gate';
	readonly blend = 'replace';
	#gain = this.own(new Gain(1));
	#transport: BaseContext['transport'];
	#repeat: number | null = null;

	constructor(options: EffectOptions) {
		super(options);
		this.#transport = this.#gain.context.transport;
		this.input.chain(this.#gain, this.output);
		this.init();
	}

	protected apply(param: string) {
		if (param === 'rate') this.#schedule();
	}

	#schedule() {
		if (this.#repeat !== null) this.#transport.clear(this.#repeat);
		const division = divisionFromValue(spec('gate', 'rate').divisions ?? [], this.values.rate);
		const interval = noteName(division);
		this.#repeat = this.#transport.scheduleRepeat((time) => this.#cycle(time, interval), interval, 0);
	}

	#cycle(time: number, interval: string) {
		const period = this.#transport.toSeconds(interval);
		const closed = 1 - (this.values.depth ?? 1);
		const edge = Math.max(MIN_EDGE, (this.values.shape ?? 0) * period * 0.25);
		const g = this.#gain.gain;
		g.setValueAtTime(closed, time);
		g.linearRampToValueAtTime(1, time + edge);
		g.setValueAtTime(1, time + period / 2 - edge);
		g.linearRampToValueAtTime(closed, time + period / 2);
	}

	dispose() {
		if (this.#repeat !== null) this.#transport.clear(this.#repeat);
		super.dispose();
	}
}

/** `1/8` → `8n`, `1/8.` → `8n.`, `1/8t` → `8t`: the transport's own note values. */
export function noteName(division: string): string {
	const m = /^1\/(\d+)(\.|t)?$/.exec(division);
	if (!m) throw new Error(`"${division}" is not a note value like 1/8`);
	return m[2] === 't' ? `${m[1]}t` : `${m[1]}n${m[2] ?? ''}`;
}
