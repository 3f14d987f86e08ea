// Personal API tokens end to end: made on /account, used by a script (Playwright's request
// context, no cookies) with exactly the owner's rights, refused once revoked, and limited per
// token on the server that runs with the limits on.
import { expect as baseExpect, request as requests, test, type APIRequestContext, type Page } from '@playwright/test';
import { demoId, origin } from './api-support';
import { open, signIn, THROTTLED_ORIGIN } from './support';

const expect = baseExpect.configure({ timeout: 30_000 });
test.describe.configure({ timeout: 180_000 });
test.use({ permissions: ['clipboard-read', 'clipboard-write'] });

const bearer = (token: string) => ({ authorization: `Bearer ${token}` });

/** Creates a token through the /account form and returns it as shown (once). */
async function createToken(page: Page, name: string, expires = '30'): Promise<string> {
	await page.getByLabel('Token name').fill(name);
	await page.getByLabel('Stops working').selectOption(expires);
	await page.getByRole('button', { name: 'Create token' }).click();
	const shown = page.getByTestId('new-token');
	await expect(shown).toContainText(`Token “${name}” is ready`);
	await expect(shown).toContainText('you will not see it again');
	const token = await page.getByTestId('new-token-value').inputValue();
	expect(token).toMatch(/^pp_[A-Za-z]{64}$/);
	return token;
}

test('a token made on /account acts as its owner on the API, with the same rights, until it is revoked', async ({
	page,
	request
}) => {
	await signIn(page, 'student');
	await open(page, '/account');
	const section = page.getByRole('region', { name: 'API tokens' });
	await expect(section.getByTestId('tokens-empty')).toContainText('No tokens yet');
	await expect(section.getByRole('link', { name: 'How to use a token' })).toHaveAttribute('href', '/help/api#tokens');

	// A name of blanks only is refused in words, and nothing is made.
	await page.getByLabel('Token name').fill('   ');
	await page.getByRole('button', { name: 'Create token' }).click();
	await expect(section.getByText('Give the token a name')).toBeVisible();
	await expect(section.getByTestId('tokens-empty')).toBeVisible();

	const token = await createToken(page, 'Backup script');
	await section.getByRole('button', { name: 'Copy' }).click();
	await expect(section.getByRole('button', { name: 'Copied' })).toBeVisible();
	expect(await page.evaluate(() => navigator.clipboard.readText())).toBe(token);
	const row = section.getByTestId('token-row');
	await expect(row).toHaveCount(1);
	await expect(row).toContainText('Backup script');
	await expect(row).toContainText(`${token.slice(0, 8)}…`);
	await expect(row).toContainText('Never'); // not used yet
	await page.screenshot({ path: 'e2e/.screens/api-tokens-created.png', fullPage: true });

	// The script: no cookies, only the token.
	const mine = await request.get('/api/mappings', { headers: bearer(token) });
	expect(mine.status()).toBe(200);
	const { mappings } = (await mine.json()) as { mappings: { name: string }[] };
	expect(mappings.map((m) => m.name)).toContain('Two-deck pad set');
	expect((await request.get('/api/mappings')).status()).toBe(401);

	// What the student may not do, the token may not either: the same answer as with the cookie.
	const publicMapping = await demoId(page.request);
	for (const [method, path, data] of [
		['GET', '/api/drills', undefined],
		['PATCH', `/api/mappings/${publicMapping}`, { visibility: 'private' }]
	] as const) {
		const byCookie = await page.request.fetch(path, { method, data });
		const byToken = await request.fetch(path, { method, data, headers: bearer(token) });
		expect(byCookie.status(), `${method} ${path} with the cookie`).toBe(403);
		expect(byToken.status(), `${method} ${path} with the token`).toBe(403);
		expect(Object.keys(await byToken.json()).sort()).toEqual(['error', 'problems']);
	}

	// Pages, form actions and better-auth's endpoints go by the cookie alone.
	const pageByToken = await request.get('/home', { headers: bearer(token), maxRedirects: 0 });
	expect(pageByToken.status()).toBe(303);
	expect(pageByToken.headers().location).toMatch(/^\/signin/);
	const actionByToken = await request.post('/account?/createToken', {
		headers: { ...bearer(token), origin, accept: 'application/json' },
		form: { name: 'From a script', expires: '30' },
		maxRedirects: 0
	});
	expect(actionByToken.status()).toBe(401);
	expect(await actionByToken.text()).not.toContain('pp_');
	expect(await (await request.get('/api/auth/get-session', { headers: bearer(token) })).json()).toBeNull();

	// Last use shows on the list.
	await open(page, '/account');
	await expect(section.getByTestId('token-row')).toHaveCount(1); // the form action made none
	await expect(section.getByTestId('token-row')).not.toContainText('Never');
	await expect(section.getByTestId('new-token')).toHaveCount(0); // shown once only

	// Revoking asks first; then the token is refused in the API's error shape.
	await section.getByRole('button', { name: 'Revoke Backup script' }).click();
	const dialog = page.getByRole('dialog', { name: 'Revoke “Backup script”?' });
	await expect(dialog).toContainText('stop working at once');
	await page.screenshot({ path: 'e2e/.screens/api-tokens-revoke.png' });
	await dialog.getByRole('button', { name: 'Revoke token' }).click();
	await expect(section.getByText('The token is revoked')).toBeVisible();
	await expect(section.getByTestId('tokens-empty')).toBeVisible();
	const revoked = await request.get('/api/mappings', { headers: bearer(token) });
	expect(revoked.status()).toBe(401);
	expect(revoked.headers()['www-authenticate']).toMatch(/^Bearer /);
	const body = await revoked.json();
	expect(body).toEqual({ error: expect.stringMatching(/not valid/), problems: [] });
});

test('/help/api and the OpenAPI document describe the bearer token', async ({ page, request }) => {
	const doc = await (await request.get('/api/openapi.json')).json();
	expect(doc.components.securitySchemes.token).toMatchObject({ type: 'http', scheme: 'bearer' });
	expect(doc.security).toContainEqual({ token: [] });
	expect(doc.paths['/api/mappings'].get.responses['429']).toBeTruthy();
	await open(page, '/help/api#tokens');
	const section = page.getByRole('region', { name: 'Personal API tokens' });
	await expect(section).toContainText('Authorization');
	await expect(section).toContainText(/\d+ requests a minute/);
	await expect(section.getByTestId('token-example')).toContainText('Authorization: Bearer pp_');
	await page.screenshot({ path: 'e2e/.screens/api-tokens-help.png' });
});

test.describe('with the limits on', () => {
	test.use({ baseURL: THROTTLED_ORIGIN });

	test('a token past its requests a minute gets 429 with Retry-After; other tokens and the cookie go on', async ({
		page
	}) => {
		await signIn(page, 'student3');
		await open(page, '/account');
		const busy = await createToken(page, 'Busy loop');
		const calm = await createToken(page, 'Nightly backup');
		const script: APIRequestContext = await requests.newContext({ baseURL: THROTTLED_ORIGIN });
		const limit = Number(
			/(\d+) requests a minute/.exec((await (await script.get('/api/openapi.json')).json()).info.description)![1]
		);
		let ok = 0;
		let refused: Awaited<ReturnType<APIRequestContext['get']>> | null = null;
		const started = Date.now();
		for (let i = 0; i <= limit && !refused; i++) {
			const r = await script.get('/api/sessions', { headers: bearer(busy) });
			if (r.status() === 200) ok++;
			else refused = r;
		}
		console.log(JSON.stringify({ figure: 'token requests until 429', requests: ok + 1, ms: Date.now() - started }));
		expect(ok).toBe(limit);
		expect(refused!.status()).toBe(429);
		const wait = Number(refused!.headers()['retry-after']);
		expect(wait).toBeGreaterThanOrEqual(1);
		expect(wait).toBeLessThanOrEqual(60);
		expect(await refused!.json()).toEqual({
			error: expect.stringMatching(/Wait \d+ seconds? and try again/),
			problems: []
		});
		expect((await script.get('/api/sessions', { headers: bearer(busy) })).status()).toBe(429);
		expect((await script.get('/api/sessions', { headers: bearer(calm) })).status()).toBe(200);
		expect((await page.request.get('/api/sessions')).status()).toBe(200);
		await script.dispose();
	});
});
