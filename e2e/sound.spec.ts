// Sound (issue 4): renders offline in real Chromium through the /sounds page's scripting handle
// (`window.padproofSounds`) and measures the samples here. Every check value names its source.
import { expect, test, type Browser, type Page } from '@playwright/test';
import wavefile from 'wavefile';
import { paramForDivision } from '../src/lib/engine/effects';
import { emptyPosition, loadedPosition } from '../src/lib/engine/rig';
import { EFFECT_IDS, type EffectId, type RackState, type RigChange, type RigState } from '../src/lib/engine/types';
import type { RenderSpec } from '../src/lib/audio/render';
import * as M from '../src/lib/audio/measure';
import { signIn } from './support';

const RATE = 48000; // every render here runs at 48 kHz, so 1 ms = 48 frames
const QUANTUM = 128; // Web Audio API §2.4: audio is rendered in blocks of 128 sample-frames

let page: Page;

test.describe.configure({ mode: 'serial' });

test.beforeAll(async ({ browser }: { browser: Browser }) => {
	page = await browser.newPage();
	await signIn(page, 'student');
	await page.goto('/sounds');
	await page.waitForFunction(() => 'padproofSounds' in window);
});

test.afterAll(async () => {
	await page.close();
});

interface Handle {
	padproofSounds: { render: (s: unknown) => Promise<{ channels: string[]; lookAhead: number }> };
}

async function evaluateRender(spec: RenderSpec) {
	return page.evaluate((s) => (window as unknown as Handle).padproofSounds.render(s), spec);
}

async function render(spec: RenderSpec) {
	// Under `vite dev` another file's edit can reload the page mid-render; start that render again.
	const out = await evaluateRender(spec).catch(async (error: Error) => {
		if (!/context was destroyed/.test(error.message)) throw error;
		await page.waitForFunction(() => 'padproofSounds' in window);
		return evaluateRender(spec);
	});
	const channels = out.channels.map((b64) => {
		const bytes = Buffer.from(b64, 'base64');
		return new Float32Array(bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength));
	});
	return { channels, lookAhead: out.lookAhead };
}

function rack(patch: Partial<RackState> = {}): RackState {
	return {
		on: false,
		mix: 0.5,
		chain: [0, 1, 2, 3].map(emptyPosition),
		routes: { A: false, B: false, C: false, D: false },
		...patch
	};
}

/** A rack on deck A whose chain holds `effects` in order, each with its own parameters. */
function chained(effects: [EffectId, number[]][], patch: Partial<RackState> = {}): RackState {
	const r = rack({ on: true, mix: 1, routes: { A: true, B: false, C: false, D: false }, ...patch });
	effects.forEach(([effect, params], i) => (r.chain[i] = { ...loadedPosition(effect), params: [...params] }));
	return r;
}

/** A one-effect chain with its three parameters. */
function focus(effect: EffectId, params: number[], patch: Partial<RackState> = {}): RackState {
	return chained([[effect, params]], patch);
}

function rig(first: RackState = rack()): RigState {
	const playing = { playing: true };
	return {
		racks: [first, rack()],
		decks: { A: playing, B: playing, C: playing, D: playing },
		counters: {},
		held: []
	};
}

// A click, then a floor far below every threshold here (−120 dBFS) to the end of the render: Chromium 150
// renders a delay line silent once its input has ended, which would hide the echoes being measured.
const clickTail = () => Array.from({ length: Math.round(RATE * 1.5) }, (_, i) => (i === 0 ? 1 : 1e-6));
const click = (at: number): RenderSpec['decks'] => ({ A: { samples: [clickTail(), clickTail()], samplesAt: at } });
const noise = (seconds: number) => Array.from(M.seededNoise(Math.round(seconds * RATE), 9));

/** Indexes of the peaks above `threshold`, each the largest sample of its burst. */
function peaks(x: Float32Array, threshold: number, count: number): number[] {
	const found: number[] = [];
	let i = 0;
	while (found.length < count && (i = M.firstAbove(x, threshold, i)) >= 0) {
		const p = M.argPeak(x, i, Math.min(x.length, i + 48));
		found.push(p);
		i = p + 480;
	}
	return found;
}

const ms = (frames: number) => (frames / RATE) * 1000;

test('echo at 1/8 and 128 BPM repeats a click 234.375 ms after it', async () => {
	const time = paramForDivision('echo', 1, '1/8');
	const { channels } = await render({
		seconds: 1.2,
		tempo: 128,
		tap: 'A',
		decks: click(0.1),
		state: rig(focus('echo', [time, 0.6, 1], { mix: 0.5 }))
	});
	const [direct, first, second] = peaks(channels[0], 0.05, 3);
	expect(ms(direct)).toBeCloseTo(100, 3);
	// Tempo arithmetic (REFERENCES.md): 1/8 = 0.125 × 240000 / 128 = 234.375 ms; ±1 ms from the issue.
	expect(Math.abs(ms(first - direct) - 234.375)).toBeLessThanOrEqual(1);
	// Repeats fed back through the loop keep the same spacing (same source, same tolerance).
	expect(Math.abs(ms(second - first) - 234.375)).toBeLessThanOrEqual(1);
});

test('equal-power mix at 0.5 puts dry and wet each at 0.7071', async () => {
	const time = paramForDivision('echo', 1, '1/8');
	const { channels } = await render({
		seconds: 0.6,
		tempo: 120,
		tap: 'A',
		decks: click(0.1),
		state: rig(focus('echo', [time, 0, 1], { mix: 0.5 }))
	});
	const x = channels[0];
	const dry = x[Math.round(0.1 * RATE)];
	const wet = x[Math.round((0.1 + 0.25) * RATE)]; // 1/8 at 120 BPM = 250 ms (tempo arithmetic)
	// Web Audio API equal-power law: cos(0.5·π/2) = sin(0.5·π/2) = 0.70711; ±0.001 from the issue.
	expect(Math.abs(dry - 0.70711)).toBeLessThanOrEqual(0.001);
	expect(Math.abs(wet - 0.70711)).toBeLessThanOrEqual(0.001);
});

test('equal-power mix at 0.25 follows the same law', async () => {
	const time = paramForDivision('echo', 1, '1/8');
	const { channels } = await render({
		seconds: 0.6,
		tempo: 120,
		tap: 'A',
		decks: click(0.1),
		state: rig(focus('echo', [time, 0, 1], { mix: 0.25 }))
	});
	const x = channels[0];
	// Web Audio API equal-power law (derived): cos(π/8) = 0.92388, sin(π/8) = 0.38268.
	expect(Math.abs(x[Math.round(0.1 * RATE)] - 0.92388)).toBeLessThanOrEqual(0.001);
	expect(Math.abs(x[Math.round(0.35 * RATE)] - 0.38268)).toBeLessThanOrEqual(0.001);
});

test('ping-pong echo answers left first, then right', async () => {
	const time = paramForDivision('ping-pong', 1, '1/8');
	const { channels } = await render({
		seconds: 1.3,
		tempo: 120,
		tap: 'A',
		decks: click(0.1),
		state: rig(focus('ping-pong', [time, 0.6, 1]))
	});
	const [left, right] = channels.map((c) => peaks(c, 0.02, 2));
	// Tempo arithmetic: 1/8 at 120 BPM = 250 ms after the click at 100 ms, then every 1/8 the
	// other side: left 350, right 600, left 850, right 1100 (±1 ms as for the echo).
	expect([left.length, right.length]).toEqual([2, 2]);
	left.forEach((i, k) => expect(Math.abs(ms(i) - [350, 850][k])).toBeLessThanOrEqual(1));
	right.forEach((i, k) => expect(Math.abs(ms(i) - [600, 1100][k])).toBeLessThanOrEqual(1));
});

test('beat-synced echo follows a tempo change', async () => {
	const time = paramForDivision('echo', 1, '1/8');
	const { channels, lookAhead } = await render({
		seconds: 1.6,
		tempo: 120,
		tap: 'A',
		decks: click(1.0),
		tempoChanges: [{ t: 500, bpm: 128 }],
		state: rig(focus('echo', [time, 0, 1], { mix: 0.5 }))
	});
	expect(lookAhead).toBeLessThan(0.5);
	const [direct, first] = peaks(channels[0], 0.05, 2);
	// Tempo arithmetic: after the change to 128 BPM, 1/8 = 234.375 ms (not 250 ms at 120 BPM).
	expect(Math.abs(ms(first - direct) - 234.375)).toBeLessThanOrEqual(1);
});

test('stutter at 1/16 and 120 BPM repeats with a 125 ms period', async () => {
	const slice = paramForDivision('stutter', 1, '1/16');
	const changes: RigChange[] = [{ t: 300, event: 0, path: 'racks.0.on', from: false, to: true }];
	const input = noise(1.4);
	const { channels, lookAhead } = await render({
		seconds: 1.4,
		tempo: 120,
		tap: 'A',
		decks: { A: { samples: [input, input] } },
		state: rig(focus('stutter', [slice, 0, 0], { on: false })),
		changes
	});
	const x = channels[0];
	const from = Math.round((0.3 + lookAhead + 0.2) * RATE);
	// Tempo arithmetic: 1/16 at 120 BPM = 125 ms; autocorrelation peak ±1 ms from the issue.
	const { lag, score } = M.autocorrelationPeriod(x, 60 * 48, 200 * 48, from, from + 24000);
	expect(Math.abs(ms(lag) - 125)).toBeLessThanOrEqual(1);
	expect(score).toBeGreaterThan(0.9);
	// What repeats is the input's slice from the event's scheduled frame on (the input noise
	// itself is not periodic, so the match can only come from the capture).
	const start = Math.round((0.3 + lookAhead) * RATE);
	const captured = input.slice(start, start + 6000);
	const thirdRepeat = x.subarray(start + 6000 * 3, start + 6000 * 4);
	expect(M.maxDifferenceDb(captured, thirdRepeat)).toBeLessThan(-90);
});

test('gate at 1/8 and 120 BPM chops with a 250 ms energy period', async () => {
	const rate = paramForDivision('gate', 1, '1/8');
	const { channels } = await render({
		seconds: 2.2,
		tempo: 120,
		tap: 'A',
		decks: { A: { samples: [noise(2.2), noise(2.2)] } },
		state: rig(focus('gate', [rate, 1, 0.3]))
	});
	const envelope = M.centred(M.energyEnvelope(channels[0], 48, 0, 2.2 * RATE)); // 1 ms hops
	const { lag, score } = M.autocorrelationPeriod(envelope, 100, 400, 100, envelope.length - 400);
	// Tempo arithmetic: 1/8 at 120 BPM = 250 ms.
	expect(Math.abs(lag - 250)).toBeLessThanOrEqual(1);
	expect(score).toBeGreaterThan(0.8);
});

test('a rack routed to deck A changes A and leaves deck B unchanged', async () => {
	const time = paramForDivision('echo', 1, '1/8');
	const decks: RenderSpec['decks'] = { A: { loop: 'glass-steps' }, B: { loop: 'night-bus' } };
	const withRack = rig(focus('echo', [time, 0.6, 0.8], { mix: 0.6 }));
	const [bWith, bWithout, aWith, aWithout] = await Promise.all([
		render({ seconds: 1.5, tap: 'B', decks, state: withRack }),
		render({ seconds: 1.5, tap: 'B', decks, state: rig() }),
		render({ seconds: 1.5, tap: 'A', decks, state: withRack }),
		render({ seconds: 1.5, tap: 'A', decks, state: rig() })
	]);
	// Issue 4: B sample-identical, or within −90 dB.
	for (const c of [0, 1]) expect(M.maxDifferenceDb(bWith.channels[c], bWithout.channels[c])).toBeLessThanOrEqual(-90);
	expect(M.maxDifferenceDb(aWith.channels[0], aWithout.channels[0])).toBeGreaterThan(-20);
});

for (const [effect, params, mix] of [
	['stutter', [paramForDivision('stutter', 1, '1/16'), 0, 0], 0.5],
	['filter', [0.1, 0.3, 0], 1]
] as const) {
	test(`rack on and ${effect} position on in one event: wet starts within one render quantum`, async () => {
		const start = focus(effect, [...params], { on: false, mix });
		start.chain[0].on = false;
		const changes: RigChange[] = [
			{ t: 500, event: 0, path: 'racks.0.on', from: false, to: true },
			{ t: 500, event: 0, path: 'racks.0.chain.0.on', from: false, to: true }
		];
		const decks = { A: { samples: [noise(1), noise(1)] } };
		const [on, off] = await Promise.all([
			render({ seconds: 1, tempo: 120, tap: 'A', decks, state: rig(start), changes }),
			render({ seconds: 1, tempo: 120, tap: 'A', decks, state: rig(start) })
		]);
		const scheduled = Math.round((0.5 + on.lookAhead) * RATE); // event time (+ look-ahead, 0 offline)
		const first = M.firstAbove(M.difference(on.channels[0], off.channels[0]), 1e-4);
		expect(first).toBeGreaterThanOrEqual(scheduled);
		// Web Audio API §2.4: one render quantum is 128 frames.
		expect(first - scheduled).toBeLessThan(QUANTUM);
	});
}

// A press that changes a position's effect takes an instance built before play (the room builds
// what the mapping may load) or one swapped out a moment ago; either must sound exactly like one
// built on first use. Echo arithmetic as above: 1/8 at 128 BPM = 234.375 ms (REFERENCES.md).
for (const [from, path] of [
	['filter', 'built before play'],
	['echo', 'swapped out and taken back']
] as const) {
	test(`an echo ${path} sounds like one built on first use and repeats the click`, async () => {
		const time = paramForDivision('echo', 1, '1/8');
		const start = chained([[from, [time, 0.6, 1]]], { mix: 0.5 });
		const changes: RigChange[] =
			from === 'filter'
				? [{ t: 300, event: 0, path: 'racks.0.chain.0.effect', from: 'filter', to: 'echo' }]
				: [
						{ t: 200, event: 0, path: 'racks.0.chain.0.effect', from: 'echo', to: 'filter' },
						{ t: 400, event: 1, path: 'racks.0.chain.0.effect', from: 'filter', to: 'echo' }
					];
		const spec: RenderSpec = { seconds: 1.4, tempo: 128, tap: 'A', decks: click(0.8), state: rig(start), changes };
		const reach = [{ effects: [['echo', 'filter'], [], [], []] as EffectId[][], decks: ['A' as const] }];
		const [prepared, firstUse] = await Promise.all([render({ ...spec, prepare: reach }), render(spec)]);
		const [direct, echo] = peaks(prepared.channels[0], 0.05, 2);
		expect(ms(direct)).toBeCloseTo(800, 3);
		expect(Math.abs(ms(echo - direct) - 234.375)).toBeLessThanOrEqual(1);
		// Same nodes, same changes at the same times: the same samples (float rounding aside).
		expect(M.maxDifferenceDb(prepared.channels[0], firstUse.channels[0])).toBeLessThan(-100);
	});
}

/** Energy of the first difference over energy: about 2 for white noise, near 0 once low-passed. */
function brightness(x: Float32Array): number {
	let energy = 0;
	let edge = 0;
	for (let i = 1; i < x.length; i++) {
		energy += x[i] * x[i];
		edge += (x[i] - x[i - 1]) ** 2;
	}
	return edge / energy;
}

test('a chain of a filter then a gate plays both: the gate chops what the filter darkened', async () => {
	const rate = paramForDivision('gate', 1, '1/8');
	const decks: RenderSpec['decks'] = { A: { samples: [noise(2.2), noise(2.2)] } };
	const both = chained([
		['filter', [0.3, 0, 0]],
		['gate', [rate, 1, 0.3]]
	]);
	const gateAlone = chained([['gate', [rate, 1, 0.3]]]);
	const [two, one] = await Promise.all([
		render({ seconds: 2.2, tempo: 120, tap: 'A', decks, state: rig(both) }),
		render({ seconds: 2.2, tempo: 120, tap: 'A', decks, state: rig(gateAlone) })
	]);
	// The gate (position 2) is in the path: a 250 ms energy period (tempo arithmetic: 1/8 at 120 BPM).
	const envelope = M.centred(M.energyEnvelope(two.channels[0], 48, 0, 2.2 * RATE)); // 1 ms hops
	const { lag, score } = M.autocorrelationPeriod(envelope, 100, 400, 100, envelope.length - 400);
	expect(Math.abs(lag - 250)).toBeLessThanOrEqual(1);
	expect(score).toBeGreaterThan(0.8);
	// The filter (position 1) is in the path too: cutoff 0.3 closes the low-pass to about 1.3 kHz
	// (20 Hz × 1000^0.6, engine/effects.ts range), so the chopped noise keeps under a tenth of the
	// high-frequency share the gate alone lets through.
	expect(brightness(two.channels[0])).toBeLessThan(0.1 * brightness(one.channels[0]));
});

test('the limiter keeps the peak at or below −1 dBFS for an input boosted by +12 dB', async () => {
	const decks: RenderSpec['decks'] = { A: { loop: 'glass-steps', levelDb: 12 }, B: { loop: 'coil-run', levelDb: 12 } };
	const [before, after] = await Promise.all([
		render({ seconds: 2, tap: 'A', decks }),
		render({ seconds: 2, tap: 'master', masterDb: 0, decks })
	]);
	expect(M.peak(before.channels[0])).toBeGreaterThan(1); // the limiter has real work: deck A alone passes 0 dBFS
	// Issue 4 / DESIGN.md §5: limiter at −1 dBFS.
	for (const c of after.channels) expect(M.toDb(M.peak(c))).toBeLessThanOrEqual(-1);
});

test('the master passes quiet signals unchanged below the limiter', async () => {
	const { channels } = await render({
		seconds: 0.3,
		tap: 'master',
		masterDb: 0,
		decks: { A: { samples: [[0.25], [0.25]], samplesAt: 0.1 } }
	});
	expect(Math.abs(channels[0][Math.round(0.1 * RATE)] - 0.25)).toBeLessThan(1e-5);
});

test.describe('every catalog effect', () => {
	const decks: RenderSpec['decks'] = { A: { loop: 'glass-steps' } };
	const chain = (effect: EffectId, on: boolean) => rig(chained([[effect, loadedPosition(effect).params]], { on }));
	let dry: Float32Array[] = [];

	test.beforeAll(async () => {
		dry = (await render({ seconds: 1.2, tap: 'A', decks, state: rig() })).channels;
	});

	for (const effect of EFFECT_IDS) {
		test(`${effect} changes the signal when on and is transparent when its rack is off`, async () => {
			const [on, off] = await Promise.all([
				render({ seconds: 1.2, tap: 'A', decks, state: chain(effect, true) }),
				render({ seconds: 1.2, tap: 'A', decks, state: chain(effect, false) })
			]);
			expect(M.maxDifferenceDb(on.channels[0], dry[0])).toBeGreaterThan(-40);
			// Issue 4: bit-transparent, or below −90 dB difference, when the rack is off.
			for (const c of [0, 1]) expect(M.maxDifferenceDb(off.channels[c], dry[c])).toBeLessThanOrEqual(-90);
		});
	}
});

/** Reloads /sounds and waits until it is hydrated (its onMount installs the scripting handle). */
async function reloadSounds() {
	await page.reload();
	await page.waitForFunction(() => 'padproofSounds' in window);
}

test.describe('the sounds page', () => {
	test('asks for the hearing caution once, starts sound and remembers the answer', async () => {
		await page.evaluate(() => localStorage.removeItem('padproof.hearing-caution'));
		await reloadSounds();
		await page.getByTestId('start-sound').click();
		await expect(page.getByTestId('hearing-caution')).toBeVisible();
		await page.getByRole('button', { name: /I understand/ }).click();
		await expect(page.getByTestId('sound-running')).toBeVisible();
		await expect(page.getByTestId('master-level')).toHaveValue('-12'); // DESIGN.md §5: moderate default level
		await expect.poll(() => page.getByRole('meter').getAttribute('aria-valuenow')).not.toBe('-60');
		await reloadSounds();
		await page.getByTestId('start-sound').click();
		await expect(page.getByTestId('sound-running')).toBeVisible();
		await expect(page.getByTestId('hearing-caution')).toHaveCount(0);
	});

	test('exports what it plays as a WAV file', async () => {
		await reloadSounds();
		const download = page.waitForEvent('download');
		await page.getByTestId('export-wav').click();
		const file = await (await download).path();
		const { readFileSync } = await import('node:fs');
		const wav = new wavefile.WaveFile(readFileSync(file)); // an independent WAV reader
		const fmt = wav.fmt as { numChannels: number; sampleRate: number; bitsPerSample: number };
		expect(fmt).toMatchObject({ numChannels: 2, sampleRate: 48000, bitsPerSample: 16 });
		const samples = wav.getSamples(false, Int16Array) as unknown as Int16Array[];
		expect(samples[0].length).toBe(8 * 48000);
		expect(Math.max(...samples[0].slice(0, 48000).map(Math.abs))).toBeGreaterThan(300);
	});

	test('says clearly when the browser has no Web Audio', async ({ browser }) => {
		const context = await browser.newContext({ storageState: await page.context().storageState() });
		const bare = await context.newPage();
		await bare.addInitScript(() => {
			const scope = window as unknown as Record<string, unknown>;
			for (const name of ['AudioContext', 'webkitAudioContext', 'OfflineAudioContext']) delete scope[name];
		});
		await bare.goto('/sounds');
		await bare.waitForFunction(() => 'padproofSounds' in window);
		await expect(bare.getByTestId('audio-problem')).toContainText('no Web Audio');
		await expect(bare.getByTestId('start-sound')).toHaveCount(0);
		await context.close();
	});
});
