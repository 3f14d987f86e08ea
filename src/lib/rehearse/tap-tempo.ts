// Tap tempo: the rig tempo from the spacing of taps. A pause longer than two beats at the slowest
// tempo starts a new run, so a stray tap from earlier never drags the average.
export const MIN_BPM = 60;
export const MAX_BPM = 200;
const RESTART_MS = 2 * (60000 / MIN_BPM);
const KEEP = 5; // the last four intervals make the average

export const clampTempo = (bpm: number) => Math.min(MAX_BPM, Math.max(MIN_BPM, Math.round(bpm)));

export class TapTempo {
	#taps: number[] = [];

	/** Adds a tap at `t` (ms); the tempo once there are two taps in a run, else null. */
	tap(t: number): number | null {
		const last = this.#taps[this.#taps.length - 1];
		if (last === undefined || t - last > RESTART_MS || t <= last) this.#taps = [];
		this.#taps.push(t);
		if (this.#taps.length > KEEP) this.#taps.shift();
		if (this.#taps.length < 2) return null;
		const span = this.#taps[this.#taps.length - 1] - this.#taps[0];
		// BPM = 60000 / ms per beat (REFERENCES.md, tempo arithmetic).
		return clampTempo(60000 / (span / (this.#taps.length - 1)));
	}

	get taps(): number {
		return this.#taps.length;
	}
}
