// Offline rendering (a Tone offline context): a rig built in an OfflineAudioContext, fed a start state and
// a list of engine changes, recorded at the master or at one deck's output. Used for WAV export
// of a rehearsal and by the browser tests that measure the sound.
import { OfflineContext, connect, getContext, setContext } from 'tone';
import type { RackReach } from '$lib/engine/reach';
import { runEvents } from '$lib/engine/replay';
import { initialRigState } from '$lib/engine/rig';
import { DECK_IDS, type DeckId, type InputEvent, type Mapping, type RigChange, type RigState } from '$lib/engine/types';
import { findLoop } from './loops/patterns';
import { AudioRig } from './rig';
import { quietRig } from './rig-state';
import { encodeWav } from './wav';

export interface DeckSetup {
	loop?: string; // a demo loop id
	samples?: number[][] | Float32Array[]; // a test signal instead of (or besides) the loop
	samplesAt?: number; // seconds
	levelDb?: number;
}

export interface RenderSpec {
	seconds: number;
	sampleRate?: number;
	tempo?: number;
	decks?: Partial<Record<DeckId, DeckSetup>>;
	state?: RigState;
	changes?: RigChange[];
	tempoChanges?: { t: number; bpm: number }[]; // t in ms on the session clock
	/** What is recorded: the master output, or one deck after its inserts (before the master). */
	tap?: 'master' | DeckId;
	masterDb?: number;
	lookAhead?: number;
	/** Effects to build before play, as the rehearsal room does (engine `mappingReach`). */
	prepare?: RackReach[];
}

export interface Rendered {
	sampleRate: number;
	channels: Float32Array[];
	lookAhead: number;
}

export const RENDER_RATE = 48000;

/**
 * Before rendering, Tone steps its clock through the whole duration (the gate writes its cycles
 * then). Stepping in one go saves a pause per second of audio (4 ms or more each, a tenth of a
 * short render); longer renders keep pausing so the page stays responsive.
 */
const SYNC_CLOCK_SECONDS = 60;

let queue: Promise<unknown> = Promise.resolve();

/** Renders one at a time: a render swaps Tone's current context while it is built. */
export function renderRig(spec: RenderSpec): Promise<Rendered> {
	const next = queue.then(() => renderNow(spec));
	queue = next.catch(() => undefined);
	return next;
}

async function renderNow(spec: RenderSpec): Promise<Rendered> {
	const sampleRate = spec.sampleRate ?? RENDER_RATE;
	const context = new OfflineContext(2, spec.seconds, sampleRate);
	const previous = getContext();
	setContext(context);
	let lookAhead: number;
	try {
		const rig = await AudioRig.create({
			tempo: spec.tempo ?? 120,
			state: spec.state ?? quietRig(),
			lookAhead: spec.lookAhead
		});
		lookAhead = rig.lookAhead;
		if (spec.prepare) rig.prepare(spec.prepare);
		rig.master.setLevel(spec.masterDb ?? 0, 0);
		for (const d of DECK_IDS) {
			const setup = spec.decks?.[d];
			if (setup?.loop) rig.setLoop(d, findLoop(setup.loop), 0);
			if (setup?.samples)
				rig.decks[d].playSamples(
					setup.samples.map((c) => Float32Array.from(c)),
					setup.samplesAt ?? 0
				);
			rig.decks[d].setLevel(setup?.levelDb ?? 0, 0);
		}
		for (const { t, bpm } of spec.tempoChanges ?? []) rig.setTempo(bpm, rig.timeOf(t));
		rig.apply(spec.changes ?? []);
		const tap = spec.tap ?? 'master';
		const out = tap === 'master' ? rig.master.output : rig.decks[tap].output;
		connect(out, rig.context.rawContext.destination);
		rig.startClock();
	} finally {
		setContext(previous);
	}
	const buffer = await context.render(spec.seconds > SYNC_CLOCK_SECONDS);
	const channels = [0, 1].map((c) => Float32Array.from(buffer.getChannelData(c)));
	return { sampleRate, channels, lookAhead };
}

/**
 * Runs a session's input events through the engine — the same loop replay uses, so quantized
 * presses land on the beat grid of `tempo` — and collects the changes the rig follows.
 */
export function sessionChanges(
	mapping: Mapping,
	events: InputEvent[],
	tempo?: number
): { start: RigState; changes: RigChange[] } {
	const start = initialRigState(mapping);
	const changes: RigChange[] = [];
	runEvents(mapping, events, { tempo, from: start }, (result) => changes.push(...result.changes));
	return { start, changes };
}

export interface SessionRender {
	mapping: Mapping;
	events: InputEvent[];
	loops?: Partial<Record<DeckId, string>>;
	tempo?: number;
	tailSeconds?: number;
}

/** A mapping + session rendered through the master to a 16-bit WAV file. */
export async function renderSessionWav({
	mapping,
	events,
	loops,
	tempo,
	tailSeconds = 2
}: SessionRender): Promise<Uint8Array> {
	const { start, changes } = sessionChanges(mapping, events, tempo);
	const last = events.reduce((m, e) => Math.max(m, e.t), 0);
	const decks: RenderSpec['decks'] = {};
	for (const d of DECK_IDS) if (loops?.[d]) decks[d] = { loop: loops[d] };
	const rendered = await renderRig({
		seconds: last / 1000 + tailSeconds,
		tempo: tempo ?? mapping.tempo ?? 120,
		decks,
		state: start,
		changes,
		masterDb: -12
	});
	return encodeWav(rendered.channels, rendered.sampleRate);
}
