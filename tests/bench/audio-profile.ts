// Where offline render time goes: `npx tsx tests/bench/audio-profile.ts [seconds] [case] [runs]` renders the
// bench's four decks with nothing routed, then with each catalog effect alone on deck A, and the
// full bench rig, printing render milliseconds and the audio nodes each render created. A
// profiling aid for the audio layer, not a benchmark (run.ts only picks up *.bench.ts).
import { chromium } from '@playwright/test';
import { serveHarness } from './audio-harness/serve';
import type { RenderSpec } from '../../src/lib/audio/render';
import { emptyPosition, loadedPosition } from '../../src/lib/engine/rig';
import { CHAIN_MAX, EFFECT_IDS, type EffectId, type RackState, type RigState } from '../../src/lib/engine/types';

const SECONDS = Number(process.argv[2] ?? 10);
const ONLY = process.argv[3]; // a case name to profile alone
const RUNS = Number(process.argv[4] ?? 3);

function rack(deck: 'A' | 'B' | 'C' | 'D', effects: EffectId[]): RackState {
	const chain = Array.from({ length: CHAIN_MAX }, (_, i) =>
		effects[i] ? loadedPosition(effects[i]) : emptyPosition()
	);
	const routes = { A: false, B: false, C: false, D: false, [deck]: true };
	return { on: true, mix: 0.5, chain, routes };
}

const off = (): RackState => ({
	...rack('A', []),
	on: false,
	routes: { A: false, B: false, C: false, D: false }
});
const playing = { playing: true };
const rig = (racks: RackState[]): RigState => ({
	racks: [...racks, off(), off(), off(), off()].slice(0, 4),
	decks: { A: playing, B: playing, C: playing, D: playing },
	counters: {},
	held: []
});

const decks: RenderSpec['decks'] = {
	A: { loop: 'glass-steps' },
	B: { loop: 'night-bus' },
	C: { loop: 'porch-light' },
	D: { loop: 'coil-run' }
};
const cases: [string, RigState][] = [
	['decks only', rig([])],
	...EFFECT_IDS.map((e): [string, RigState] => [e, rig([rack('A', [e])])]),
	[
		'bench rig',
		rig([
			rack('A', ['filter', 'echo', 'flanger']),
			rack('B', ['gate', 'ping-pong', 'phaser']),
			rack('C', ['stutter']),
			rack('D', ['bitcrush', 'tape-echo', 'reverb'])
		])
	]
];

// A string, not a function: tsx would wrap a serialized function's classes in its own helpers.
const COUNT_NODES = `
	const counts = (window.nodeCounts = {});
	const proto = BaseAudioContext.prototype;
	for (const name of Object.getOwnPropertyNames(proto)) {
		const original = Object.getOwnPropertyDescriptor(proto, name).value;
		if (!name.startsWith('create') || typeof original !== 'function') continue;
		proto[name] = function (...args) {
			counts[name] = (counts[name] ?? 0) + 1;
			return original.apply(this, args);
		};
	}
	const Worklet = window.AudioWorkletNode;
	window.AudioWorkletNode = class extends Worklet {
		constructor(...args) {
			super(...args);
			counts.worklet = (counts.worklet ?? 0) + 1;
		}
	};
`;

const { url, server } = await serveHarness();
const browser = await chromium.launch({
	executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
	args: ['--no-sandbox']
});
try {
	const page = await browser.newPage();
	await page.addInitScript({ content: COUNT_NODES });
	await page.goto(url);
	await page.waitForFunction(() => document.title === 'ready', null, { timeout: 120_000 });
	const run = (state: RigState) =>
		page.evaluate(
			async (s) => {
				const w = window as unknown as {
					nodeCounts: Record<string, number>;
					padproofSounds: { render: (s: unknown) => Promise<{ renderMs: number }> };
				};
				for (const k of Object.keys(w.nodeCounts)) delete w.nodeCounts[k];
				const { renderMs } = await w.padproofSounds.render(s);
				const nodes = Object.values(w.nodeCounts).reduce((a, b) => a + b, 0);
				return { renderMs, nodes, counts: { ...w.nodeCounts } };
			},
			{ seconds: SECONDS, tempo: 126, decks, state, masterDb: -12 } satisfies RenderSpec
		);
	await run(cases[0][1]);
	for (const [name, state] of cases.filter(([n]) => !ONLY || n === ONLY || n === 'decks only')) {
		const runs = [];
		for (let i = 0; i < RUNS; i++) runs.push(await run(state));
		const [a] = runs;
		const ms = Math.min(...runs.map((r) => r.renderMs)); // the least disturbed run on a shared machine
		console.log(
			`${name.padEnd(12)} ${ms.toFixed(0).padStart(6)} ms  ${((SECONDS * 1000) / ms).toFixed(1).padStart(6)}x  nodes ${a.nodes}  ${JSON.stringify(a.counts)}`
		);
	}
} finally {
	await browser.close();
	await server.close();
}
