// The master: level (moderate by default), a limiter whose ceiling is −1 dBFS, and a meter.
// The limiter is a memoryless soft ceiling: exactly linear below −3 dBFS, rounding off toward
// −1 dBFS above, never past it. A compressor node would add its fixed look-ahead delay (about
// 6 ms in Chromium) and make-up gain to every pad press; this adds neither.
import { Gain, Meter, WaveShaper } from 'tone';
import { rampParam } from './effects/effect';
import { DEFAULT_MASTER_DB, dbToGain } from './mix';

export { DEFAULT_MASTER_DB };
export const CEILING_DB = -1;
const KNEE_DB = -3;
const RANGE = 16; // the shaper's input covers ±16 (+24 dBFS) before it clamps

export class MasterBus {
	/** The level, with the shaper's input scale folded in (one node fewer on every frame). */
	readonly input = new Gain(dbToGain(DEFAULT_MASTER_DB) / RANGE);
	readonly output = new Gain(1);
	#ceiling = new WaveShaper(ceilingCurve(8193), 8193);
	// Only a live context is metered: an analyser runs on every frame even with nothing reading it.
	#meter = this.output.context.isOffline ? null : new Meter({ smoothing: 0.7 });
	#levelDb = DEFAULT_MASTER_DB;

	constructor() {
		this.input.chain(this.#ceiling, this.output);
		if (this.#meter) this.output.connect(this.#meter);
	}

	get levelDb(): number {
		return this.#levelDb;
	}

	setLevel(db: number, time: number): void {
		this.#levelDb = db;
		rampParam(this.input.gain, db <= -60 ? 0 : dbToGain(db) / RANGE, time, 0.02);
	}

	/** Output level in dBFS as the meter reads it now (−Infinity when silent or offline). */
	meterDb(): number {
		const v: number | number[] = this.#meter?.getValue() ?? -Infinity;
		return Array.isArray(v) ? Math.max(...v) : v;
	}

	dispose(): void {
		for (const n of [this.input, this.output, this.#ceiling, this.#meter]) n?.dispose();
	}
}

/**
 * The ceiling's transfer curve over inputs ±RANGE, sampled at `points`: identity up to the knee
 * (−3 dBFS), then an exponential approach to the ceiling (−1 dBFS) with matching slope.
 */
export function ceilingCurve(points: number): Float32Array {
	const knee = dbToGain(KNEE_DB);
	// Just under −1 dBFS in 32-bit float, so rounding in the shaper can never reach the ceiling.
	const ceiling = Math.fround(dbToGain(CEILING_DB) * (1 - 1e-6));
	return Float32Array.from({ length: points }, (_, i) => {
		const x = ((2 * i) / (points - 1) - 1) * RANGE;
		return Math.sign(x) * softCeiling(Math.abs(x), knee, ceiling);
	});
}

function softCeiling(x: number, knee: number, ceiling: number): number {
	if (x <= knee) return x;
	const room = ceiling - knee;
	return knee + room * (1 - Math.exp(-(x - knee) / room));
}
