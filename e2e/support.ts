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
	await expect(page.getByTestId('account-menu')).toBeVisible({ timeout: 30_000 });
}

/**
 * Real touch input through Chromium's DevTools protocol, for several fingers at once:
 * `finger(testid, n)` is a touch point on an element's centre; `down(all)` lists every finger now
 * down; `up(lifted)` lifts the listed ones (CDP's touchEnd lifts the points it lists).
 */
export async function touchScreen(page: Page) {
	const cdp = await page.context().newCDPSession(page);
	return {
		async finger(testid: string, id: number) {
			const box = (await page.getByTestId(testid).boundingBox())!;
			return { x: box.x + box.width / 2, y: box.y + box.height / 2, id };
		},
		down: (touchPoints: { x: number; y: number; id: number }[]) =>
			cdp.send('Input.dispatchTouchEvent', { type: 'touchStart', touchPoints }),
		up: (touchPoints: { x: number; y: number; id: number }[]) =>
			cdp.send('Input.dispatchTouchEvent', { type: 'touchEnd', touchPoints })
	};
}

/** The server with the sign-in throttle on (second web server of playwright.config.ts). */
export const THROTTLED_ORIGIN = `http://localhost:${Number(process.env.E2E_PORT ?? 4173) + 1}`;

/** Signs up a fresh account through the form and waits for the home page. */
export async function signUp(page: Page, name: string, email: string, password: string) {
	await open(page, '/signup');
	await page.getByLabel('Name').fill(name);
	await page.getByLabel('Email').fill(email);
	await page.getByLabel('Password', { exact: true }).fill(password);
	await page.getByLabel('Repeat password').fill(password);
	await page.getByRole('button', { name: 'Create account' }).click();
	await expect(page).toHaveURL(/\/home$/, { timeout: 30_000 });
}
