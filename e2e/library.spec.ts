import { expect, test } from '@playwright/test';
import { open, signIn } from './support';

test.beforeEach(async ({ page }) => signIn(page, 'student'));

test('the library lists the shared demo mappings with their check findings', async ({ page }) => {
	await open(page, '/mappings');
	const demos = page.getByTestId('mapping-row').filter({ hasText: 'demo' });
	await expect(demos).toHaveCount(3);
	// lintMapping finds the broken row's missing held-pad counter; the two good sets check clean.
	await expect(demos.filter({ hasText: 'Broken stutter row' }).getByTestId('lint-count')).toHaveAttribute(
		'data-count',
		'1'
	);
	await expect(demos.filter({ hasText: 'Two-deck pad set' }).getByTestId('lint-count')).toHaveAttribute(
		'data-count',
		'0'
	);
});

test('a bad mapping file gives a readable error and changes nothing', async ({ page }) => {
	await open(page, '/mappings');
	const before = await page.getByTestId('mapping-row').count();
	await page.getByTestId('import-mapping').setInputFiles({
		name: 'half-done.json',
		mimeType: 'application/json',
		buffer: Buffer.from(JSON.stringify({ version: 1, name: 'Half done', decks: 3, profile: { name: 'x', inputs: [] } }))
	});
	const error = page.getByTestId('import-error');
	await expect(error).toContainText('not a valid mapping document');
	await expect(error).toContainText('decks');
	await expect(error).toContainText('Nothing was changed.');
	await page.reload();
	await page.locator('html[data-ready]').waitFor();
	await expect(page.getByTestId('mapping-row')).toHaveCount(before);

	await page
		.getByTestId('import-mapping')
		.setInputFiles({ name: 'notes.json', mimeType: 'application/json', buffer: Buffer.from('{ not json') });
	await expect(page.getByTestId('import-error')).toContainText('notes.json is not a JSON file');
});

test('an exported mapping imports back as the user’s own copy', async ({ page }) => {
	await open(page, '/mappings');
	const mine = page.getByTestId('mapping-row').filter({ hasText: 'Yours' });
	const before = await mine.count();
	const row = page.getByTestId('mapping-row').filter({ hasText: 'Two-deck pad set' }).filter({ hasText: 'demo' });
	const [download] = await Promise.all([
		page.waitForEvent('download'),
		row.getByRole('link', { name: 'Export' }).click()
	]);
	const path = await download.path();
	await page.getByTestId('import-mapping').setInputFiles(path!);
	await expect(page.getByRole('status')).toContainText('imported');
	await expect(mine).toHaveCount(before + 1);

	await mine.first().getByRole('button', { name: 'Delete' }).click(); // newest first
	await page.getByRole('button', { name: 'Delete mapping' }).click();
	await expect(page.getByRole('status')).toContainText('was deleted');
	await expect(mine).toHaveCount(before);
});

test('a bad session file gives a readable error and saves nothing', async ({ page }) => {
	await open(page, '/sessions');
	const before = await page.getByTestId('session-row').count();
	await page.getByTestId('import-session-mapping').selectOption({ label: 'Two-deck pad set' });
	const backwards = {
		version: 1,
		tempo: 120,
		startedAt: '2026-12-01T20:00:00.000Z',
		events: [
			{ t: 900, input: { input: 'pad-1', type: 'press' } },
			{ t: 100, input: { input: 'pad-1', type: 'release' } }
		]
	};
	await page.getByTestId('import-session').setInputFiles({
		name: 'late.session.json',
		mimeType: 'application/json',
		buffer: Buffer.from(JSON.stringify(backwards))
	});
	await expect(page.getByTestId('import-session-error')).toContainText('time order');
	await expect(page.getByTestId('import-session-error')).toContainText('Nothing was saved.');

	await page.getByTestId('import-session').setInputFiles({
		name: 'cut.mid',
		mimeType: 'audio/midi',
		buffer: Buffer.from([0x4d, 0x54, 0x68, 0x64, 0, 0, 0, 6, 0, 1])
	});
	await expect(page.getByTestId('import-session-error')).toContainText('cut.mid could not be read');
	await page.reload();
	await page.locator('html[data-ready]').waitFor();
	await expect(page.getByTestId('session-row')).toHaveCount(before);
});
