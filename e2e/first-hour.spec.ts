import { expect, test, type Page } from '@playwright/test';
import { resetLink, waitForMail } from './outbox';
import { open, touchScreen } from './support';

// A newcomer's first hour, as one journey: sign up, follow the home guide, read the glossary,
// rehearse the demo whose stutter row drops out, record a take, replay it and find the dropout,
// then forget the password and set a new one through the mailed link.
// Demo "Broken stutter row" (src/lib/engine/demo.ts): the top row pad-13..pad-16 plays keys 1–4
// and is plain momentary on/off, so lifting one finger of two cuts the effect on deck A.
const LAPTOP = { width: 1366, height: 768 };
const PHONE = { width: 390, height: 844 };

/** Every element is wholly inside the viewport (measured, not judged from a screenshot). */
async function expectInViewport(page: Page, testids: string[]) {
	const { width, height } = page.viewportSize()!;
	for (const id of testids) {
		const box = await page.getByTestId(id).boundingBox();
		expect(box, `${id} is on the page`).not.toBeNull();
		expect(
			{
				id,
				left: box!.x >= 0,
				top: box!.y >= 0,
				right: box!.x + box!.width <= width,
				bottom: box!.y + box!.height <= height
			},
			`${id} at ${JSON.stringify(box)} in ${width}×${height}`
		).toEqual({ id, left: true, top: true, right: true, bottom: true });
	}
}

const PADS = Array.from({ length: 16 }, (_, i) => `pad-pad-${i + 1}`);

async function noSidewaysScroll(page: Page) {
	const [scroll, client] = await page.evaluate(() => [
		document.documentElement.scrollWidth,
		document.documentElement.clientWidth
	]);
	expect(scroll, 'page width').toBeLessThanOrEqual(client);
}

test('a newcomer signs up, follows the guide, records a take and finds its dropout, on a laptop and a phone', async ({
	browser
}, testInfo) => {
	test.setTimeout(300_000);
	const context = await browser.newContext({ viewport: LAPTOP });
	const page = await context.newPage();
	const shot = async (name: string) =>
		page
			.screenshot({ path: testInfo.outputPath(`${name}.png`) })
			.then((body) => testInfo.attach(name, { body, contentType: 'image/png' }));

	// Sign up.
	const email = `ada.${Date.now()}@example.com`;
	await open(page, '/signup');
	await page.getByLabel('Name').fill('Ada Quill');
	await page.getByLabel('Email').fill(email);
	await page.getByLabel('Password', { exact: true }).fill('first-hour-77');
	await page.getByLabel('Repeat password').fill('first-hour-77');
	await page.getByRole('button', { name: 'Create account' }).click();
	await expect(page).toHaveURL(/\/home$/);

	// The home guide: what Padproof is for and three steps, each a link.
	const guide = page.getByTestId('start-guide');
	await expect(guide).toContainText('shows the exact press where it would fail on stage');
	const steps = guide.getByTestId('start-step');
	await expect(steps).toHaveCount(3);
	await expect(steps.nth(0)).toContainText('Rehearse a demo pad set');
	await expect(steps.nth(1)).toContainText('Record a take');
	await expect(steps.nth(2)).toContainText('Replay it and find the dropout');
	await shot('home-laptop');

	// A term on the guide explains itself and links to the glossary; the header links it too.
	const dropout = guide.getByTestId('term').filter({ hasText: 'dropout' });
	await dropout.hover();
	await expect(dropout.getByRole('tooltip')).toBeVisible();
	await expect(dropout.getByRole('tooltip')).toContainText('held but its effect is not heard');
	await page.getByTestId('account-menu').getByRole('link', { name: 'Glossary' }).click();
	await expect(page).toHaveURL(/\/help$/);
	await expect(page.getByRole('heading', { name: 'Glossary' })).toBeVisible();
	for (const id of ['hold-group', 'stuck-on', 'bleed', 'count-left-over', 'count-overflow', 'takeover'])
		await expect(page.locator(`[id="${id}"]`)).toBeVisible();
	await page.goto('/help#hold-group');
	await expect(page.locator('[id="hold-group"]')).toBeInViewport();
	await shot('glossary-laptop');
	await open(page, '/home');

	// Step 1: the rehearsal room. At 1366×768 every pad, Record and the live findings are in view.
	await page.getByTestId('start-step').nth(0).getByRole('link').click();
	await expect(page.getByTestId('room-mapping')).toContainText('Broken stutter row', { timeout: 30_000 });
	await page.locator('html[data-ready]').waitFor();
	await expectInViewport(page, [...PADS, 'record-start', 'live-findings']);
	for (const deck of ['A', 'B']) await expect(page.getByTestId(`deck-${deck}-play`)).toHaveText(/Ready|Stopped/);
	await expect(page.getByTestId('deck-A-play')).toHaveText('Ready');
	await shot('room-laptop');

	// Step 2: record a take: two fingers on the stutter row, the first lifted early.
	await page.getByTestId('count-in-toggle').uncheck();
	await page.getByTestId('record-start').click();
	await expect(page.getByTestId('recorder')).toHaveAttribute('data-status', 'recording');
	await page.keyboard.down('Digit1');
	await page.keyboard.down('Digit2');
	await expect(page.getByTestId('pad-pad-14')).toHaveAttribute('aria-pressed', 'true');
	await page.waitForTimeout(300);
	await page.keyboard.up('Digit1');
	await expect(page.getByTestId('live-finding')).toHaveAttribute('data-kind', 'dropout');
	await expectInViewport(page, ['live-findings', 'record-stop']);
	await page.waitForTimeout(300);
	await page.keyboard.up('Digit2');
	await expect(page.getByTestId('record-events')).toHaveText('4');
	await page.getByTestId('record-name').fill('First take');
	await page.getByTestId('record-stop').click();
	await expect(page.getByTestId('record-saved')).toContainText('1 finding');

	// Step 3: the replay shows the dropout at the release of pad 13; its finding jumps there.
	await page.getByTestId('record-replay-link').click();
	await page.locator('[data-testid="replay-page"][data-hydrated="true"]').waitFor({ timeout: 30_000 });
	await expect(page.getByTestId('session-name')).toHaveText('First take');
	const finding = page.getByTestId('findings-original').getByTestId('finding');
	await expect(finding).toHaveCount(1);
	await expect(finding).toHaveAttribute('data-kind', 'dropout');
	await expect(finding).toContainText('release of Pad 13');
	await finding.click();
	await expect(page.getByTestId('cursor-time')).not.toHaveText('0.000 s');
	// One length: the header and the transport agree.
	const length = (await page.getByTestId('session-length').textContent())!.replace(' long', '');
	await expect(page.getByTestId('transport-length')).toHaveText(` / ${length}`);
	await shot('replay-laptop');

	// The home guide now ticks the first two steps and sends step 3 to this take.
	await open(page, '/home');
	await expect(page.getByTestId('start-step').nth(2).getByRole('link')).toHaveText('Replay your take');

	// On a phone, with touch: the pads come first and all fit, keys are not shown, and the
	// findings strip stays in view while playing.
	const phone = await browser.newContext({ viewport: PHONE, hasTouch: true, isMobile: true });
	await phone.addCookies(await context.cookies());
	const mobile = await phone.newPage();
	await open(mobile, '/home');
	await mobile.getByTestId('start-step').nth(0).getByRole('link').click();
	await expect(mobile.getByTestId('room-mapping')).toContainText('Broken stutter row', { timeout: 30_000 });
	await mobile.locator('html[data-ready]').waitFor();
	await expectInViewport(mobile, PADS);
	const [padsTop, recorderTop] = await Promise.all([
		mobile.getByTestId('pad-grid').boundingBox(),
		mobile.getByTestId('recorder').boundingBox()
	]);
	expect(padsTop!.y).toBeLessThan(recorderTop!.y);
	await expect(mobile.getByTestId('pad-pad-13').locator('kbd')).toBeHidden();
	await noSidewaysScroll(mobile);

	const touch = await touchScreen(mobile);
	const one = await touch.finger('pad-pad-13', 1);
	const two = await touch.finger('pad-pad-14', 2);
	await touch.down([one]);
	await touch.down([one, two]);
	await expect(mobile.getByTestId('pad-pad-14')).toHaveAttribute('aria-pressed', 'true');
	await touch.up([one]);
	await expect(mobile.getByTestId('live-finding')).toHaveAttribute('data-kind', 'dropout');
	await expectInViewport(mobile, ['live-findings', 'pad-pad-14']);
	await touch.up([two]);
	await mobile.screenshot({ path: testInfo.outputPath('room-phone.png') });

	await open(mobile, '/sessions');
	await expect(mobile.getByTestId('session-row')).toHaveCount(1);
	await noSidewaysScroll(mobile);
	await mobile.screenshot({ path: testInfo.outputPath('sessions-phone.png') });
	await open(mobile, '/help');
	await noSidewaysScroll(mobile);

	// A week later the password is forgotten: ask for a reset link from the sign-in page, open it
	// from the local outbox, choose a new password and sign in with it.
	const later = await browser.newContext({ viewport: LAPTOP });
	const guest = await later.newPage();
	await open(guest, '/signin');
	await guest.getByRole('link', { name: 'Forgot password?' }).click();
	await expect(guest).toHaveURL(/\/forgot-password$/);
	await guest.getByLabel('Email').fill(email);
	await guest.getByRole('button', { name: 'Send reset link' }).click();
	await expect(guest.getByTestId('reset-sent')).toContainText(email);
	const mail = await waitForMail(email, /new Padproof password/);
	expect(mail.text).toContain('Hello Ada Quill,');
	await guest.goto(resetLink(mail));
	await expect(guest.getByRole('heading', { name: 'Choose a new password' })).toBeVisible();
	await guest.getByLabel('New password', { exact: true }).fill('second-hour-88');
	await guest.getByLabel('Repeat new password').fill('second-hour-88');
	await guest.getByRole('button', { name: 'Set new password' }).click();
	await expect(guest).toHaveURL(/\/signin\?done=reset$/);
	await expect(guest.getByRole('status')).toContainText('Your new password is set');
	// The reset signed out the devices that were signed in.
	await open(mobile, '/home');
	await expect(mobile).toHaveURL(/\/signin/);
	await guest.getByLabel('Email').fill(email);
	await guest.getByLabel('Password').fill('second-hour-88');
	await guest.getByRole('button', { name: 'Sign in' }).click();
	await expect(guest).toHaveURL(/\/home$/);
	await expect(guest.getByTestId('start-guide')).toBeVisible();
	await later.close();

	await phone.close();
	await context.close();
});
