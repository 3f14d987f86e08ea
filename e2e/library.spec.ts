import { readFileSync } from 'node:fs';
import { expect, test } from '@playwright/test';
import { open, signIn } from './support';

const fixture = (path: string) => readFileSync(new URL(path, import.meta.url), 'utf8');

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

test('a version 1 mapping file opens as version 2, with notes where the upgrade may not sound the same', async ({
	page
}) => {
	await open(page, '/mappings');
	const v1 = JSON.parse(fixture('../tests/engine/fixtures/v1-demos.json'))['two-deck'];
	await page.getByTestId('import-mapping').setInputFiles({
		name: 'old-set.json',
		mimeType: 'application/json',
		buffer: Buffer.from(JSON.stringify({ ...v1, name: 'Set from last year' }))
	});
	const notice = page.getByTestId('mappings-notice');
	await expect(notice).toContainText('The mapping was imported.');
	await expect(notice).toContainText('older mapping document (version 1) and was opened as version 2');
	await expect(notice).toContainText('with the same sound and findings');
	await expect(page.getByTestId('upgrade-notes')).toHaveCount(0);
	const row = page.getByTestId('mapping-row').filter({ hasText: 'Set from last year' });
	await expect(row).toHaveCount(1);
	const { mappings } = await (await page.request.get('/api/mappings')).json();
	const id = mappings.find((m: { name: string }) => m.name === 'Set from last year').id;
	const saved = await (await page.request.get(`/api/mappings/${id}?download`)).json();
	expect(saved.version).toBe(2);
	expect(saved.racks).toHaveLength(4);

	await page.getByTestId('import-mapping').setInputFiles({
		name: 'focus-rack.json',
		mimeType: 'application/json',
		buffer: Buffer.from(fixture('../tests/fixtures/v1-focus-and-slot-2.mapping.json'))
	});
	await expect(notice).toContainText('opened as version 2; check the notes below');
	await expect(page.getByTestId('upgrade-notes').getByRole('listitem')).toHaveText([
		/^Rack 1 played only its first effect on some pads .* try rack 1's pads before you play live\.$/
	]);
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
