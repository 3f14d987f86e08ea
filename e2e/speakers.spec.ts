// What a person hears: every node connected to the hardware output (AudioDestinationNode, Web
// Audio API) is also fed to an analyser here, so a page whose master never reaches the speakers
// measures silence.
import { expect, test, type Page } from '@playwright/test';
import { open, signIn } from './support';

async function tapSpeakers(page: Page) {
	await page.addInitScript(() => {
		const connect = AudioNode.prototype.connect as (this: AudioNode, ...args: unknown[]) => unknown;
		const taps: AnalyserNode[] = [];
		(window as unknown as { speakerTaps: AnalyserNode[] }).speakerTaps = taps;
		AudioNode.prototype.connect = function (this: AudioNode, ...args: unknown[]) {
			const target = args[0];
			if (target instanceof AudioDestinationNode && this.context instanceof AudioContext) {
				const analyser = this.context.createAnalyser();
				analyser.fftSize = 2048;
				connect.call(this, analyser);
				taps.push(analyser);
			}
			return connect.apply(this, args);
		} as typeof AudioNode.prototype.connect;
	});
}

/** The loudest sample now reaching the speakers (0 when nothing is connected or it is silent). */
const speakerPeak = (page: Page) =>
	page.evaluate(() => {
		let peak = 0;
		for (const a of (window as unknown as { speakerTaps: AnalyserNode[] }).speakerTaps) {
			const data = new Float32Array(a.fftSize);
			a.getFloatTimeDomainData(data);
			for (const v of data) peak = Math.max(peak, Math.abs(v));
		}
		return peak;
	});

test.beforeEach(async ({ page }) => {
	await tapSpeakers(page);
	await signIn(page, 'student');
});

test('the sounds page is heard once sound starts, and stays under the limiter ceiling', async ({ page }) => {
	await open(page, '/sounds');
	expect(await speakerPeak(page)).toBe(0);
	await page.getByTestId('start-sound').click();
	await page.getByRole('button', { name: /I understand/ }).click();
	await expect(page.getByTestId('sound-running')).toBeVisible();
	await expect.poll(() => speakerPeak(page), { timeout: 10_000 }).toBeGreaterThan(0.001);
	// −1 dBFS = 0.891 (DESIGN.md §5 master limiter).
	expect(await speakerPeak(page)).toBeLessThanOrEqual(0.892);
});

test('the rehearsal room is heard once sound starts', async ({ page }) => {
	const { mappings } = await (await page.request.get('/api/mappings')).json();
	await open(page, `/rehearse/${mappings.find((m: { name: string }) => m.name === 'Two-deck pad set').id}`);
	await page.getByTestId('start-sound').click();
	await page.getByRole('button', { name: /I understand/ }).click();
	await expect(page.getByTestId('room-sound')).toHaveAttribute('data-status', 'running');
	await expect.poll(() => speakerPeak(page), { timeout: 10_000 }).toBeGreaterThan(0.001);
});

test('a replay is heard once its sound is turned on', async ({ page, baseURL }) => {
	const { mappings } = await (await page.request.get('/api/mappings')).json();
	const mappingId = mappings.find((m: { name: string }) => m.name === 'Two-deck pad set').id;
	const session = {
		version: 1,
		tempo: 120,
		startedAt: '2026-12-01T20:00:00.000Z',
		events: [
			{ t: 100, input: { input: 'pad-1', type: 'press' } },
			{ t: 4000, input: { input: 'pad-1', type: 'release' } }
		]
	};
	const { id } = await (
		await page.request.post('/api/sessions', { data: { mappingId, session }, headers: { origin: baseURL! } })
	).json();
	await open(page, `/sessions/${id}`);
	await page.getByTestId('sound-toggle').click();
	await page.getByRole('button', { name: /I understand/ }).click();
	await expect(page.getByTestId('sound-toggle')).toHaveText('Sound on');
	// Paused, the decks are stopped; playing the cursor plays them.
	await page.getByRole('button', { name: 'Play', exact: true }).click();
	await expect.poll(() => speakerPeak(page), { timeout: 10_000 }).toBeGreaterThan(0.001);
});
