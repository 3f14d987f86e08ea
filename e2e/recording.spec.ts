// Nothing recorded is lost: the network cut mid-take, and the page reloaded mid-take.
import { expect, test, type Page } from '@playwright/test';
import { installFakeMidi, ONE_CONTROLLER } from './fake-midi';
import { open, signIn } from './support';

// MIDI 1.0: 0x90 Note On, 0x80 Note Off, channel 1. The demo pad-1..pad-16 are notes 36–51.
const NOTE_ON = 0x90;
const NOTE_OFF = 0x80;

async function openRoom(page: Page, name: string) {
	await signIn(page, 'student');
	const { mappings } = (await (await page.request.get('/api/mappings')).json()) as {
		mappings: { id: string; name: string }[];
	};
	await open(page, `/rehearse/${mappings.find((m) => m.name === name)!.id}`);
	await expect(page.getByTestId('midi-status')).toHaveAttribute('data-status', 'ready', { timeout: 15_000 });
}

/** Taps pads 1..count once each: 2 events a tap, each Note On velocity 1..127 so every event is told apart. */
async function tap(midi: Awaited<ReturnType<typeof installFakeMidi>>, first: number, count: number) {
	for (let i = 0; i < count; i++) {
		const note = 36 + ((first + i) % 16);
		await midi.send('pads-in', [NOTE_ON, note, 1 + ((first + i) % 127)]);
		await midi.send('pads-in', [NOTE_OFF, note, 0]);
	}
}

async function savedSession(page: Page) {
	const href = await page.getByTestId('record-replay-link').getAttribute('href');
	const response = await page.request.get(`/api${href}`);
	expect(response.ok()).toBe(true);
	return (await response.json()) as { events: { t: number; midi?: number[] }[] };
}

test('a take recorded through a network cut reaches the server with every event exactly once', async ({ page }) => {
	const midi = await installFakeMidi(page, { ports: ONE_CONTROLLER });
	await openRoom(page, 'Two-deck pad set');
	await page.getByTestId('count-in-toggle').uncheck();
	await page.getByTestId('record-start').click();
	await expect(page.getByTestId('recorder')).toHaveAttribute('data-status', 'recording');

	await tap(midi, 0, 5);
	await expect(page.getByTestId('record-unsent')).toHaveText('waiting to send: 0', { timeout: 10_000 });

	await page.route('**/api/sessions/*/chunks', (route) => route.abort('internetdisconnected'));
	await tap(midi, 5, 10);
	await expect(page.getByTestId('record-offline')).toBeVisible({ timeout: 10_000 });
	await expect(page.getByTestId('record-unsent')).toHaveText('waiting to send: 20');
	await tap(midi, 15, 5);

	await page.unroute('**/api/sessions/*/chunks');
	await expect(page.getByTestId('record-unsent')).toHaveText('waiting to send: 0', { timeout: 10_000 });
	await expect(page.getByTestId('record-offline')).toHaveCount(0);
	await page.getByTestId('record-stop').click();
	await expect(page.getByTestId('record-saved')).toBeVisible();

	const session = await savedSession(page);
	expect(session.events).toHaveLength(40);
	const velocities = session.events.filter((e) => e.midi?.[0] === NOTE_ON).map((e) => e.midi![2]);
	expect(velocities).toEqual(Array.from({ length: 20 }, (_, i) => i + 1));
});

test('a reload mid-take resumes the recording and loses nothing', async ({ page }) => {
	const midi = await installFakeMidi(page, { ports: ONE_CONTROLLER });
	await openRoom(page, 'Two-deck pad set');
	await page.getByTestId('count-in-toggle').uncheck();
	await page.getByTestId('record-start').click();
	await expect(page.getByTestId('recorder')).toHaveAttribute('data-status', 'recording');
	await tap(midi, 0, 6);
	await expect(page.getByTestId('record-events')).toHaveText('12');

	// Reload at once: the last events have not been sent by the 2-second tick yet. The browser asks
	// first (a take is live); the person says yes.
	const asked = new Promise<string>((resolve) =>
		page.once('dialog', (dialog) => {
			resolve(dialog.type());
			void dialog.accept();
		})
	);
	await page.reload();
	expect(await asked).toBe('beforeunload');
	await page.locator('html[data-ready]').waitFor();
	await expect(page.getByTestId('record-resumed')).toBeVisible({ timeout: 15_000 });
	await expect(page.getByTestId('midi-status')).toHaveAttribute('data-status', 'ready', { timeout: 15_000 });
	await tap(midi, 6, 4);
	await expect(page.getByTestId('record-events')).toHaveText('20');
	await page.getByTestId('record-stop').click();
	await expect(page.getByTestId('record-saved')).toBeVisible();

	const session = await savedSession(page);
	const velocities = session.events.filter((e) => e.midi?.[0] === NOTE_ON).map((e) => e.midi![2]);
	expect(velocities).toEqual(Array.from({ length: 10 }, (_, i) => i + 1));
	expect(session.events).toHaveLength(20);
});

async function newestSession(page: Page) {
	const { sessions } = (await (await page.request.get('/api/sessions')).json()) as {
		sessions: { id: string; status: string }[];
	};
	return sessions[0];
}

test('leaving mid-take by an in-app link asks first, and every event reaches the server', async ({ page }) => {
	const midi = await installFakeMidi(page, { ports: ONE_CONTROLLER });
	await openRoom(page, 'Two-deck pad set');
	const room = page.url();
	await page.getByTestId('count-in-toggle').uncheck();
	await page.getByTestId('record-start').click();
	await expect(page.getByTestId('recorder')).toHaveAttribute('data-status', 'recording');
	const { id } = await newestSession(page);

	// Play, then follow a link before the 2-second tick sends anything; say "stay".
	await tap(midi, 0, 3);
	await expect(page.getByTestId('record-events')).toHaveText('6');
	let question = '';
	page.once('dialog', (dialog) => {
		question = dialog.message();
		void dialog.dismiss();
	});
	await page.locator('main a[href="/mappings"]').first().click();
	await expect.poll(() => question).toContain('A take is being recorded');
	expect(page.url()).toBe(room);
	await expect(page.getByTestId('recorder')).toHaveAttribute('data-status', 'recording');

	// Play on, follow the link again and leave: the unsent events are kept and sent at once.
	await tap(midi, 3, 4);
	await expect(page.getByTestId('record-events')).toHaveText('14');
	page.once('dialog', (dialog) => void dialog.accept());
	await page.locator('main a[href="/mappings"]').first().click();
	await page.waitForURL('**/mappings');
	await expect
		.poll(
			async () =>
				((await (await page.request.get(`/api/sessions/${id}`)).json()) as { events: unknown[] }).events.length
		)
		.toBe(14);

	// Back in the room the take goes on with the right count, and it is saved whole, each event once.
	await open(page, room);
	await expect(page.getByTestId('record-resumed')).toBeVisible({ timeout: 15_000 });
	await expect(page.getByTestId('record-events')).toHaveText('14');
	await expect(page.getByTestId('midi-status')).toHaveAttribute('data-status', 'ready', { timeout: 15_000 });
	await tap(midi, 7, 3);
	await expect(page.getByTestId('record-events')).toHaveText('20');
	await page.getByTestId('record-stop').click();
	await expect(page.getByTestId('record-saved')).toBeVisible();
	const session = await savedSession(page);
	const velocities = session.events.filter((e) => e.midi?.[0] === NOTE_ON).map((e) => e.midi![2]);
	expect(velocities).toEqual(Array.from({ length: 10 }, (_, i) => i + 1));
	expect(session.events).toHaveLength(20);
});

test('a chunk the server refuses is shown, and the take goes on past it', async ({ page }) => {
	const midi = await installFakeMidi(page, { ports: ONE_CONTROLLER });
	await openRoom(page, 'Two-deck pad set');
	await page.getByTestId('count-in-toggle').uncheck();
	await page.getByTestId('record-start').click();
	await expect(page.getByTestId('recorder')).toHaveAttribute('data-status', 'recording');

	// The server refuses the first chunk sent (as it would one it cannot take); later ones go through.
	let refusedOnce = false;
	await page.route('**/api/sessions/*/chunks', (route) => {
		if (refusedOnce) return route.continue();
		refusedOnce = true;
		return route.fulfill({
			status: 422,
			contentType: 'application/json',
			body: JSON.stringify({ error: 'This part of the take could not be accepted.', problems: [] })
		});
	});
	await tap(midi, 0, 2);
	await expect(page.getByTestId('record-refused')).toBeVisible({ timeout: 10_000 });
	const line = page.getByTestId('record-refused-chunk');
	await expect(line).toHaveText(/^Part 1 \(\d events?\): This part of the take could not be accepted\.$/);
	const refused = Number((await line.textContent())!.match(/\((\d) event/)![1]);
	await tap(midi, 2, 3);
	await expect(page.getByTestId('record-unsent')).toHaveText('waiting to send: 0', { timeout: 10_000 });
	await page.screenshot({ path: 'test-results/recording-refused.png' });
	const download = page.waitForEvent('download');
	await page.getByTestId('record-refused-download').click();
	expect((await download).suggestedFilename()).toMatch(/\.refused\.json$/);

	await page.getByTestId('record-stop').click();
	await expect(page.getByTestId('record-saved')).toBeVisible();
	const session = await savedSession(page);
	expect(session.events).toHaveLength(10 - refused);
	await expect(page.getByTestId('record-refused')).toBeVisible();
});

test('with “record the sound too”, the master output is uploaded with the session', async ({ page }) => {
	const midi = await installFakeMidi(page, { ports: ONE_CONTROLLER });
	await openRoom(page, 'Two-deck pad set');
	await page.getByTestId('start-sound').click();
	await page.getByRole('button', { name: /I understand/ }).click();
	await expect(page.getByTestId('room-sound')).toHaveAttribute('data-status', 'running');
	await page.getByTestId('count-in-toggle').uncheck();
	await page.getByTestId('capture-audio').check();
	await page.getByTestId('record-start').click();
	await expect(page.getByTestId('recorder')).toHaveAttribute('data-status', 'recording');
	await tap(midi, 0, 4);
	await expect(page.getByTestId('record-elapsed')).not.toHaveText('0:00.0');
	await page.waitForFunction(() =>
		document.querySelector('[data-testid="record-elapsed"]')?.textContent?.includes('0:02')
	);
	await page.getByTestId('record-stop').click();
	await expect(page.getByTestId('record-saved')).toBeVisible({ timeout: 20_000 });

	const href = await page.getByTestId('record-replay-link').getAttribute('href');
	const audio = await page.request.get(`/api${href}/audio`);
	expect(audio.status()).toBe(200);
	expect(audio.headers()['content-type']).toMatch(/^audio\/(webm|ogg)/);
	const bytes = await audio.body();
	// A WebM file opens with the EBML magic 1A 45 DF A3 (Matroska/WebM container spec); Ogg with "OggS".
	const magic = bytes.subarray(0, 4).toString('hex');
	expect(['1a45dfa3', '4f676753']).toContain(magic);
	expect(bytes.length).toBeGreaterThan(1000);

	// Decoded in the browser, the take is about as long as the recording and not silent (deck A plays its loop).
	const decoded = await page.evaluate(async (url) => {
		const data = await (await fetch(url)).arrayBuffer();
		const buffer = await new OfflineAudioContext(1, 1, 48000).decodeAudioData(data);
		const samples = buffer.getChannelData(0);
		let peak = 0;
		for (const v of samples) peak = Math.max(peak, Math.abs(v));
		return { seconds: buffer.duration, peak };
	}, `/api${href}/audio`);
	expect(decoded.seconds).toBeGreaterThan(1.5);
	expect(decoded.peak).toBeGreaterThan(0.001);
	// The master limiter's ceiling is −1 dBFS = 0.891 (DESIGN.md §5); a lossy codec may overshoot a little.
	expect(decoded.peak).toBeLessThan(1);
});
