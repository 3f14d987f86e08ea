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
		args: ['--no-sandbox']
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
	} finally {
		await browser.close();
		await server.close();
	}
}
