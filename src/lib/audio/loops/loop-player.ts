// Plays a demo loop on a deck, locked to the rig's beat clock: the loop is mixed at the current
// tempo and started at the matching offset; a tempo change mixes it again and hands over there.
import { Gain, ToneAudioBuffer, ToneBufferSource } from 'tone';
import type { BeatClock } from '../beat-clock';
import type { DemoLoop } from './patterns';
import { renderLoop } from './render-loop';

const HANDOVER = 0.004; // seconds of crossfade at a tempo change

export class LoopPlayer {
	readonly output = new Gain(1);
	#source: ToneBufferSource | null = null;

	constructor(
		readonly loop: DemoLoop,
		readonly clock: BeatClock
	) {}

	/** Starts (or, after a tempo change, restarts) the loop in phase with the clock at `time`. */
	start(time: number): void {
		const context = this.output.context;
		const bpm = this.clock.bpmAt(time);
		const [left, right] = renderLoop(this.loop, bpm, context.sampleRate);
		const buffer = ToneAudioBuffer.fromArray([left, right]);
		const loopBeats = this.loop.bars * 4;
		const beat = this.clock.beatAt(time);
		const offset = ((((beat % loopBeats) + loopBeats) % loopBeats) * 60) / bpm;
		const next = new ToneBufferSource({ url: buffer, loop: true, fadeIn: this.#source ? HANDOVER : 0 });
		next.connect(this.output);
		const previous = this.#source;
		if (previous) {
			previous.fadeOut = HANDOVER;
			previous.onended = () => previous.dispose();
			previous.stop(time);
		}
		next.start(time, offset);
		this.#source = next;
	}

	dispose(): void {
		this.#source?.dispose();
		this.output.dispose();
	}
}
