import { expect as baseExpect, test, type Page } from '@playwright/test';
import { resetLink, waitForMail } from './outbox';
import { DEMO_PASSWORD, open, signIn, signUp } from './support';

// Signing up hashes a password and loads the password dictionaries: slow on a busy machine.
const expect = baseExpect.configure({ timeout: 30_000 });
test.describe.configure({ timeout: 180_000 });

const shot = (page: Page, name: string) =>
	page.screenshot({ path: `e2e/.screens/accounts-${name}.png`, fullPage: true });
const unique = (name: string) => `${name}.${Date.now()}.${Math.random().toString(36).slice(2, 6)}@example.com`;

test('forgot password: the mailed link sets a new password and signs out other devices', async ({ browser }) => {
	const email = unique('zoe');
	const first = await browser.newPage();
	await signUp(first, 'Zoë Brandt', email, 'velvet-harbour-71');
	const otherDevice = await browser.newPage();
	await signIn(otherDevice, email, 'velvet-harbour-71');

	const page = await browser.newPage();
	await open(page, '/signin');
	await page.getByRole('link', { name: 'Forgot password?' }).click();
	await expect(page).toHaveURL(/\/forgot-password$/);
	await expect(page.getByRole('heading', { name: 'Forgot password' })).toBeVisible();
	await page.getByLabel('Email').fill(email);
	await page.getByRole('button', { name: 'Send reset link' }).click();
	await expect(page.getByTestId('reset-sent')).toContainText(email);
	await shot(page, 'forgot-sent');

	const mail = await waitForMail(email, /new Padproof password/);
	expect(mail.text).toContain('Hello Zoë Brandt,'); // decoded from the mail's transfer encoding
	expect(mail.html).toContain('Hello Zoë Brandt,');
	const link = resetLink(mail);
	expect(mail.html).toContain(link.replace(/&/g, '&amp;'));

	await page.goto(link);
	await expect(page.getByRole('heading', { name: 'Choose a new password' })).toBeVisible();
	await page.getByLabel('New password', { exact: true }).fill('password1234');
	await page.getByLabel('Repeat new password').fill('password1234');
	await page.getByRole('button', { name: 'Set new password' }).click();
	await expect(page.getByText('too easy to guess')).toHaveCount(1);
	await shot(page, 'reset-refused');
	await page.getByLabel('New password', { exact: true }).fill('copper-lantern-58');
	await page.getByLabel('Repeat new password').fill('copper-lantern-58');
	await page.getByRole('button', { name: 'Set new password' }).click();
	await expect(page).toHaveURL(/\/signin\?done=reset$/);
	await expect(page.getByRole('status')).toContainText('Your new password is set');

	// Both earlier sessions are gone.
	await otherDevice.goto('/home');
	await expect(otherDevice).toHaveURL(/\/signin/);
	await first.goto('/home');
	await expect(first).toHaveURL(/\/signin/);

	// The link works once; the old password no longer does, the new one does.
	await page.goto(link);
	await expect(page.getByRole('alert')).toContainText('expired or was used already');
	await open(page, '/signin');
	await page.getByLabel('Email').fill(email);
	await page.getByLabel('Password').fill('velvet-harbour-71');
	await page.getByRole('button', { name: 'Sign in' }).click();
	await expect(page.getByRole('alert')).toContainText('do not match');
	await signIn(page, email, 'copper-lantern-58');
});

test('an admin disables an account, which then cannot sign in, and enables it again', async ({ browser }) => {
	const email = unique('jun');
	const user = await browser.newPage();
	await signUp(user, 'Jun Arda', email, 'maple-signal-204');

	const admin = await browser.newPage();
	await signIn(admin, 'admin');
	await open(admin, `/admin?q=${encodeURIComponent(email)}`);
	const row = admin.getByTestId('user-row');
	await expect(row).toHaveCount(1);
	await admin.getByRole('button', { name: 'Disable Jun Arda' }).click();
	await expect(admin.getByRole('status')).toContainText('Jun Arda is disabled and signed out everywhere.');
	await expect(row.getByTestId('account-status')).toHaveText('Disabled');
	await shot(admin, 'admin-disabled');

	// The open session ended, and signing in is refused with a reason.
	await user.goto('/home');
	await expect(user).toHaveURL(/\/signin/);
	await open(user, '/signin');
	await user.getByLabel('Email').fill(email);
	await user.getByLabel('Password').fill('maple-signal-204');
	await user.getByRole('button', { name: 'Sign in' }).click();
	await expect(user.getByRole('alert')).toContainText('This account is disabled');

	await admin.getByRole('button', { name: 'Enable Jun Arda' }).click();
	await expect(admin.getByRole('status')).toContainText('Jun Arda can sign in again.');
	await expect(row.getByTestId('account-status')).toHaveText('Active');
	await signIn(user, email, 'maple-signal-204');
});

test('an admin sends a reset link; a refused role change shows the real role again', async ({ page }) => {
	const email = unique('ade');
	await signUp(page, 'Ade Moss', email, 'quartz-ferry-316');
	await page.getByRole('button', { name: 'Sign out' }).click();

	await signIn(page, 'admin');
	await open(page, `/admin?q=${encodeURIComponent(email)}`);
	await page.getByRole('button', { name: 'Send a reset link to Ade Moss' }).click();
	await expect(page.getByRole('status')).toContainText(`A reset link is on its way to ${email}.`);
	const mail = await waitForMail(email, /new Padproof password/);
	expect(resetLink(mail)).toMatch(/\/reset-password\?token=/);

	// The only admin cannot make herself a student: the refusal shows and the control says Admin.
	await open(page, '/admin?q=ines');
	const select = page.getByLabel('Role of Ines Marlow', { exact: true });
	await select.selectOption('student');
	await page.getByRole('button', { name: 'Save role of Ines Marlow' }).click();
	await expect(page.getByRole('alert')).toContainText('at least one admin');
	await expect(select).toHaveValue('admin');
	await shot(page, 'admin-refused-role');
});

test('a performer deletes their own account after confirming with the password', async ({ page }) => {
	const email = unique('ola');
	await signUp(page, 'Ola Stein', email, 'ember-quill-482');
	await open(page, '/account');
	await page.getByLabel('Your password').fill('not-my-password');
	await page.getByLabel('I understand').check();
	await page.getByRole('button', { name: 'Delete my account' }).click();
	await expect(page.getByText('That is not your password.')).toHaveCount(1);
	await shot(page, 'account-delete-refused');

	await page.getByLabel('Your password').fill('ember-quill-482');
	await page.getByLabel('I understand').check();
	await page.getByRole('button', { name: 'Delete my account' }).click();
	await expect(page).toHaveURL(/\/signin\?done=deleted$/);
	await expect(page.getByRole('status')).toContainText('Your account and everything in it are deleted.');

	await page.getByLabel('Email').fill(email);
	await page.getByLabel('Password').fill('ember-quill-482');
	await page.getByRole('button', { name: 'Sign in' }).click();
	await expect(page.getByRole('alert')).toContainText('do not match');
});

test('sign-up shows each problem once and offers a link to sign in instead', async ({ page }) => {
	await open(page, '/signup');
	await page.getByLabel('Name').fill('Kai Again');
	await page.getByLabel('Email').fill('kai@mixlab.example');
	await page.getByLabel('Password', { exact: true }).fill('qwertyuiop');
	await page.getByLabel('Repeat password').fill('qwertyuiop');
	await page.getByRole('button', { name: 'Create account' }).click();
	await expect(page.getByText('too easy to guess')).toHaveCount(1);
	await expect(page.getByRole('alert')).toHaveCount(0);

	await page.getByLabel('Password', { exact: true }).fill('harbor-violet-93');
	await page.getByLabel('Repeat password').fill('harbor-violet-93');
	await page.getByRole('button', { name: 'Create account' }).click();
	await expect(page.getByText('An account with this email exists already.')).toHaveCount(1);
	const instead = page.getByRole('link', { name: 'Sign in instead' });
	await expect(instead).toBeVisible();
	await shot(page, 'signup-taken');
	await instead.click();
	await expect(page).toHaveURL(/\/signin$/);
	await shot(page, 'signin');
});

test('next= only ever leads inside the app', async ({ page }) => {
	for (const next of ['/%09/evil.example', '//evil.example', '/%5Cevil.example', '/home%0d%0aSet-Cookie:%20x=1']) {
		await open(page, `/signin?next=${next}`);
		await page.getByLabel('Email').fill('kai@mixlab.example');
		await page.getByLabel('Password').fill(DEMO_PASSWORD);
		await page.getByRole('button', { name: 'Sign in' }).click();
		await expect(page).toHaveURL(/^http:\/\/localhost:\d+\/home$/);
		await page.getByRole('button', { name: 'Sign out' }).click();
		await expect(page).toHaveURL(/\/$/);
	}
	// Without JavaScript the action answers a plain 303 to the safe place, never a 500.
	const response = await page.request.post('/signin?next=/%09/evil.example', {
		form: { email: 'kai@mixlab.example', password: DEMO_PASSWORD },
		headers: { origin: new URL(page.url()).origin, accept: 'text/html' },
		maxRedirects: 0
	});
	expect(response.status()).toBe(303);
	expect(response.headers()['location']).toBe('/home');
});

test('the auth API refuses bad bodies in the app’s error shape', async ({ request, baseURL }) => {
	const headers = { origin: baseURL!, 'content-type': 'application/json' };
	const malformed = await request.post('/api/auth/sign-up/email', { headers, data: Buffer.from('{"name": "x", ') });
	expect(malformed.status()).toBe(400);
	expect(await malformed.json()).toEqual({ error: 'The request body is not valid JSON.', problems: [] });

	const huge = await request.post('/api/auth/sign-up/email', {
		headers,
		data: Buffer.from(
			JSON.stringify({ name: 'x'.repeat(100_000), email: 'big@example.com', password: 'harbor-violet-93' })
		)
	});
	expect(huge.status()).toBe(413);
	expect((await huge.json()).error).toMatch(/too large/);

	const list = await request.post('/api/auth/sign-in/email', { headers, data: Buffer.from('[1, 2]') });
	expect(list.status()).toBe(400);
	expect((await list.json()).error).toBe('The request body must be a JSON object.');

	const weak = await request.post('/api/auth/sign-up/email', {
		headers,
		data: { name: 'N'.repeat(81), email: 'weak@example.com', password: 'password123' }
	});
	expect(weak.status()).toBe(400);
	const body = await weak.json();
	expect(body.problems.map((p: { path: string }) => p.path).sort()).toEqual(['name', 'password']);

	const admin = await request.post('/api/auth/admin/set-role', { headers, data: { userId: 'x', role: 'admin' } });
	expect(admin.status()).toBe(403);
	expect((await admin.json()).error).toMatch(/admin page/);
});
