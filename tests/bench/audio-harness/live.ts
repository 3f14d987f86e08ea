// The live path measured in a real-time context: a pad event arrives (a timer callback standing in
// for a MIDI message), goes through the engine's live rig actor, and the audio rig schedules its
// changes. Added delay = the context time the changes land at − the context time when the event
// arrived. They land at the time the rig scheduled them, or — when building the change took so
// long that this time is already rendered — at the block rendered after the rig's last call (Web
// Audio clamps a past automation time to the current time, AudioParam §"startTime"), so the landing
// time is max(scheduled, currentTime when the event's handling returned).
// Also reports the context's baseLatency and outputLatency (see measureOutputLatency).
import { createActor } from 'xstate';
import { getContext, start } from 'tone';
import { AudioRig } from '$lib/audio/rig';
import { findLoop } from '$lib/audio/loops/patterns';
import { demoMapping } from '$lib/engine/demo';
import { rigMachine } from '$lib/engine/machines/rig';
import { initialRigState } from '$lib/engine/rig';
import { mappingReach } from '$lib/engine/reach';

export interface LiveMeasure {
	addedMs: number[];
	/** The part of addedMs that is the time the rig was given (scheduled − arrival), for comparison. */
	scheduledMs: number[];
	/** Main-thread time the event's handling took, ms. */
	handlingMs: number[];
	baseLatencyMs: number;
	outputLatencyMs: number;
	sampleRate: number;
	/** Effect instances built before play, and the time that took (ms). */
	prepared: number;
	prepareMs: number;
}

const wait = (ms: number) => new Promise((r) => setTimeout(r, ms));

export async function measureLive(events: number): Promise<LiveMeasure> {
	await start();
	const context = getContext();
	const raw = context.rawContext as AudioContext;
	const mapping = demoMapping('two-deck');
	const rig = await AudioRig.create({
		tempo: mapping.tempo,
		origin: context.currentTime,
		live: true,
		state: initialRigState(mapping)
	});
	// As the rehearsal room does when sound starts: build what the mapping may load before play.
	const prepareStarted = performance.now();
	const prepared = rig.prepare(mappingReach(mapping));
	const prepareMs = performance.now() - prepareStarted;
	rig.master.setLevel(-40, context.currentTime);
	rig.master.output.toDestination();
	rig.setLoop('A', findLoop('glass-steps'));
	const actor = createActor(rigMachine, { input: { mapping } });
	actor.on('changes', (e) => {
		if (e.changes.length) rig.apply(e.changes);
	});
	actor.start();
	await wait(300); // let the context run
	const t0 = performance.now();
	const addedMs: number[] = [];
	const scheduledMs: number[] = [];
	const handlingMs: number[] = [];
	// Pads 1–8: one-press effects, unquantized, pressed and released in turn.
	for (let i = 0; i < events; i++) {
		await wait(8 + (i % 7) * 3);
		const arrived = raw.currentTime;
		const started = performance.now();
		const input = `pad-${1 + ((i >> 1) % 8)}`;
		rig.lastScheduled = -1;
		actor.send({ type: 'input', event: { t: performance.now() - t0, input, type: i % 2 ? 'release' : 'press' } });
		const returned = raw.currentTime;
		if (rig.lastScheduled < 0) continue;
		handlingMs.push(performance.now() - started);
		scheduledMs.push((rig.lastScheduled - arrived) * 1000);
		addedMs.push((Math.max(rig.lastScheduled, returned) - arrived) * 1000);
	}
	actor.stop();
	rig.dispose();
	const latency = await measureOutputLatency(context.latencyHint);
	return {
		addedMs,
		scheduledMs,
		handlingMs,
		baseLatencyMs: typeof raw.baseLatency === 'number' ? raw.baseLatency * 1000 : latency.baseLatencyMs,
		outputLatencyMs: typeof raw.outputLatency === 'number' ? raw.outputLatency * 1000 : latency.outputLatencyMs,
		sampleRate: raw.sampleRate,
		prepared,
		prepareMs
	};
}

/**
 * Tone's context wraps the browser's AudioContext (standardized-audio-context), and the wrapper
 * has no `outputLatency`. A plain AudioContext with the same latency hint, on the same output,
 * reports the browser's figures; read once it has run for a moment (before that Chromium says 0).
 */
async function measureOutputLatency(hint: AudioContextLatencyCategory | number | string) {
	const native = new AudioContext({ latencyHint: (hint || 'interactive') as AudioContextLatencyCategory });
	try {
		await native.resume();
		await wait(300);
		return { baseLatencyMs: native.baseLatency * 1000, outputLatencyMs: native.outputLatency * 1000 };
	} finally {
		await native.close();
	}
}
