import { expect, test, type Page } from '@playwright/test';
import { installFakeMidi, ONE_CONTROLLER } from './fake-midi';
import { signIn, touchScreen } from './support';
import { importSessionMidi } from '../src/lib/midi/smf';

// Demo two-deck mapping (src/lib/engine/demo.ts): pad-1 = note 36 = Echo A on rack 1,
// pad-5 = note 40 = Echo B; pads 13–16 (notes 48–51) are the legato stutter row on rack 2, deck A.
// MIDI 1.0: 0x90 = Note On ch 1, 0x80 = Note Off ch 1. Lights: Note On, velocity 127 lit / 0 dark.

async function openControllers(page: Page) {
	// Under `vite dev` a page may reload while others' edits land; the built app never does.
	await expect(async () => {
		await signIn(page, 'student');
		await page.goto('/controllers');
		await expect(page.getByTestId('pad-grid')).toBeVisible();
		// Hydrated: the page asks for MIDI as soon as it runs in the browser.
		await expect(page.getByTestId('midi-status')).not.toHaveText('MIDI off', { timeout: 10_000 });
	}).toPass({ timeout: 90_000 });
}

async function controllerReady(page: Page) {
	await expect(page.getByTestId('device').filter({ hasText: 'Test Pads' })).toHaveAttribute('data-state', 'connected');
}

const pad = (page: Page, id: string) => page.getByTestId(`pad-${id}`);

test('a note from the controller presses the on-screen pad, fires its binding and lights the device', async ({
	page
}) => {
	const midi = await installFakeMidi(page, { ports: ONE_CONTROLLER });
	await openControllers(page);
	await controllerReady(page);

	await midi.send('pads-in', [0x90, 36, 100]);
	await expect(pad(page, 'pad-1')).toHaveAttribute('aria-pressed', 'true');
	await expect(pad(page, 'pad-1')).toHaveAttribute('data-lit', 'true');
	await expect(page.getByTestId('rack-1')).toHaveAttribute('data-audible', 'A');
	await expect(page.getByTestId('monitor-row').first()).toContainText('Note On ch 1 · note 36 vel 100');
	await expect(page.getByTestId('monitor-row').first()).toContainText('Echo A');
	await expect.poll(() => midi.sent('pads-out')).toContainEqual([0x90, 36, 127]);

	await midi.clear('pads-out');
	await midi.send('pads-in', [0x80, 36, 0]);
	await expect(pad(page, 'pad-1')).toHaveAttribute('aria-pressed', 'false');
	await expect(page.getByTestId('rack-1')).toHaveAttribute('data-audible', 'none');
	await expect.poll(() => midi.sent('pads-out')).toEqual([[0x90, 36, 0]]);
});

test('a second controller plugged in mid-session is shown and plays, told apart by port', async ({ page }) => {
	const midi = await installFakeMidi(page, { ports: ONE_CONTROLLER });
	await openControllers(page);
	await controllerReady(page);
	await expect(page.getByTestId('device')).toHaveCount(1);

	await midi.plug({ id: 'second-in', name: 'Second Pads', type: 'input' });
	await expect(page.getByTestId('device').filter({ hasText: 'Second Pads' })).toHaveAttribute(
		'data-state',
		'connected'
	);

	await midi.send('second-in', [0x90, 40, 90]);
	await expect(pad(page, 'pad-5')).toHaveAttribute('aria-pressed', 'true');
	const monitor = page.getByTestId('midi-monitor');
	await monitor.getByLabel('Device').selectOption({ label: 'Test Pads' });
	await expect(monitor.getByTestId('monitor-row')).toHaveCount(0);
	await monitor.getByLabel('Device').selectOption({ label: 'Second Pads' });
	await expect(monitor.getByTestId('monitor-row')).toHaveCount(1);
	await expect(monitor.getByTestId('monitor-row')).toContainText('Echo B');
});

test('unplugging a controller mid-hold releases what it held: no stuck effect, lights dark', async ({ page }) => {
	const midi = await installFakeMidi(page, { ports: ONE_CONTROLLER });
	await openControllers(page);
	await controllerReady(page);

	await midi.send('pads-in', [0x90, 40, 100]);
	await expect(page.getByTestId('rack-1')).toHaveAttribute('data-audible', 'B');
	await expect(pad(page, 'pad-5')).toHaveAttribute('data-lit', 'true');

	await midi.unplug('pads-in');
	await expect(page.getByTestId('device').filter({ hasText: 'Test Pads' }).first()).toBeVisible();
	await expect(page.getByTestId('device').filter({ hasText: 'Unplugged' })).toHaveCount(1);
	await expect(pad(page, 'pad-5')).toHaveAttribute('aria-pressed', 'false');
	await expect(pad(page, 'pad-5')).toHaveAttribute('data-lit', 'false');
	await expect(page.getByTestId('rack-1')).toHaveAttribute('data-audible', 'none');
	// The output is still there, so it is told to go dark.
	await expect.poll(() => midi.sent('pads-out')).toContainEqual([0x90, 40, 0]);
});

test('several on-screen pads held by touch pointers behave like several fingers', async ({ page }) => {
	await installFakeMidi(page, { ports: [] });
	await openControllers(page);
	const touch = await touchScreen(page);
	const a = await touch.finger('pad-pad-13', 1);
	const b = await touch.finger('pad-pad-14', 2);

	await touch.down([a]);
	await touch.down([a, b]);
	await expect(pad(page, 'pad-13')).toHaveAttribute('aria-pressed', 'true');
	await expect(pad(page, 'pad-14')).toHaveAttribute('aria-pressed', 'true');
	await expect(page.getByTestId('rack-2')).toHaveAttribute('data-audible', 'A');

	// Lift the first finger; the legato row keeps the stutter on while the other finger is down.
	await touch.up([a]);
	await expect(pad(page, 'pad-13')).toHaveAttribute('aria-pressed', 'false');
	await expect(pad(page, 'pad-14')).toHaveAttribute('aria-pressed', 'true');
	await expect(page.getByTestId('rack-2')).toHaveAttribute('data-audible', 'A');

	await touch.up([b]);
	await expect(pad(page, 'pad-14')).toHaveAttribute('aria-pressed', 'false');
	await expect(page.getByTestId('rack-2')).toHaveAttribute('data-audible', 'none');
	await expect(page.getByTestId('rig-events')).toHaveText('4');
});

test('without MIDI permission the page explains why and the on-screen pads still play', async ({ page }) => {
	await installFakeMidi(page, { refuse: true });
	await openControllers(page);
	await expect(page.getByTestId('midi-problem')).toContainText('MIDI access was refused');
	await page.keyboard.down('KeyZ'); // the key block's bottom-left key plays pad-1
	await expect(pad(page, 'pad-1')).toHaveAttribute('aria-pressed', 'true');
	await expect(pad(page, 'pad-1')).toHaveAttribute('data-lit', 'true');
	await page.keyboard.up('KeyZ');
	await expect(pad(page, 'pad-1')).toHaveAttribute('aria-pressed', 'false');
});

test('a take saves as a Standard MIDI File, a broken file is refused, and a good one plays the pads', async ({
	page
}) => {
	await installFakeMidi(page, { ports: [] });
	await openControllers(page);
	for (let i = 0; i < 2; i++) {
		await page.keyboard.down('KeyZ');
		await expect(pad(page, 'pad-1')).toHaveAttribute('aria-pressed', 'true');
		await page.keyboard.up('KeyZ');
		await expect(pad(page, 'pad-1')).toHaveAttribute('aria-pressed', 'false');
	}
	const download = page.waitForEvent('download');
	await page.getByRole('button', { name: 'Save take as MIDI' }).click();
	const file = await (await download).path();
	const bytes = new Uint8Array(await import('node:fs/promises').then((fs) => fs.readFile(file)));
	const parsed = importSessionMidi(bytes);
	if (!parsed.ok) throw new Error(parsed.error);
	// SMF 1.0: format 1 at 480 ticks per quarter; pad-1 is note 36 in the demo profile.
	expect(parsed).toMatchObject({ format: 1, ticksPerQuarter: 480 });
	expect(parsed.notes.map((n) => [n.kind, n.number])).toEqual([
		['press', 36],
		['release', 36],
		['press', 36],
		['release', 36]
	]);

	const picker = page.getByTestId('midi-file-panel').locator('input[type=file]');
	await picker.setInputFiles({
		name: 'cut.mid',
		mimeType: 'audio/midi',
		buffer: Buffer.from(bytes.slice(0, bytes.length - 3))
	});
	await expect(page.getByTestId('midi-file-problem')).toContainText('truncated');

	await picker.setInputFiles({ name: 'take.mid', mimeType: 'audio/midi', buffer: Buffer.from(bytes) });
	await expect(page.getByTestId('rig-events')).toHaveText('8');
	await expect(pad(page, 'pad-1')).toHaveAttribute('aria-pressed', 'false');
	await expect(page.getByTestId('rack-1')).toHaveAttribute('data-audible', 'none');
});
