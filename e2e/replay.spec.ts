import { expect, test, type Page } from '@playwright/test';
import { readFile } from 'node:fs/promises';
import { signIn } from './support';

// The demo "Broken stutter row": its top row pad-13..pad-16 answers notes 48–51 on channel 1
// (src/lib/engine/demo.ts) and is plain momentary on/off with no held-pad counter.
const PRESS_13 = 1000;
const PRESS_14 = 1200;
const RELEASE_13 = 1500.25;
const RELEASE_14 = 2000;

const note = (on: boolean, n: number) => [on ? 0x90 : 0x80, n, on ? 100 : 0];
const stutterChord = {
	version: 1,
	tempo: 124,
	startedAt: '2026-03-02T18:30:00.000Z',
	events: [
		{ t: PRESS_13, midi: note(true, 48), input: { input: 'pad-13', type: 'press' } },
		{ t: PRESS_14, midi: note(true, 49), input: { input: 'pad-14', type: 'press' } },
		{ t: RELEASE_13, midi: note(false, 48), input: { input: 'pad-13', type: 'release' } },
		{ t: RELEASE_14, midi: note(false, 49), input: { input: 'pad-14', type: 'release' } }
	]
};

async function mappingId(page: Page, name: string): Promise<string> {
	const res = await page.request.get('/api/mappings');
	const { mappings } = (await res.json()) as { mappings: { id: string; name: string }[] };
	const found = mappings.find((m) => m.name === name);
	expect(found, `demo mapping "${name}"`).toBeTruthy();
	return found!.id;
}

async function createSession(page: Page, baseURL: string, mapping: string, name = 'Stutter chord'): Promise<string> {
	const res = await page.request.post('/api/sessions', {
		data: { mappingId: mapping, name, session: stutterChord },
		headers: { origin: baseURL }
	});
	expect(res.status(), await res.text()).toBe(201);
	return ((await res.json()) as { id: string }).id;
}

/** Opens a replay and waits until the page's scripts run (before that, clicks do nothing). */
async function openReplay(page: Page, path: string) {
	await page.goto(path);
	await page.locator('[data-testid="replay-page"][data-hydrated="true"]').waitFor();
}

/** The session time under an element's left edge (or its middle), from the plot's own scale. */
async function timeUnder(page: Page, testid: string, where: 'left' | 'middle'): Promise<number> {
	const svg = page.getByTestId('timeline-plot').locator('svg');
	const [box, mark] = await Promise.all([svg.boundingBox(), page.getByTestId(testid).first().boundingBox()]);
	const attr = async (name: string) => Number(await svg.getAttribute(name));
	const [start, end, left, width] = await Promise.all(
		['data-view-start', 'data-view-end', 'data-plot-left', 'data-plot-width'].map(attr)
	);
	const x = mark!.x + (where === 'middle' ? mark!.width / 2 : 0);
	return start + ((x - box!.x - left) / width) * (end - start);
}

test.beforeEach(async ({ page }) => {
	await signIn(page, 'student');
});

test('the replay places the dropout at the injected release and the jump highlights that release', async ({
	page,
	baseURL
}) => {
	const id = await createSession(page, baseURL!, await mappingId(page, 'Broken stutter row'));
	await openReplay(page, `/sessions/${id}`);

	const findings = page.getByTestId('findings-original').getByTestId('finding');
	await expect(findings).toHaveCount(1);
	await expect(findings.first()).toHaveAttribute('data-kind', 'dropout');
	await expect(findings.first()).toContainText('1.500 s');
	await expect(findings.first()).toContainText('release of Pad 13');

	const mark = page.getByTestId('finding-mark');
	await expect(mark).toHaveCount(1);
	expect(Math.abs(Number(await mark.getAttribute('data-start')) - RELEASE_13)).toBeLessThanOrEqual(1);

	// The mark on the plot selects its finding; so does the list item.
	await mark.click();
	await expect(findings.first()).toHaveAttribute('aria-pressed', 'true');
	await expect(page.getByTestId('cursor-time')).toHaveText('1.500 s');
	await page.getByTestId('zoom-fit').click();
	await page.getByTestId('step-back').click();
	await expect(page.getByTestId('cursor-time')).toHaveText('1.200 s');

	await findings.first().click();
	await expect(page.getByTestId('cursor-time')).toHaveText('1.500 s');
	const causing = page.getByTestId('causing-event');
	await expect(causing).toHaveCount(1);
	await expect(causing).toHaveAttribute('aria-current', 'true');
	await expect(causing).toHaveAttribute('data-index', '2');
	await expect(causing).toContainText('release');
	await expect(causing).toContainText('Pad 13');
	await expect(page.getByTestId('causing-mark')).toHaveAttribute('data-t', String(RELEASE_13));
	await expect(page.getByTestId('rig-held')).toHaveText('Pad 14');
	await expect(page.getByTestId('rack-2')).toHaveAttribute('data-on', 'false');

	// Zoomed in around the cursor a pixel is well under a millisecond, so the drawn edge is a measurement.
	for (let i = 0; i < 3; i++) await page.getByTestId('zoom-in').click();
	const drawnAt = await timeUnder(page, 'finding-mark', 'left');
	expect(Math.abs(drawnAt - RELEASE_13)).toBeLessThanOrEqual(1);
	const causingAt = await timeUnder(page, 'causing-mark', 'middle');
	expect(Math.abs(causingAt - RELEASE_13)).toBeLessThanOrEqual(1);
	console.log(
		`dropout mark drawn at ${drawnAt.toFixed(3)} ms, causing release at ${causingAt.toFixed(3)} ms (injected ${RELEASE_13} ms)`
	);
});

test('replaying against the two-deck set shows no dropout beside the original one', async ({ page, baseURL }) => {
	const id = await createSession(page, baseURL!, await mappingId(page, 'Broken stutter row'));
	await openReplay(page, `/sessions/${id}?against=${await mappingId(page, 'Two-deck pad set')}`);

	await expect(page.getByTestId('findings-original').getByTestId('finding')).toHaveCount(1);
	await expect(page.getByTestId('findings-against').getByTestId('no-findings')).toBeVisible();
	await expect(page.getByTestId('findings-against').getByTestId('finding')).toHaveCount(0);
	await expect(page.getByTestId('comparison-summary')).toHaveText('1 finding → 0 findings');
	await expect(page.getByTestId('finding-mark')).toHaveCount(0);
	// The legato row's counter is drawn: up to 2 with both fingers down.
	await expect(page.locator('[data-testid="counter-lane"][data-counter="held"]')).toBeVisible();
});

test('a link with ?t opens the replay with the cursor and the rig at that moment', async ({ page, baseURL }) => {
	const id = await createSession(page, baseURL!, await mappingId(page, 'Broken stutter row'));
	await openReplay(page, `/sessions/${id}?t=1.2`);

	await expect(page.getByTestId('cursor-time')).toHaveText('1.200 s');
	await expect(page.getByTestId('plot-cursor')).toHaveAttribute('data-t', '1200');
	await expect(page.getByTestId('rig-held')).toHaveText('Pad 13, Pad 14');

	await page.getByTestId('step-forward').click();
	await expect(page.getByTestId('cursor-time')).toHaveText('1.500 s');
	await page.locator('body').press('ArrowLeft');
	await expect(page.getByTestId('cursor-time')).toHaveText('1.200 s');
	await page.locator('body').press('ArrowLeft');
	await expect(page.getByTestId('cursor-time')).toHaveText('1.000 s');
	await expect(page.getByTestId('rig-held')).toHaveText('Pad 13');

	// A click on the plot puts the cursor under the pointer (to the nearest pixel).
	const svg = page.getByTestId('timeline-plot').locator('svg');
	const [start, end, left, width] = await Promise.all(
		['data-view-start', 'data-view-end', 'data-plot-left', 'data-plot-width'].map(async (a) =>
			Number(await svg.getAttribute(a))
		)
	);
	const msPerPx = (end - start) / width;
	await svg.click({ position: { x: left + (1800 - start) / msPerPx, y: 120 } });
	const clicked = Number(await page.getByTestId('plot-cursor').getAttribute('data-t'));
	expect(Math.abs(clicked - 1800)).toBeLessThanOrEqual(msPerPx);
	await expect(page.getByTestId('rig-held')).toHaveText('Pad 14');

	await page.locator('body').press(' ');
	await expect(page.getByTestId('play')).toHaveAttribute('aria-pressed', 'true');
	await page.locator('body').press(' ');
	await expect(page.getByTestId('play')).toHaveAttribute('aria-pressed', 'false');
});

test('"Link copied" belongs to its moment: it goes when the cursor moves', async ({ page, baseURL }) => {
	const id = await createSession(page, baseURL!, await mappingId(page, 'Broken stutter row'));
	await openReplay(page, `/sessions/${id}?t=1.2`);
	const message = page.getByTestId('moment-link');

	await page.getByTestId('copy-moment').click();
	// Copied to the clipboard, or (where the browser refuses it) shown to copy by hand: either names the moment.
	await expect(message).toContainText(/(Link to 1\.200 s copied|Copy this link): \S+\?t=1\.200$/);
	await page.getByTestId('step-forward').click();
	await expect(page.getByTestId('cursor-time')).toHaveText('1.500 s');
	await expect(message).toHaveCount(0);

	await page.getByTestId('copy-moment').click();
	await expect(message).toContainText('?t=1.500');
	await page.locator('body').press('ArrowLeft');
	await expect(page.getByTestId('cursor-time')).toHaveText('1.200 s');
	await expect(message).toHaveCount(0);
});

test('the session downloads as JSON and as a Standard MIDI File', async ({ page, baseURL }) => {
	const id = await createSession(page, baseURL!, await mappingId(page, 'Broken stutter row'));
	await openReplay(page, `/sessions/${id}`);

	const [json] = await Promise.all([page.waitForEvent('download'), page.getByTestId('export-json').click()]);
	const doc = JSON.parse(await readFile((await json.path())!, 'utf8'));
	expect(doc.version).toBe(2); // with the beat clock the take was played on
	expect(doc.clock.tempos.length).toBeGreaterThan(0);
	expect(doc.events.map((e: { t: number }) => e.t)).toEqual([PRESS_13, PRESS_14, RELEASE_13, RELEASE_14]);

	const [midi] = await Promise.all([page.waitForEvent('download'), page.getByTestId('export-midi').click()]);
	expect(midi.suggestedFilename()).toBe('Stutter-chord.mid');
	const bytes = await readFile((await midi.path())!);
	expect(bytes.subarray(0, 4).toString('latin1')).toBe('MThd');
});

test('a session whose mapping was deleted keeps replaying with its findings and against another mapping', async ({
	page,
	baseURL
}) => {
	const broken = await mappingId(page, 'Broken stutter row');
	const doc = ((await (await page.request.get(`/api/mappings/${broken}`)).json()) as { mapping: { document: unknown } })
		.mapping.document;
	const copy = await page.request.post('/api/mappings', {
		data: { name: 'Short-lived copy', document: doc },
		headers: { origin: baseURL! }
	});
	expect(copy.status()).toBe(201);
	const copyId = ((await copy.json()) as { id: string }).id;
	const id = await createSession(page, baseURL!, copyId, 'Orphaned take');
	expect((await page.request.delete(`/api/mappings/${copyId}`, { headers: { origin: baseURL! } })).status()).toBe(204);

	await openReplay(page, `/sessions/${id}`);
	// The mapping went to the trash; the version the session was recorded with stays.
	await expect(page.getByTestId('mapping-deleted')).toContainText('since deleted');
	await expect(page.getByTestId('mapping-missing')).toHaveCount(0);
	await expect(page.getByTestId('event-list').getByRole('button')).toHaveCount(4);
	await expect(page.getByTestId('findings-original').getByTestId('finding')).toHaveCount(1);

	await page.getByTestId('against-mapping').selectOption({ label: 'Broken stutter row' });
	await page.getByTestId('against-replay').click();
	await expect(page).toHaveURL(new RegExp(`against=${broken}`));
	await expect(page.getByTestId('findings-against').getByTestId('finding')).toHaveCount(1);
});

test('an unknown session says so in plain words', async ({ page }) => {
	const response = await page.goto('/sessions/no-such-session');
	expect(response?.status()).toBe(404);
	await expect(page.getByText('That session does not exist, or it belongs to someone else.')).toBeVisible();
});
