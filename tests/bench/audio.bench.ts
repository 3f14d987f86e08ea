// audio.render_x_realtime: offline render speed in Chromium for four decks playing demo loops
// with four racks routed (one per deck: chain of three, and focus effects), through the master.
// Serves the audio layer with an in-process Vite server (audio-harness/) and measures; it never
// asserts a speed.
import { chromium } from '@playwright/test';
import type { Figure } from './run';
import { serveHarness } from './audio-harness/serve';
import type { RenderSpec } from '../../src/lib/audio/render';
import type { EffectId, RackState, RigState } from '../../src/lib/engine/types';

const SECONDS = 30;

function rack(deck: 'A' | 'B' | 'C' | 'D', mode: 'chain' | 'focus', effects: EffectId[]): RackState {
	const slots = [0, 1, 2].map((i) => ({ effect: effects[i] ?? null, on: i < effects.length, amount: 0.6 }));
	const routes = { A: false, B: false, C: false, D: false, [deck]: true };
	return { on: true, mix: 0.5, mode, slots, params: [0.5, 0.5, 0.5], routes };
}

const playing = { playing: true };
const state: RigState = {
	racks: [
		rack('A', 'chain', ['filter', 'echo', 'flanger']),
		rack('B', 'chain', ['gate', 'ping-pong', 'phaser']),
		rack('C', 'focus', ['stutter']),
		rack('D', 'chain', ['bitcrush', 'tape-echo', 'reverb'])
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
