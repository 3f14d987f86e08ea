import { expect, test, type Page } from '@playwright/test';
import { installFakeMidi, ONE_CONTROLLER } from './fake-midi';
import { open, signIn, touchScreen } from './support';

// Demo mappings (src/lib/engine/demo.ts): a 4×4 pad profile on channel 1, pad-1 = note 36 rising to
// pad-16 = note 51; the top row pad-13..pad-16 (notes 48–51) is the stutter row on rack 2, deck A.
// In "Broken stutter row" each of those pads switches rack 2 on on press and off on release, so
// lifting one finger of a chord silences it; "Two-deck pad set" counts held pads instead.
// MIDI 1.0: 0x90 = Note On channel 1, 0x80 = Note Off channel 1.
const NOTE_ON = 0x90;
const NOTE_OFF = 0x80;

async function mappingId(page: Page, name: string): Promise<string> {
	const response = await page.request.get('/api/mappings');
	expect(response.ok()).toBe(true);
	const { mappings } = (await response.json()) as { mappings: { id: string; name: string }[] };
	const found = mappings.find((m) => m.name === name);
	expect(found, `demo mapping "${name}"`).toBeTruthy();
	return found!.id;
}

async function openRoom(page: Page, name: string, waitForMidi = true) {
	// Under `vite dev` a page may reload while others' edits land; the built app never does.
	await expect(async () => {
		await signIn(page, 'student');
		const id = await mappingId(page, name);
		await open(page, `/rehearse/${id}`);
		await expect(page.getByTestId('room-mapping')).toContainText(name);
		if (waitForMidi)
			await expect(page.getByTestId('midi-status')).toHaveAttribute('data-status', 'ready', { timeout: 10_000 });
	}).toPass({ timeout: 90_000 });
}

const pad = (page: Page, id: string) => page.getByTestId(`pad-${id}`);

test('a dropout on the broken stutter row is shown the moment it starts, naming the pad and deck', async ({ page }) => {
	const midi = await installFakeMidi(page, { ports: ONE_CONTROLLER });
	await openRoom(page, 'Broken stutter row');
	await expect(page.getByTestId('midi-status')).toContainText('Test Pads');
	await expect(page.getByTestId('no-live-finding')).toBeVisible();

	await midi.send('pads-in', [NOTE_ON, 48, 100]);
	await midi.send('pads-in', [NOTE_ON, 49, 100]);
	await expect(pad(page, 'pad-13')).toHaveAttribute('aria-pressed', 'true');
	await expect(pad(page, 'pad-14')).toHaveAttribute('aria-pressed', 'true');
	await expect(page.getByTestId('rack-2')).toHaveAttribute('data-audible', 'A');
	await expect(page.getByTestId('live-finding')).toHaveCount(0);

	await midi.send('pads-in', [NOTE_OFF, 48, 0]);
	const finding = page.getByTestId('live-finding');
	await expect(finding).toHaveCount(1);
	await expect(finding).toHaveAttribute('data-kind', 'dropout');
	await expect(finding).toHaveAttribute('data-deck', 'A');
	await expect(finding).toHaveAttribute('data-input', 'pad-14');
	await expect(finding).toContainText('Pad 14');
	await expect(finding).toContainText('deck A');
	await expect(finding).toContainText('release of Pad 13');
	await expect(page.getByTestId('rack-2')).toHaveAttribute('data-audible', 'none');
	// The pad still held is dark: its effect is gone.
	await expect(pad(page, 'pad-14')).toHaveAttribute('data-lit', 'false');

	// It ends when the last finger lifts: nothing is held that should sound.
	await midi.send('pads-in', [NOTE_OFF, 49, 0]);
	await expect(page.getByTestId('live-finding')).toHaveCount(0);
	await expect(page.getByTestId('findings-total')).toHaveText('1 this run');
});

test('the same chord on the two-deck pad set keeps the stutter on: no dropout', async ({ page }) => {
	const midi = await installFakeMidi(page, { ports: ONE_CONTROLLER });
	await openRoom(page, 'Two-deck pad set');

	await midi.send('pads-in', [NOTE_ON, 48, 100]);
	await midi.send('pads-in', [NOTE_ON, 49, 100]);
	await expect(page.getByTestId('counter-held')).toHaveText('2');
	await midi.send('pads-in', [NOTE_OFF, 48, 0]);
	await expect(page.getByTestId('counter-held')).toHaveText('1');
	await expect(page.getByTestId('rack-2')).toHaveAttribute('data-audible', 'A');
	await expect(page.getByTestId('live-finding')).toHaveCount(0);
	await midi.send('pads-in', [NOTE_OFF, 49, 0]);
	await expect(page.getByTestId('counter-held')).toHaveText('0');
	await expect(page.getByTestId('rack-2')).toHaveAttribute('data-audible', 'none');
	await expect(page.getByTestId('rig-events')).toHaveText('4');
	await expect(page.getByTestId('findings-total')).toHaveText('0 this run');
});

test('several on-screen pads held by touch pointers keep a legato row on until the last lifts', async ({ page }) => {
	await installFakeMidi(page, { ports: [] });
	await openRoom(page, 'Two-deck pad set');
	const touch = await touchScreen(page);
	const a = await touch.finger('pad-pad-13', 1);
	const b = await touch.finger('pad-pad-14', 2);
	const c = await touch.finger('pad-pad-15', 3);

	await touch.down([a]);
	await touch.down([a, b]);
	await touch.down([a, b, c]);
	await expect(page.getByTestId('counter-held')).toHaveText('3');
	await expect(page.getByTestId('held-pads')).toHaveText('Stutter 1/4 · Stutter 1/8 · Stutter 1/16');
	await expect(page.getByTestId('rack-2')).toHaveAttribute('data-audible', 'A');

	await touch.up([a]);
	await touch.up([c]);
	await expect(pad(page, 'pad-14')).toHaveAttribute('aria-pressed', 'true');
	await expect(page.getByTestId('counter-held')).toHaveText('1');
	await expect(page.getByTestId('rack-2')).toHaveAttribute('data-audible', 'A');
	await expect(page.getByTestId('live-finding')).toHaveCount(0);

	await touch.up([b]);
	await expect(page.getByTestId('rack-2')).toHaveAttribute('data-audible', 'none');
	await expect(page.getByTestId('counter-held')).toHaveText('0');
});

test('the computer keyboard plays the pads, and refused MIDI is explained', async ({ page }) => {
	await installFakeMidi(page, { refuse: true });
	await openRoom(page, 'Two-deck pad set', false);
	await expect(page.getByTestId('midi-problem')).toContainText('MIDI access was refused');

	// The key block's top-left key (1) plays pad-13, the bottom-left (Z) plays pad-1: Echo A.
	await page.keyboard.down('KeyZ');
	await expect(pad(page, 'pad-1')).toHaveAttribute('aria-pressed', 'true');
	await expect(page.getByTestId('rack-1')).toHaveAttribute('data-audible', 'A');
	await expect(page.getByTestId('rack-1-route-A')).toHaveAttribute('data-routed', 'true');
	await expect(page.getByTestId('rack-1-route-B')).toHaveAttribute('data-routed', 'false');
	await expect(page.getByTestId('rack-1-position-1')).toHaveAttribute('data-effect', 'echo');
	await expect(page.getByTestId('rack-1-position-1-param-1')).toHaveText('1/8');
	await page.keyboard.up('KeyZ');
	await expect(page.getByTestId('rack-1')).toHaveAttribute('data-audible', 'none');

	await page.keyboard.down('Digit1');
	await page.keyboard.down('Digit2');
	await expect(page.getByTestId('counter-held')).toHaveText('2');
	await page.keyboard.up('Digit1');
	await expect(page.getByTestId('rack-2')).toHaveAttribute('data-audible', 'A');
	await page.keyboard.up('Digit2');
	await expect(page.getByTestId('rack-2')).toHaveAttribute('data-audible', 'none');
});

test('the mapping check lists the broken row’s lint findings', async ({ page }) => {
	await installFakeMidi(page, { ports: [] });
	await openRoom(page, 'Broken stutter row');
	const lint = page.getByTestId('lint-panel');
	await expect(lint.getByTestId('lint-finding').first()).toBeHidden();
	await lint.locator('summary').click();
	await expect(lint.getByTestId('lint-finding').filter({ hasText: 'legato-without-counter' })).not.toHaveCount(0);
});

test('record, play, stop: the saved session keeps the MIDI bytes and links to its replay', async ({ page }) => {
	const midi = await installFakeMidi(page, { ports: ONE_CONTROLLER });
	await openRoom(page, 'Broken stutter row');
	await page.getByTestId('count-in-toggle').uncheck();
	await page.getByTestId('record-name').fill('Chord drill');
	await page.getByTestId('record-start').click();
	await expect(page.getByTestId('recorder')).toHaveAttribute('data-status', 'recording');

	await midi.send('pads-in', [NOTE_ON, 48, 100]);
	await midi.send('pads-in', [NOTE_ON, 49, 100]);
	await midi.send('pads-in', [NOTE_OFF, 48, 0]);
	await midi.send('pads-in', [NOTE_OFF, 49, 0]);
	await page.keyboard.down('KeyZ');
	await page.keyboard.up('KeyZ');
	await expect(page.getByTestId('record-events')).toHaveText('6');

	await page.getByTestId('record-stop').click();
	await expect(page.getByTestId('record-saved')).toContainText('1 finding');
	const link = page.getByTestId('record-replay-link');
	const href = await link.getAttribute('href');
	expect(href).toMatch(/^\/sessions\/[\w-]+$/);

	const response = await page.request.get(`/api${href}`);
	expect(response.ok()).toBe(true);
	const session = (await response.json()) as {
		events: { t: number; midi?: number[]; input: { input: string; type: string } | null }[];
	};
	// Controller events keep their bytes beside the resolved press or release; the keyboard's have none.
	expect(session.events.map((e) => [e.midi ?? null, e.input?.input, e.input?.type])).toEqual([
		[[NOTE_ON, 48, 100], 'pad-13', 'press'],
		[[NOTE_ON, 49, 100], 'pad-14', 'press'],
		[[NOTE_OFF, 48, 0], 'pad-13', 'release'],
		[[NOTE_OFF, 49, 0], 'pad-14', 'release'],
		[null, 'pad-1', 'press'],
		[null, 'pad-1', 'release']
	]);
	const times = session.events.map((e) => e.t);
	expect(times).toEqual([...times].sort((a, b) => a - b));
	await expect(page.getByTestId('record-saved')).toContainText('Chord drill');
});

test('without Web Audio the room says so, and the pads and findings still work', async ({ page }) => {
	await page.addInitScript(() => {
		const scope = window as unknown as Record<string, unknown>;
		delete scope.AudioContext;
		delete scope.webkitAudioContext;
	});
	await installFakeMidi(page, { ports: [] });
	await openRoom(page, 'Broken stutter row');
	await expect(page.getByTestId('audio-problem')).toContainText('no Web Audio');
	await expect(page.getByTestId('start-sound')).toHaveCount(0);

	await page.keyboard.down('Digit1'); // pad-13
	await page.keyboard.down('Digit2'); // pad-14
	await page.keyboard.up('Digit1');
	await expect(page.getByTestId('live-finding')).toHaveAttribute('data-input', 'pad-14');
	await page.keyboard.up('Digit2');
	await expect(page.getByTestId('live-finding')).toHaveCount(0);
});
