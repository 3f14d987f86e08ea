import AxeBuilder from '@axe-core/playwright';
import { expect as baseExpect, test, type Browser, type Page } from '@playwright/test';
import { readFileSync } from 'node:fs';
import { installFakeMidi, ONE_CONTROLLER } from './fake-midi';
import { open, signIn } from './support';

test.setTimeout(240_000);
// Two cores shared by many: give the dev server time to build a page on first visit.
const expect = baseExpect.configure({ timeout: 30_000 });

async function signUp(page: Page, name: string) {
	const email = `${name.toLowerCase()}.${Date.now()}@example.com`;
	await open(page, '/signup');
	await page.getByLabel('Name').fill(name);
	await page.getByLabel('Email').fill(email);
	await page.getByLabel('Password', { exact: true }).fill('pad-studio-42');
	await page.getByLabel('Repeat password').fill('pad-studio-42');
	await page.getByRole('button', { name: 'Create account' }).click();
	await expect(page).toHaveURL(/\/home$/);
	return email;
}

async function newMapping(page: Page, name: string) {
	await open(page, '/mappings');
	await page.getByRole('link', { name: 'New mapping' }).click();
	await expect(page).toHaveURL(/\/mappings\/new$/);
	await page.getByLabel('Name', { exact: true }).fill(name);
	await page.getByLabel('Controller').selectOption({ label: 'Generic 4×4 pads' });
	await page.getByLabel('Two decks (A, B)').check();
	await page.getByLabel('Racks').fill('2');
	await page.getByRole('button', { name: 'Create mapping' }).click();
	await expect(page).toHaveURL(/\/mappings\/[0-9a-f-]{36}$/);
	await page.locator('html[data-ready]').waitFor();
}

const saved = (page: Page) => expect(page.getByTestId('save-status')).toHaveAttribute('data-state', 'saved');

async function buildEchoPad(page: Page) {
	await page.getByTestId('studio-pad-pad-1').click();
	await page.getByRole('button', { name: 'One-press effect…' }).first().click();
	const dialog = page.getByRole('dialog', { name: 'One-press effect' });
	await dialog.getByLabel('Label').fill('Echo A');
	await dialog.getByLabel('Effect 1: Echo time').selectOption('1/8');
	await expect(dialog.getByTestId('builder-preview')).toContainText('load Echo 1/8 into rack 1');
	await dialog.getByRole('button', { name: 'Write the steps' }).click();
	await expect(dialog).toBeHidden();
}

async function buildStutterRow(page: Page) {
	await page.getByRole('button', { name: 'Hold-group row…' }).click();
	const dialog = page.getByRole('dialog', { name: 'Hold-group row' });
	for (const n of [13, 14, 15, 16]) await dialog.getByLabel(`Pad ${n}`, { exact: true }).check();
	await dialog.getByLabel('Rack').selectOption('2');
	await expect(dialog.getByTestId('builder-preview').getByTestId('lane-press')).toHaveCount(4);
	await dialog.getByRole('button', { name: 'Write the row' }).click();
	await expect(dialog).toBeHidden();
}

test('a new user builds an echo pad and a stutter row, proves the row, breaks it and replays the counterexample', async ({
	page
}) => {
	await signUp(page, 'Noor');
	await newMapping(page, 'Studio set');
	await page.screenshot({ path: 'test-results/studio-empty.png', fullPage: true });
	await buildEchoPad(page);
	const card = page.getByTestId('pad-editor').getByTestId('pad-sentences');
	await expect(card.getByTestId('lane-press')).toContainText('load Echo 1/8 into rack 1');
	await expect(card.getByTestId('lane-press')).toContainText('route to deck A only');
	await expect(card.getByTestId('lane-release')).toContainText('switch off');
	await buildStutterRow(page);
	await expect(page.getByTestId('doctor-clear')).toBeVisible();
	await saved(page);
	await page.screenshot({ path: 'test-results/studio-built.png', fullPage: true });

	const group = page.getByTestId('group-row');
	await group.getByRole('button', { name: 'Prove row' }).click();
	await expect(group.getByTestId('proof')).toContainText('this group, from the starting rig', { timeout: 60_000 });

	// Take the guard off the release step that switches the row's rack off.
	await page.getByTestId('studio-pad-pad-13').click();
	await page
		.getByTestId('pad-editor')
		.getByTestId('lane-release')
		.getByRole('button', { name: /switch off when held = 1/ })
		.click();
	const form = page.getByTestId('step-editor');
	await form.getByRole('button', { name: 'Remove guard 1' }).click();
	await form.getByRole('button', { name: 'Save step' }).click();
	await expect(page.getByTestId('pad-editor').getByTestId('lane-release')).toContainText('switch off');
	await expect(page.getByTestId('pad-editor').getByTestId('lane-release')).not.toContainText('when held = 1');
	await saved(page);

	await group.getByRole('button', { name: 'Prove row' }).click();
	const broken = group.getByTestId('counterexample');
	await expect(broken).toBeVisible();
	await expect(broken.locator('li')).toHaveCount(3);
	await page.screenshot({ path: 'test-results/studio-counterexample.png', fullPage: true });
	await broken.getByRole('button', { name: 'Open in replay' }).click();
	await expect(page).toHaveURL(/\/sessions\/[\w-]+\?finding=\d+$/, { timeout: 60_000 });
	const finding = page.getByTestId('findings-original').getByTestId('finding').and(page.locator('[aria-pressed=true]'));
	await expect(finding).toHaveAttribute('data-kind', 'dropout');
	// Events land 250 ms apart: the third is at 0.750 s.
	await expect(finding).toContainText('0.750 s');
	await page.screenshot({ path: 'test-results/studio-replay.png', fullPage: true });
});

const mappingId = (page: Page) => new URL(page.url()).pathname.split('/')[2];
const documentOf = async (page: Page, id: string) =>
	(await (await page.request.get(`/api/mappings/${id}`)).json()).mapping as { version: number; document: unknown };

test('undo and redo round-trip a builder’s steps, and the saved document follows', async ({ page }) => {
	await signUp(page, 'Ada');
	await newMapping(page, 'Undo set');
	const id = mappingId(page);
	await buildEchoPad(page);
	const pad = page.getByTestId('studio-pad-pad-1');
	await expect(pad).toContainText('Echo A');
	await saved(page);
	const built = (await documentOf(page, id)).document;

	await page.getByRole('button', { name: 'Undo' }).click();
	await expect(pad).toContainText('empty');
	await saved(page);
	expect((await documentOf(page, id)).document).toMatchObject({ bindings: [] });

	await page
		.getByRole('heading', { name: /Echo A|Pad 1/ })
		.first()
		.click(); // focus off any field
	await page.keyboard.press('Control+Shift+Z');
	await expect(pad).toContainText('Echo A');
	await saved(page);
	expect((await documentOf(page, id)).document).toEqual(built);
	await page.keyboard.press('Control+Z');
	await expect(pad).toContainText('empty');
});

test('export then import gives an identical document, as a new mapping and as the next version', async ({ page }) => {
	await signUp(page, 'Ivo');
	await newMapping(page, 'Round trip');
	const id = mappingId(page);
	await buildEchoPad(page);
	await buildStutterRow(page);
	await saved(page);
	const [download] = await Promise.all([
		page.waitForEvent('download'),
		page.getByRole('link', { name: 'Export' }).click()
	]);
	const file = JSON.parse(readFileSync((await download.path())!, 'utf8'));
	const original = await documentOf(page, id);
	expect(file).toEqual(original.document);

	await open(page, '/mappings');
	await page.getByTestId('import-mapping').setInputFiles((await download.path())!);
	await expect(page.getByRole('status')).toContainText('imported');
	const rows = page.getByTestId('mapping-row').filter({ hasText: 'Round trip' });
	await expect(rows).toHaveCount(2);
	const ids = await rows
		.getByRole('link', { name: 'Round trip' })
		.evaluateAll((as) => as.map((a) => a.getAttribute('href')!.split('/')[2]));
	const copy = ids.find((x) => x !== id)!;
	expect((await documentOf(page, copy)).document).toEqual(original.document);

	await page
		.getByTestId('import-into')
		.selectOption({ label: `the next version of Round trip (now v${original.version})` });
	await page.getByTestId('import-mapping').setInputFiles((await download.path())!);
	await expect(page.getByRole('status')).toContainText(`saved as version ${original.version + 1}`);
	const next = await documentOf(page, id);
	expect(next.version).toBe(original.version + 1);
	expect(next.document).toEqual(original.document);
});

test('another user sees a public mapping read-only, is refused by the API, and forks it to edit', async ({ page }) => {
	await signUp(page, 'Lio');
	await open(page, '/mappings');
	const demo = page.getByTestId('mapping-row').filter({ hasText: 'Two-deck pad set' }).filter({ hasText: 'demo' });
	await demo.getByRole('link', { name: 'View' }).click();
	await expect(page.getByTestId('read-only')).toBeVisible();
	const id = mappingId(page);
	await page.getByTestId('studio-pad-pad-1').click();
	await expect(page.getByTestId('pad-sentences')).toContainText('load Echo');
	await expect(page.getByRole('button', { name: 'Add a step' })).toHaveCount(0);
	await expect(page.getByRole('button', { name: 'Undo' })).toHaveCount(0);

	const before = await documentOf(page, id);
	const refused = await page.request.put(`/api/mappings/${id}`, {
		data: { document: { ...(before.document as object), name: 'Mine now' }, baseVersion: before.version }
	});
	expect(refused.status()).toBe(403);
	expect(await refused.json()).toMatchObject({ error: expect.stringContaining('Fork it'), problems: [] });
	expect(await documentOf(page, id)).toEqual(before);

	await page.getByRole('button', { name: 'Fork to edit' }).click();
	await expect(page).toHaveURL((url) => url.pathname.startsWith('/mappings/') && !url.pathname.endsWith(id));
	await expect(page.getByRole('button', { name: 'Undo' })).toBeVisible();
	await expect(page.getByText('Yours ·')).toBeVisible();
	const fork = await documentOf(page, mappingId(page));
	expect(fork.document).toEqual(before.document);
});

test('two tabs edit one mapping: the second save shows the conflict and nothing is overwritten', async ({
	page,
	context
}) => {
	await signUp(page, 'Tam');
	await newMapping(page, 'Two tabs');
	const id = mappingId(page);
	const other = await context.newPage();
	await open(other, `/mappings/${id}`);

	await page.getByLabel('Name of rack 1').fill('Echoes');
	await page.getByLabel('Name of rack 1').press('Enter');
	await page.getByLabel('Name of rack 1').blur();
	await saved(page);
	await expect(page.getByTestId('save-status')).toContainText('v2');

	await other.getByLabel('Name of rack 2').fill('Stutters');
	await other.getByLabel('Name of rack 2').blur();
	await expect(other.getByTestId('save-status')).toHaveAttribute('data-state', 'conflict');
	await expect(other.getByTestId('conflict')).toContainText('saved version 2');
	await other.screenshot({ path: 'test-results/studio-conflict.png' });
	const stored = (await documentOf(page, id)) as { version: number; document: { racks: { label: string }[] } };
	expect(stored.version).toBe(2);
	expect(stored.document.racks.map((r) => r.label)).toEqual(['Echoes', 'Rack 2']);

	await other.getByRole('button', { name: 'Load version 2 (drop my changes)' }).click();
	await expect(other.getByLabel('Name of rack 1')).toHaveValue('Echoes');
	await expect(other.getByLabel('Name of rack 2')).toHaveValue('Rack 2');
	await expect(other.getByTestId('save-status')).toHaveAttribute('data-state', 'saved');
});

test('the pad sheet prints one card for every pad', async ({ page }) => {
	await signUp(page, 'Pia');
	await newMapping(page, 'Sheet set');
	await buildEchoPad(page);
	await saved(page);
	await page.getByRole('link', { name: 'Pad sheet' }).click();
	await expect(page).toHaveURL(/\/sheet$/);
	const cards = page.getByTestId('sheet-card');
	await expect(cards).toHaveCount(16);
	await expect(cards.filter({ hasText: 'Echo A' })).toContainText('Press: load Echo 1/8 into rack 1');
	await page.emulateMedia({ media: 'print' });
	await expect(page.getByRole('banner')).toBeHidden();
	await expect(page.getByRole('button', { name: 'Print' })).toBeHidden();
	await expect(cards.first()).toBeVisible();
	await page.screenshot({ path: 'test-results/studio-sheet-print.png', fullPage: true });
	for (const format of ['A4', 'Letter']) {
		const pdf = await page.pdf({ format, preferCSSPageSize: true });
		const pages = pdf.toString('latin1').match(/\/Type\s*\/Page[^s]/g) ?? [];
		// Sixteen two-column cards fit on two pages of either paper.
		expect(pages.length, format).toBeGreaterThan(0);
		expect(pages.length, format).toBeLessThanOrEqual(2);
	}
});

test('a whole pad is built from the keyboard, and the editor’s form fields all have labels', async ({ page }) => {
	await signUp(page, 'Kim');
	await newMapping(page, 'Keys only');
	await page.getByTestId('studio-pad-pad-2').focus();
	await page.keyboard.press('Enter');
	await page.getByRole('button', { name: 'Add a step' }).focus();
	await page.keyboard.press('Enter');
	const form = page.getByTestId('step-editor');
	await form.getByLabel('What it changes').focus();
	await form.getByLabel('What it changes').selectOption('rack-mix');
	await form.getByLabel('Value (percent)').fill('60');
	await form.getByRole('button', { name: 'Save step' }).focus();
	await page.keyboard.press('Enter');
	await expect(page.getByTestId('step-row')).toHaveCount(1);

	await page.getByRole('button', { name: 'Add a step' }).focus();
	await page.keyboard.press('Enter');
	await form.getByLabel('Action').selectOption('momentary');
	await form.getByRole('button', { name: 'Save step' }).focus();
	await page.keyboard.press('Enter');
	await expect(page.getByTestId('step-row')).toHaveCount(2);

	// Move "switch on" above the mix with Alt+↑, then label the pad.
	await page
		.getByTestId('step-row')
		.nth(1)
		.getByRole('button', { name: /^Step 2:/ })
		.focus();
	await page.keyboard.press('Alt+ArrowUp');
	await expect(page.getByTestId('step-row').first()).toContainText('switch rack 1 on');
	await expect(page.getByRole('button', { name: /^Step 1:/ })).toBeFocused();
	await page.getByTestId('binding-settings').getByLabel('Label').fill('Wash');
	await page.keyboard.press('Tab');
	await expect(page.getByTestId('studio-pad-pad-2')).toContainText('Wash');
	await saved(page);

	await page.getByRole('button', { name: /^Step 1:/ }).focus();
	await page.keyboard.press('Enter');
	const labelRules = ['label', 'select-name', 'button-name', 'aria-input-field-name', 'form-field-multiple-labels'];
	const editor = await new AxeBuilder({ page }).include('main').withRules(labelRules).analyze();
	expect(editor.violations).toEqual([]);
	await page.getByRole('button', { name: 'One-press effect…' }).first().focus();
	await page.keyboard.press('Enter');
	const dialog = await new AxeBuilder({ page }).include('dialog[open]').withRules(labelRules).analyze();
	expect(dialog.violations).toEqual([]);
	await page.keyboard.press('Escape');
	await page.getByRole('button', { name: 'Hold-group row…' }).focus();
	await page.keyboard.press('Enter');
	await page.getByRole('dialog', { name: 'Hold-group row' }).getByLabel('Pad 1', { exact: true }).check();
	await page.getByRole('dialog', { name: 'Hold-group row' }).getByLabel('Pad 3', { exact: true }).check();
	const row = await new AxeBuilder({ page }).include('dialog[open]').withRules(labelRules).analyze();
	expect(row.violations).toEqual([]);
	await page.screenshot({ path: 'test-results/studio-row-dialog.png' });
});

test('MIDI learn gives a pad the note it was heard on, and try pads offers your own mappings', async ({ page }) => {
	const midi = await installFakeMidi(page, { ports: ONE_CONTROLLER });
	await signUp(page, 'Mo');
	await newMapping(page, 'Learned set');
	const id = mappingId(page);
	await buildEchoPad(page);
	await page.getByRole('button', { name: 'MIDI learn this pad' }).click();
	await expect(page.getByTestId('learn-status')).toContainText('Press the pad on your controller');
	// MIDI 1.0: 0x99 = Note On, channel 10; note 60 is taken by nothing yet.
	await midi.send('pads-in', [0x99, 60, 100]);
	await expect(page.getByTestId('learn-status')).toContainText('Learned: note 60 on channel 10');
	await expect(page.getByTestId('pad-editor')).toContainText('note 60, channel 10');
	await saved(page);
	const input = (
		(await documentOf(page, id)).document as { profile: { inputs: { id: string }[] } }
	).profile.inputs.find((i) => i.id === 'pad-1');
	expect(input).toMatchObject({ channel: 10, note: 60, led: { note: 60 } });

	await open(page, '/controllers');
	const tryPads = page.getByTestId('try-pads');
	await tryPads.getByLabel('Mapping').selectOption({ label: 'Learned set' });
	await expect(tryPads).toContainText('One of your own mappings');
	await expect(tryPads.getByRole('button', { name: /^Echo A/ })).toBeVisible();
});

test('the versions panel compares two versions in plain words and restores an old one as the newest', async ({
	page
}) => {
	await signUp(page, 'Vera');
	await newMapping(page, 'History set');
	const id = mappingId(page);
	const status = page.getByTestId('save-status');

	// Edit 1: a one-press echo pad (version 2). Edit 2: delete its last step (version 3).
	await buildEchoPad(page);
	await saved(page);
	await expect(status).toContainText('v2');
	const rows = page.getByTestId('step-row');
	const stepCount = await rows.count();
	const last = rows.last();
	const lastText = (await last.getByRole('button', { name: /^Step \d+:/ }).textContent())!.replace(/^Step \d+: /, '');
	await last.getByRole('button', { name: /^Delete/ }).click();
	await expect(rows).toHaveCount(stepCount - 1);
	await saved(page);
	await expect(status).toContainText('v3');

	const panel = page.getByTestId('versions');
	const history = panel.locator('ol').getByRole('listitem');
	await expect(history).toHaveCount(3);
	await expect(history.first()).toContainText('v3');
	await expect(history.first()).toContainText('newest');

	await panel.getByLabel('From').selectOption('1');
	await panel.getByLabel('To').selectOption('3');
	await panel.getByRole('button', { name: 'Compare' }).click();
	const diff = panel.getByTestId('version-diff');
	await expect(diff).toContainText('Echo A (Pad 1): now set up: Press: load Echo 1/8 into rack 1');
	await panel.getByLabel('From').selectOption('2');
	await panel.getByRole('button', { name: 'Compare' }).click();
	await expect(diff).toContainText(`Echo A (Pad 1): step ${stepCount} removed: ${lastText}`);

	const v1 = (await (await page.request.get(`/api/mappings/${id}?version=1`)).json()).mapping.document;
	await panel.getByRole('button', { name: /^Restore\s*version 1$/ }).click();
	await expect(page.getByText('Version 1 restored as the newest')).toBeVisible();
	await saved(page);
	await expect(status).toContainText('v4');
	await expect(page.getByTestId('studio-pad-pad-1')).toContainText('empty');
	await expect(history).toHaveCount(4);
	await expect(history.first()).toContainText('v4');
	const newest = await documentOf(page, id);
	expect(newest.version).toBe(4);
	expect(newest.document).toEqual(v1);
});

/** A second person in their own browser context (their own cookies). */
async function secondPerson(browser: Browser) {
	const context = await browser.newContext();
	return { context, page: await context.newPage() };
}

test('a mapping one user shares publicly is seen, refused and forked by a newly signed-up user', async ({
	page,
	browser
}) => {
	const name = `Shared echo ${Date.now()}`;
	await signUp(page, 'Noa');
	await newMapping(page, name);
	const id = mappingId(page);
	await buildEchoPad(page);
	await saved(page);
	await open(page, '/mappings');
	const mine = page.getByTestId('mappings-yours').getByTestId('mapping-row').filter({ hasText: name });
	await mine.getByRole('button', { name: 'Share publicly' }).click();
	await expect(page.getByRole('status')).toContainText(`${name} is now public`);
	await expect(mine).toContainText('public');

	const other = await secondPerson(browser);
	const them = other.page;
	await signUp(them, 'Remy');
	await open(them, '/mappings');
	const row = them.getByTestId('mappings-everyone').getByTestId('mapping-row').filter({ hasText: name });
	await expect(row).toContainText('by Noa');
	await expect(row.getByRole('button', { name: 'Share publicly' })).toHaveCount(0);
	await row.getByRole('link', { name: 'View' }).click();
	await expect(them).toHaveURL(new RegExp(`/mappings/${id}$`));
	await expect(them.getByTestId('read-only')).toBeVisible();
	await them.getByTestId('studio-pad-pad-1').click();
	await expect(them.getByTestId('pad-sentences')).toContainText('load Echo 1/8');
	await expect(them.getByRole('button', { name: 'Add a step' })).toHaveCount(0);
	await expect(them.getByRole('button', { name: 'One-press effect…' })).toHaveCount(0);
	await expect(them.getByRole('button', { name: /^Restore/ })).toHaveCount(0);

	const before = await documentOf(them, id);
	const refused = await them.request.put(`/api/mappings/${id}`, {
		data: { document: { ...(before.document as object), name: 'Taken over' }, baseVersion: before.version }
	});
	expect(refused.status()).toBe(403);
	expect(await refused.json()).toMatchObject({ error: expect.stringContaining('Fork it'), problems: [] });
	const renamed = await them.request.patch(`/api/mappings/${id}`, { data: { name: 'Taken over' } });
	expect(renamed.status()).toBe(403);
	expect(await documentOf(them, id)).toEqual(before);

	await them.getByRole('button', { name: 'Fork to edit' }).click();
	await expect(them).toHaveURL((url) => /^\/mappings\/[0-9a-f-]{36}$/.test(url.pathname) && !url.pathname.endsWith(id));
	const fork = mappingId(them);
	await expect(them.getByText('Yours ·')).toBeVisible();
	await them.getByLabel('Name of rack 1').fill('My echoes');
	await them.getByLabel('Name of rack 1').blur();
	await saved(them);
	const forked = (await documentOf(them, fork)) as { version: number; document: { racks: { label: string }[] } };
	expect(forked.version).toBe(2);
	expect(forked.document.racks[0].label).toBe('My echoes');
	// The original is as its owner left it.
	expect(await documentOf(page, id)).toMatchObject({ version: before.version, document: before.document });
	await other.context.close();
});

test('a private mapping a teacher shares with a class is listed to the class, read-only, with rehearse, fork and export', async ({
	page,
	browser
}) => {
	const name = `Crew only ${Date.now()}`;
	await signIn(page, 'teacher');
	await newMapping(page, name);
	const id = mappingId(page);
	await buildEchoPad(page);
	await saved(page);
	await open(page, '/classes/demo-class-wednesday');
	const classShares = page.locator('section[aria-labelledby="shared-heading"]');
	await classShares.getByRole('combobox', { name: 'Mapping' }).selectOption({ label: name });
	await classShares.getByRole('button', { name: 'Share', exact: true }).click();
	await expect(classShares.getByRole('link', { name: new RegExp(name) })).toBeVisible();
	// The teacher sees it as their own, marked with the class.
	await open(page, '/mappings');
	await expect(page.getByTestId('mappings-yours').getByTestId('mapping-row').filter({ hasText: name })).toContainText(
		'private · shared with Wednesday night crew'
	);

	// Lena is in the class; Kai is not.
	const lena = await secondPerson(browser);
	await signIn(lena.page, 'student2');
	await open(lena.page, '/mappings');
	const section = lena.page.getByTestId('mappings-classes');
	await expect(section.getByRole('heading')).toContainText('Shared with your classes');
	const row = section.getByTestId('mapping-row').filter({ hasText: name });
	await expect(row).toContainText('by Tomas');
	await expect(row).toContainText('private · shared with Wednesday night crew');
	await expect(section.getByTestId('mapping-row').filter({ hasText: 'Two-deck pad set' })).toHaveCount(1);
	await expect(
		lena.page.getByTestId('mappings-everyone').getByTestId('mapping-row').filter({ hasText: name })
	).toHaveCount(0);
	await expect(row.getByRole('link', { name: 'Rehearse' })).toHaveAttribute('href', `/rehearse/${id}`);
	await expect(row.getByRole('link', { name: 'Export' })).toHaveAttribute('href', `/api/mappings/${id}?download`);
	for (const owner of ['Rename', 'Share publicly', 'Delete'])
		await expect(row.getByRole('button', { name: owner })).toHaveCount(0);
	const exported = await lena.page.request.get(`/api/mappings/${id}?download`);
	expect(exported.status()).toBe(200);

	await row.getByRole('link', { name: 'View' }).click();
	await expect(lena.page.getByTestId('read-only')).toBeVisible();
	const before = await documentOf(lena.page, id);
	const refused = await lena.page.request.put(`/api/mappings/${id}`, {
		data: { document: before.document, baseVersion: before.version }
	});
	expect(refused.status()).toBe(403);

	await open(lena.page, '/mappings');
	await row.getByRole('button', { name: 'Fork' }).click();
	await expect(lena.page.getByRole('status')).toContainText(`${name} was forked into your mappings`);
	const fork = lena.page.getByTestId('mappings-yours').getByTestId('mapping-row').filter({ hasText: name });
	await expect(fork).toContainText('Yours · v1 · private');

	const kai = await secondPerson(browser);
	await signIn(kai.page, 'student');
	await open(kai.page, '/mappings');
	// (Other tests put Kai in classes of their own; none of them has this mapping.)
	await expect(kai.page.getByTestId('mapping-row').filter({ hasText: name })).toHaveCount(0);
	await lena.context.close();
	await kai.context.close();
});
