import { expect as baseExpect, test } from '@playwright/test';
import { DEMO, THROTTLED_ORIGIN } from './support';

const expect = baseExpect.configure({ timeout: 30_000 });
test.describe.configure({ timeout: 180_000 });

// Against the second server, which runs with the throttle on (playwright.config.ts).
test.use({ baseURL: THROTTLED_ORIGIN });

test('the 11th wrong password in a row is refused with 429 and a clear message, also for the right one', async ({
	page
}) => {
	const wrong = async (password: string) => {
		await page.getByLabel('Email').fill(DEMO.student2);
		await page.getByLabel('Password').fill(password);
		const answer = page.waitForResponse((r) => r.url().includes('/signin') && r.request().method() === 'POST');
		await page.getByRole('button', { name: 'Sign in' }).click();
		return answer;
	};
	await page.goto('/signin');
	await page.locator('html[data-ready]').waitFor();
	for (let i = 1; i <= 10; i++) {
		await wrong(`wrong-guess-${i}`);
		await expect(page.getByRole('alert')).toContainText('do not match');
	}
	const eleventh = await wrong('wrong-guess-11');
	expect((await eleventh.json()).status).toBe(429);
	await expect(page.getByRole('alert')).toContainText('Too many wrong passwords for this account');
	await page.screenshot({ path: 'e2e/.screens/accounts-signin-429.png', fullPage: true });

	// Locked means locked: the right password waits too, through the form and through the API.
	await wrong('rehearse-1234');
	await expect(page.getByRole('alert')).toContainText('Too many wrong passwords');
	const api = await page.request.post('/api/auth/sign-in/email', {
		headers: { origin: THROTTLED_ORIGIN },
		data: { email: DEMO.student2, password: 'rehearse-1234' }
	});
	expect(api.status()).toBe(429);
	expect((await api.json()).error).toMatch(/Too many wrong passwords/);

	// Other accounts from the same address are not affected.
	await page.getByLabel('Email').fill(DEMO.student3);
	await page.getByLabel('Password').fill('rehearse-1234');
	await page.getByRole('button', { name: 'Sign in' }).click();
	await expect(page.getByTestId('account-menu')).toBeVisible();
});
