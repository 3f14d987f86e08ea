import AxeBuilder from '@axe-core/playwright';
import { expect, test, type Page } from '@playwright/test';
import { open, signIn } from './support';

test.setTimeout(180_000);

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
	await expect(page).toHaveURL(/\/mappings\/[\w-]+$/);
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
	page.on('console', (m) => console.log('console:', m.type(), m.text()));
	page.on('pageerror', (e) => console.log('pageerror:', e.message));
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
