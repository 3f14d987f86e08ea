// The live path measured in a real-time context: a pad event arrives (a timer callback standing in
// for a MIDI message), goes through the engine's live rig actor, and the audio rig schedules its
// changes. Added delay = the context time the changes are scheduled at − the context time when
// the event arrived. Also reports the context's own baseLatency and outputLatency.
import { createActor } from 'xstate';
import { getContext, start } from 'tone';
import { AudioRig } from '$lib/audio/rig';
import { findLoop } from '$lib/audio/loops/patterns';
import { demoMapping } from '$lib/engine/demo';
import { rigMachine } from '$lib/engine/machines/rig';
import { initialRigState } from '$lib/engine/rig';

export interface LiveMeasure {
	addedMs: number[];
	baseLatencyMs: number;
	outputLatencyMs: number;
	sampleRate: number;
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
	// Pads 1–8: one-press effects, unquantized, pressed and released in turn.
	for (let i = 0; i < events; i++) {
		await wait(8 + (i % 7) * 3);
		const arrived = raw.currentTime;
		const input = `pad-${1 + ((i >> 1) % 8)}`;
		rig.lastScheduled = -1;
		actor.send({ type: 'input', event: { t: performance.now() - t0, input, type: i % 2 ? 'release' : 'press' } });
		if (rig.lastScheduled >= 0) addedMs.push((rig.lastScheduled - arrived) * 1000);
	}
	actor.stop();
	rig.dispose();
	return {
		addedMs,
		baseLatencyMs: typeof raw.baseLatency === 'number' ? raw.baseLatency * 1000 : NaN,
		outputLatencyMs: typeof raw.outputLatency === 'number' ? raw.outputLatency * 1000 : NaN,
		sampleRate: raw.sampleRate
	};
}
