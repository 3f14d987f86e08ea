// The rehearsal room's wiring: every input source (MIDI ports, on-screen pads, keyboard) goes
// through one InputHub into the engine's live rig actor; what the actor lands is followed by the
// pads' lights, the sound, the live findings and the recorder. The room decides nothing about what
// a step does — it shows and plays what the engine says.
import { createActor, type Actor } from 'xstate';
import {
	initialRigState,
	mappingReach,
	rigMachine,
	sessionStart,
	withTempo,
	type InputEvent,
	type SessionClock,
	type SessionStart,
	type Mapping,
	type RigChangesEmitted,
	type RigState,
	type SessionEvent
} from '$lib/engine';
import { ControllerRig } from '$lib/midi/controller-rig.svelte';
import type { Decoded } from '$lib/midi/decode';
import type { HubEvent } from '$lib/midi/input-hub.svelte';
import { padLights } from '$lib/midi/pad-lights';
import { SessionRecorder } from '$lib/recorder/session-recorder.svelte';
import { LiveFindings } from './live-findings.svelte';
import { RoomClock } from './room-clock';
import { RoomSound } from './room-sound.svelte';
import { clampTempo, TapTempo } from './tap-tempo';

export const COUNT_IN_BEATS = 4;

/** What the room uses of the session recorder (SessionRecorder fits it; tests pass a stand-in). */
export type RoomRecorder = Pick<
	SessionRecorder,
	| 'status'
	| 'name'
	| 'eventCount'
	| 'unsent'
	| 'offline'
	| 'error'
	| 'uploadProgress'
	| 'refused'
	| 'elapsed'
	| 'start'
	| 'record'
	| 'stop'
	| 'discard'
	| 'resume'
	| 'attachAudio'
	| 'dispose'
>;

export interface RoomOptions {
	mappingId: string;
	mapping: Mapping;
	/** The performance clock (ms); MIDI, pointer and key timestamps are on it. */
	now?: () => number;
	/** A recorder, or one made with the room's hooks (the take's start and beat clock). */
	recorder?: RoomRecorder | ((hooks: RecorderHooks) => RoomRecorder);
	controllers?: ControllerRig;
}

export interface RecorderHooks {
	tempo: () => number;
	snapshot: () => { clock: SessionClock; initial: SessionStart } | undefined;
	clock: () => SessionClock | undefined;
}

type Recordable = { midi?: number[]; input: SessionEvent['input']; t: number };

export class RehearsalRoom {
	readonly mapping: Mapping;
	readonly controllers: ControllerRig;
	readonly recorder: RoomRecorder;
	readonly findings: LiveFindings;
	readonly clock: RoomClock;
	readonly sound: RoomSound;
	state = $state.raw<RigState>() as RigState;
	events = $state(0);
	tempo = $state(120);
	beat = $state(0);
	elapsedTenths = $state(0);
	countInOn = $state(true);
	beatsToGo = $state<number | null>(null);
	captureAudio = $state(false);
	resumed = $state(false);
	saved = $state<{ id: string; findings: number } | null>(null);

	#now: () => number;
	#t0: number;
	#lastT = 0;
	#actor: Actor<typeof rigMachine> | null = null;
	#inputs: InputEvent[] = [];
	#landed: boolean[] = [];
	#midiEvent: Recordable | null = null;
	#stops: (() => void)[] = [];
	#frame = 0;
	#countInTimer: ReturnType<typeof setTimeout> | undefined;
	#countIn: { from: number; to: number } | null = null;
	#taps = new TapTempo();
	#take: { start: number; clock: SessionClock } | null = null; // room time and beat clock of the recording

	constructor({ mappingId, mapping, now = () => performance.now(), recorder, controllers }: RoomOptions) {
		this.mapping = mapping;
		this.#now = now;
		this.#t0 = now();
		this.tempo = mapping.tempo ?? 120;
		this.clock = new RoomClock(this.tempo, 0);
		this.state = initialRigState(mapping);
		this.controllers = controllers ?? new ControllerRig(mapping.profile);
		const hooks: RecorderHooks = {
			tempo: () => this.clock.tempo,
			snapshot: () => this.#takeStart(),
			clock: () => this.#take?.clock
		};
		this.recorder =
			typeof recorder === 'function' ? recorder(hooks) : (recorder ?? new SessionRecorder({ mappingId, ...hooks }));
		this.findings = new LiveFindings(mapping);
		this.sound = new RoomSound(this.clock, () => this.roomNow());
	}

	/** Milliseconds since the room opened: the clock of the rig actor and of live findings. */
	roomNow(): number {
		return this.#now() - this.#t0;
	}

	/** Pads whose effect sounds (a hold group's sounding pad). */
	get lit(): Set<string> {
		return padLights(this.mapping, this.state).lit;
	}

	/** Held pads of a hold group whose own setting is not the one sounding. */
	get dim(): Set<string> {
		return padLights(this.mapping, this.state).dim;
	}

	get held(): ReadonlySet<string> {
		return this.controllers.hub.held;
	}

	get recording(): boolean {
		return this.recorder.status === 'recording';
	}

	/** Browser only: starts the actor, listens to every source, asks for MIDI, resumes a recording. */
	async start(): Promise<void> {
		if (this.#actor) return;
		this.#actor = createActor(rigMachine, {
			input: { mapping: this.mapping, tempo: this.clock.tempo, origin: this.clock.origin }
		});
		this.#stops.push(
			this.#actor.on('changes', (e) => this.#landedEvent(e)).unsubscribe,
			this.controllers.hub.subscribe((e) => this.#received(e)),
			this.controllers.onDecoded((_port, decoded, t) => this.#decoded(decoded, t))
		);
		this.#actor.start();
		this.#tick();
		await Promise.all([this.controllers.start(), this.recorder.resume().then((r) => (this.resumed = r))]);
	}

	press(input: string, source: string, t?: number): void {
		this.controllers.hub.press(source, input, t);
	}

	release(input: string, source: string, t?: number): void {
		this.controllers.hub.release(source, input, t);
	}

	setTempo(bpm: number): void {
		const next = clampTempo(bpm);
		if (!Number.isFinite(next) || next === this.clock.tempo) return;
		const now = this.roomNow();
		this.clock.retime(next, now);
		this.tempo = next;
		this.#actor?.send({ type: 'tempo', bpm: next, origin: this.clock.origin, at: now });
		if (this.#take) this.#take.clock = withTempo(this.#take.clock, next, now - this.#take.start);
		this.sound.retime(next, now);
	}

	tap(): void {
		const bpm = this.#taps.tap(this.roomNow());
		if (bpm !== null) this.setTempo(bpm);
	}

	startSound(): Promise<void> {
		return this.sound.start(
			this.state,
			() => {
				const now = this.roomNow();
				this.clock.origin = now;
				this.#actor?.send({ type: 'tempo', bpm: this.clock.tempo, origin: now });
				return now;
			},
			mappingReach(this.mapping)
		);
	}

	/**
	 * Puts beat 0 of the rig's beat clock and of the take's clock at room time `zeroRoom` (a beat
	 * line of the room's clock, so every grid line after it stays where it was), at the current
	 * tempo. A drill's practice run puts it on the drill's beat 0, so the session document says
	 * where beat 0 is (DESIGN.md §4.8). Answers that time on the take's clock, or null when no
	 * take is being recorded.
	 */
	anchorTake(zeroRoom: number): number | null {
		if (!this.#take) return null;
		const zero = Math.round((zeroRoom - this.#take.start) * 1000) / 1000;
		this.#take.clock = { zero, tempos: [{ at: zero, bpm: this.clock.tempo }] };
		this.#actor?.send({ type: 'tempo', bpm: this.clock.tempo, origin: zeroRoom });
		return zero;
	}

	/** Starts recording, after a one-bar count-in when that is on. */
	record(name: string): void {
		if (this.recorder.status === 'recording' || this.recorder.status === 'starting' || this.beatsToGo !== null) return;
		this.saved = null;
		this.resumed = false;
		const begin = () => {
			this.#countIn = null;
			this.beatsToGo = null;
			const stream = this.captureAudio ? this.sound.captureStream() : null;
			if (stream) this.recorder.attachAudio(stream);
			void this.recorder.start(name);
		};
		if (!this.countInOn) return begin();
		const from = Math.ceil(this.clock.beatAt(this.roomNow()));
		const to = from + COUNT_IN_BEATS;
		this.sound.countIn(from, to);
		this.#countIn = { from, to };
		this.beatsToGo = COUNT_IN_BEATS;
		this.#countInTimer = setTimeout(begin, Math.max(0, this.clock.timeOfBeat(to) - this.roomNow()));
	}

	async stopRecording(name: string): Promise<void> {
		if (this.beatsToGo !== null) {
			clearTimeout(this.#countInTimer);
			this.sound.countIn(0, 0);
			this.#countIn = null;
			this.beatsToGo = null;
			return;
		}
		const result = await this.recorder.stop(name);
		if (result) this.saved = result;
	}

	/** Throws away a take that recorded nothing (the recorder refuses one with events). */
	discardRecording(): Promise<void> {
		return this.recorder.discard();
	}

	/** Lets go of every pad and puts the rig back to its start; not while recording. */
	reset(): void {
		if (this.recording || !this.#actor) return;
		this.controllers.hub.releaseAll();
		this.#actor.send({ type: 'reset' });
		this.#inputs = [];
		this.#landed = [];
		this.events = 0;
		this.state = initialRigState(this.mapping);
		this.findings.reset();
		this.controllers.show(this.lit, this.dim);
		this.sound.sync(this.state);
	}

	/** The rig and beat clock as they stand now, on the clock of a take starting now. */
	#takeStart() {
		if (!this.#actor) return undefined;
		const now = this.roomNow();
		const { state, clock } = this.#actor.getSnapshot().context;
		const start = sessionStart(state, clock, now);
		this.#take = { start: now, clock: start.clock };
		return start;
	}

	#received(e: HubEvent): void {
		const t = Math.max(this.#lastT, e.t - this.#t0);
		this.#lastT = t;
		const event: InputEvent =
			e.value === undefined ? { t, input: e.input, type: e.type } : { t, input: e.input, type: e.type, value: e.value };
		const input =
			e.value === undefined ? { input: e.input, type: e.type } : { input: e.input, type: e.type, value: e.value };
		const recordable: Recordable = { input, t: this.#recorderTime(e.t) };
		if (e.source.startsWith('midi:')) {
			// The bytes arrive in the decoded callback right after this; a release without a message
			// (a device unplugged mid-hold) is recorded on its own.
			this.#flushMidi();
			this.#midiEvent = recordable;
			queueMicrotask(() => this.#flushMidi());
		} else this.#record(recordable);
		this.#inputs.push(event);
		this.#actor?.send({ type: 'input', event, index: this.#inputs.length - 1 });
	}

	#decoded(decoded: Decoded, t: number): void {
		if (decoded.status === 'error' || decoded.message.kind === 'system') return;
		const pending = this.#midiEvent;
		this.#midiEvent = null;
		// A message the hub didn't turn into an event (unmapped, or a pad already held elsewhere).
		this.#record({
			midi: decoded.message.bytes,
			input: pending?.input ?? null,
			t: pending?.t ?? this.#recorderTime(t)
		});
	}

	/** A performance-clock time (a MIDI, pointer or key timestamp) on the recording's clock. */
	#recorderTime(perfTime: number): number {
		return Math.max(0, this.recorder.elapsed() - (this.#now() - perfTime));
	}

	#flushMidi(): void {
		if (this.#midiEvent) this.#record(this.#midiEvent);
		this.#midiEvent = null;
	}

	#record(e: Recordable): void {
		if (this.recorder.status === 'recording') this.recorder.record(e);
	}

	#landedEvent(e: RigChangesEmitted): void {
		this.#landed[e.index] = true;
		this.state = e.state;
		this.events = this.#landed.length;
		this.controllers.show(this.lit, this.dim);
		if (e.changes.length) this.sound.apply(e.changes);
		const event = this.#inputs[e.index];
		if (event) this.findings.follow(e, event, () => this.#inputs.filter((_, i) => this.#landed[i]), this.clock);
	}

	#tick = () => {
		const now = this.roomNow();
		const beat = Math.floor(this.clock.beatAt(now));
		if (beat !== this.beat) this.beat = beat;
		const tenths = Math.floor(this.recorder.elapsed() / 100);
		if (tenths !== this.elapsedTenths) this.elapsedTenths = tenths;
		const count = this.#countIn;
		if (count) {
			const left = count.to - Math.max(count.from, beat);
			this.beatsToGo = Math.min(COUNT_IN_BEATS, Math.max(1, left));
		}
		if (typeof requestAnimationFrame !== 'undefined') this.#frame = requestAnimationFrame(this.#tick);
	};

	dispose(): void {
		clearTimeout(this.#countInTimer);
		if (typeof cancelAnimationFrame !== 'undefined') cancelAnimationFrame(this.#frame);
		for (const stop of this.#stops.splice(0)) stop();
		this.controllers.stop();
		this.#actor?.stop();
		this.#actor = null;
		this.sound.dispose();
		this.recorder.dispose();
	}
}
