// One deck: its source (a demo loop, or a test signal), play/stop, one insert per declared rack
// in series (rack 1 first; the mapping decides how many), and its level. Stopping ramps the source down before the inserts, so tails ring out.
// Neighbouring inserts share one summing node: every node in the chain runs on every frame.
import { Gain, ToneAudioBuffer, ToneBufferSource } from 'tone';
import { MAX_RACKS, type DeckId } from '$lib/engine/types';
import type { BeatClock } from './beat-clock';
import { rampParam } from './effects/effect';
import { LoopPlayer } from './loops/loop-player';
import type { DemoLoop } from './loops/patterns';
import { dbToGain } from './mix';
import { RACK_FADE, RackInsert } from './rack-insert';

export class DeckChannel {
	readonly output = new Gain(1);
	readonly inserts: RackInsert[] = [];
	#play = new Gain(1); // sources sum here
	#joints: Gain[] = []; // between neighbouring inserts
	#loop: LoopPlayer | null = null;
	#retired: LoopPlayer[] = [];
	#probes: ToneBufferSource[] = [];
	#levelDb = 0;

	constructor(
		readonly deck: DeckId,
		readonly clock: BeatClock,
		racks = 1
	) {
		this.ensureRacks(racks);
	}

	/** Grows the insert chain to `count` racks (a mapping with more racks took over); never shrinks. */
	ensureRacks(count: number): void {
		const want = Math.min(MAX_RACKS, Math.max(1, count));
		while (this.inserts.length < want) {
			const last = this.inserts.at(-1);
			let input = this.#play;
			if (last) {
				input = new Gain(1);
				this.#joints.push(input);
				last.retarget(input);
			}
			this.inserts.push(new RackInsert(this.inserts.length + 1, this.deck, this.clock, input, this.output));
		}
	}

	get loop(): DemoLoop | null {
		return this.#loop?.loop ?? null;
	}

	get levelDb(): number {
		return this.#levelDb;
	}

	setLoop(loop: DemoLoop | null, time: number): void {
		if (this.#loop) {
			const old = this.#loop;
			old.output.gain.setValueAtTime(old.output.gain.getValueAtTime(time), time);
			old.output.gain.linearRampToValueAtTime(0, time + RACK_FADE);
			// An offline render is still to run: keep the old loop until the deck goes away.
			if (old.output.context.isOffline) this.#retired.push(old);
			else setTimeout(() => old.dispose(), 1000 * (time - old.output.context.currentTime + 0.2));
		}
		this.#loop = loop ? new LoopPlayer(loop, this.clock) : null;
		if (this.#loop) {
			this.#loop.output.connect(this.#play);
			this.#loop.start(time);
		}
	}

	/** Plays fixed samples once from `time` (test signals on the sounds page and in tests). */
	playSamples(channels: Float32Array[], time: number): void {
		const probe = new ToneBufferSource({ url: ToneAudioBuffer.fromArray(channels) });
		probe.connect(this.#play);
		probe.onended = () => probe.dispose();
		probe.start(time);
		this.#probes.push(probe);
	}

	setPlaying(playing: boolean, time: number): void {
		rampParam(this.#play.gain, playing ? 1 : 0, time, RACK_FADE);
	}

	/** Deck level in dB; up to +12 for tests of the master limiter. */
	setLevel(db: number, time: number): void {
		this.#levelDb = Math.min(12, db);
		rampParam(this.output.gain, db <= -60 ? 0 : dbToGain(this.#levelDb), time, 0.01);
	}

	/** A tempo change at `time`: loops hand over, beat-synced effects retime. */
	retime(time: number): void {
		this.#loop?.start(time);
		for (const insert of this.inserts) insert.setTempo(this.clock.bpmAt(time), time);
	}

	dispose(): void {
		this.#loop?.dispose();
		for (const l of this.#retired) l.dispose();
		for (const p of this.#probes) p.dispose();
		for (const r of this.inserts) r.dispose();
		for (const n of [this.output, this.#play, ...this.#joints]) n.dispose();
	}
}
