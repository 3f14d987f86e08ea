// The room's beat clock on room time (ms since the room opened): tempo and the time of beat 0.
// A tempo change keeps the beat position where it is, so the grid never jumps under a held pad;
// the engine's rig actor and the audio beat clock are told the same tempo and origin.
import { msPerBeat } from '$lib/engine';

export class RoomClock {
	constructor(
		public tempo: number,
		public origin = 0
	) {}

	beatAt(t: number): number {
		return (t - this.origin) / msPerBeat(this.tempo);
	}

	timeOfBeat(beat: number): number {
		return this.origin + beat * msPerBeat(this.tempo);
	}

	/** Changes the tempo at `t`, moving the origin so beatAt(t) stays the same. */
	retime(bpm: number, t: number): void {
		const beat = this.beatAt(t);
		this.tempo = bpm;
		this.origin = t - beat * msPerBeat(bpm);
	}
}

/** "bar.beat", both counted from 1, for a beat position (4 beats a bar). */
export function barBeat(beat: number): { bar: number; beat: number } {
	const whole = Math.max(0, Math.floor(beat));
	return { bar: Math.floor(whole / 4) + 1, beat: (whole % 4) + 1 };
}
