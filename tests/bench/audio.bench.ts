// audio.live_added_ms_p99 (and _p50): in a real-time context, pad event → the context time its
// changes land at, minus the context time when the event arrived (through the live rig actor and
// the audio rig; see audio-harness/live.ts), beside the browser's audio.base_latency_ms and
// audio.output_latency_ms. audio.live_scheduled_ms_p99 is the time the rig was given alone, and
// audio.live_handling_ms_p99 the main-thread time an event's handling took: where the two
// differ, building the change (not the clock) delayed it. audio.live_prepared_effects and
// audio.live_prepare_ms: the effect instances the rig built before play (as the room does when
// sound starts) and how long that took.
// Headless Chromium on a machine without a sound card plays into a fake output device and
// reports its latencies (seen here: base 10 ms, output ~32 ms at 44.1 kHz).
// audio.render_x_realtime: offline render speed in Chromium for four decks playing demo loops
// with four racks routed (one per deck: chains of three effects and one of a single effect), through the master.
// Serves the audio layer with an in-process Vite server (audio-harness/) and measures; it never
// asserts a speed.
import { chromium } from '@playwright/test';
import type { Figure } from './run';
import { serveHarness } from './audio-harness/serve';
import type { RenderSpec } from '../../src/lib/audio/render';
import { emptyPosition, loadedPosition } from '../../src/lib/engine/rig';
import { CHAIN_MAX, type EffectId, type RackState, type RigState } from '../../src/lib/engine/types';

const SECONDS = 30;
const LIVE_EVENTS = 400;

/** The value at or below which 99 % of the samples fall (nearest rank). */
function p99(values: number[]): number {
	const sorted = [...values].sort((a, b) => a - b);
	return sorted[Math.min(sorted.length - 1, Math.ceil(0.99 * sorted.length) - 1)];
}

function p50(values: number[]): number {
	const sorted = [...values].sort((a, b) => a - b);
	return sorted[Math.floor(sorted.length / 2)];
}

const round2 = (v: number) => Math.round(v * 100) / 100;

function rack(deck: 'A' | 'B' | 'C' | 'D', effects: EffectId[]): RackState {
	const chain = Array.from({ length: CHAIN_MAX }, (_, i) =>
		effects[i] ? loadedPosition(effects[i]) : emptyPosition()
	);
	const routes = { A: false, B: false, C: false, D: false, [deck]: true };
	return { on: true, mix: 0.5, chain, routes };
}

const playing = { playing: true };
const state: RigState = {
	racks: [
		rack('A', ['filter', 'echo', 'flanger']),
		rack('B', ['gate', 'ping-pong', 'phaser']),
		rack('C', ['stutter']),
		rack('D', ['bitcrush', 'tape-echo', 'reverb'])
	],
	decks: { A: playing, B: playing, C: playing, D: playing },
	counters: {},
	held: []
};

const spec: RenderSpec = {
	seconds: SECONDS,
	tempo: 126,
	decks: { A: { loop: 'glass-steps' }, B: { loop: 'night-bus' }, C: { loop: 'porch-light' }, D: { loop: 'coil-run' } },
	state,
	masterDb: -12
};

export default async function audioBench(report: (f: Figure) => void) {
	const { url, server } = await serveHarness();
	const browser = await chromium.launch({
		executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
		args: ['--no-sandbox', '--autoplay-policy=no-user-gesture-required']
	});
	try {
		const page = await browser.newPage();
		await page.goto(url);
		await page.waitForFunction(() => document.title === 'ready', null, { timeout: 120_000 });
		const run = () =>
			page.evaluate(
				(s) =>
					(
						window as unknown as { padproofSounds: { render: (s: unknown) => Promise<{ renderMs: number }> } }
					).padproofSounds.render(s),
				spec
			);
		await run(); // warm-up: module loading and JIT
		const times: number[] = [];
		for (let i = 0; i < 3; i++) times.push((await run()).renderMs);
		const median = times.sort((a, b) => a - b)[1];
		report({ name: 'audio.render_x_realtime', value: Math.round(((SECONDS * 1000) / median) * 10) / 10, unit: 'x' });

		const live = await page.evaluate(
			(n) =>
				(
					window as unknown as {
						padproofLive: (n: number) => Promise<{
							addedMs: number[];
							scheduledMs: number[];
							handlingMs: number[];
							baseLatencyMs: number;
							outputLatencyMs: number;
							prepared: number;
							prepareMs: number;
						}>;
					}
				).padproofLive(n),
			LIVE_EVENTS
		);
		if (live.addedMs.length < LIVE_EVENTS / 2) throw new Error(`only ${live.addedMs.length} live events scheduled`);
		report({ name: 'audio.live_added_ms_p99', value: round2(p99(live.addedMs)), unit: 'ms' });
		report({ name: 'audio.live_added_ms_p50', value: round2(p50(live.addedMs)), unit: 'ms' });
		report({ name: 'audio.live_scheduled_ms_p99', value: round2(p99(live.scheduledMs)), unit: 'ms' });
		report({ name: 'audio.live_handling_ms_p99', value: round2(p99(live.handlingMs)), unit: 'ms' });
		report({ name: 'audio.live_prepared_effects', value: live.prepared, unit: 'instances' });
		report({ name: 'audio.live_prepare_ms', value: round2(live.prepareMs), unit: 'ms' });
		// A browser that does not know a latency leaves it out.
		if (Number.isFinite(live.baseLatencyMs))
			report({ name: 'audio.base_latency_ms', value: round2(live.baseLatencyMs), unit: 'ms' });
		if (Number.isFinite(live.outputLatencyMs))
			report({ name: 'audio.output_latency_ms', value: round2(live.outputLatencyMs), unit: 'ms' });
	} finally {
		await browser.close();
		await server.close();
	}
}
