// The rig's beat clock: tempo as a list of steps in context time, so any time maps to a beat
// and back. Loops, and the effects' beat-synced parameters, read the tempo from here.

interface Segment {
	time: number; // context seconds
	beat: number;
	bpm: number;
}

export class BeatClock {
	#segments: Segment[];

	constructor(bpm: number, origin = 0) {
		this.#segments = [{ time: origin, beat: 0, bpm }];
	}

	get origin(): number {
		return this.#segments[0].time;
	}

	/** Changes the tempo from `time` on (times before the last change are moved to it). */
	setTempo(bpm: number, time: number): void {
		const last = this.#segments[this.#segments.length - 1];
		const at = Math.max(time, last.time);
		if (at === last.time) this.#segments[this.#segments.length - 1] = { ...last, bpm };
		else this.#segments.push({ time: at, beat: this.beatAt(at), bpm });
	}

	bpmAt(time: number): number {
		return this.#segmentAt(time).bpm;
	}

	/** The context time of `beat` (the inverse of beatAt). */
	timeAt(beat: number): number {
		let s = this.#segments[0];
		for (const segment of this.#segments) if (segment.beat <= beat) s = segment;
		return s.time + ((beat - s.beat) * 60) / s.bpm;
	}

	beatAt(time: number): number {
		const s = this.#segmentAt(time);
		return s.beat + ((time - s.time) * s.bpm) / 60;
	}

	#segmentAt(time: number): Segment {
		for (let i = this.#segments.length - 1; i > 0; i--) if (this.#segments[i].time <= time) return this.#segments[i];
		return this.#segments[0];
	}
}
