import { expect, type Page } from '@playwright/test';

// Demo accounts created on first start (see README "Demo logins").
export const DEMO_PASSWORD = 'rehearse-1234';
export const DEMO = {
	admin: 'ines@mixlab.example',
	teacher: 'tomas@mixlab.example',
	student: 'kai@mixlab.example',
	student2: 'lena@mixlab.example',
	student3: 'omar@mixlab.example'
} as const;

/** Opens a page and waits until its scripts run (event handlers attached). */
export async function open(page: Page, path: string) {
	const response = await page.goto(path);
	await page.locator('html[data-ready]').waitFor();
	return response;
}

/** Signs in through the real form and waits until the app shell is shown. */
export async function signIn(page: Page, who: keyof typeof DEMO | string, password = DEMO_PASSWORD) {
	const email = who in DEMO ? DEMO[who as keyof typeof DEMO] : who;
	await open(page, '/signin');
	await page.getByLabel('Email').fill(email);
	await page.getByLabel('Password').fill(password);
	await page.getByRole('button', { name: 'Sign in' }).click();
	await expect(page.getByTestId('account-menu')).toBeVisible();
}
