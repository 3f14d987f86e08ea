import { expect, test } from '@playwright/test';
import { open, signIn } from './support';

// A layout learned earlier in this browser (the learn wizard keeps it in localStorage): a 4×4
// device sending notes 60–75 on channel 10, counted from its top-left pad.
const learned = {
	name: 'Bench pads',
	rows: 4,
	cols: 4,
	inputs: Array.from({ length: 16 }, (_, i) => ({
		id: `learned-${i}`,
		kind: 'pad',
		channel: 10,
		note: 60 + i,
		row: Math.floor(i / 4),
		col: i % 4
	}))
};

test('a learned layout is saved with the user’s mapping as a new version', async ({ page, baseURL }) => {
	await page.addInitScript(
		(profile) => localStorage.setItem('padproof.controller-profiles', JSON.stringify([profile])),
		learned
	);
	// Lena's mappings are used by no other spec (the authorization matrix saves layouts of its own to her account).
	await signIn(page, 'student2');
	const { mappings } = await (await page.request.get('/api/mappings')).json();
	const shared = mappings.find((m: { name: string }) => m.name === 'Two-deck pad set');
	const document = await (await page.request.get(`/api/mappings/${shared.id}?download`)).json();
	const created = await page.request.post('/api/mappings', {
		data: { name: 'Lena two-deck', document },
		headers: { origin: baseURL! }
	});
	const { id } = await created.json();

	await open(page, '/controllers');
	const panel = page.getByTestId('profile-to-mapping');
	await panel.getByLabel('Learned layout').selectOption('Bench pads');
	await panel.getByLabel('Your mapping').selectOption({ label: 'Lena two-deck' });
	await panel.getByRole('button', { name: 'Save into mapping' }).click();
	await expect(panel.getByRole('status')).toContainText('16 inputs moved');
	await expect(panel.getByRole('status')).toContainText('version 2');

	// The layout moved from this browser to the account.
	expect(await page.evaluate(() => localStorage.getItem('padproof.controller-profiles'))).toBeNull();
	const { layouts } = await (await page.request.get('/api/controllers')).json();
	expect(layouts.filter((l: { name: string }) => l.name === 'Bench pads')).toHaveLength(1);

	const saved = (await (await page.request.get(`/api/mappings/${id}`)).json()).mapping;
	expect(saved.version).toBe(2);
	const pad13 = saved.document.profile.inputs.find((i: { id: string }) => i.id === 'pad-13');
	expect(pad13).toMatchObject({ channel: 10, note: 60 });
	expect(saved.document.bindings).toEqual(document.bindings);
});
