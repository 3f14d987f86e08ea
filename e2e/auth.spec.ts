import { expect, test } from '@playwright/test';
import { DEMO, DEMO_PASSWORD, open, signIn } from './support';

test('a new performer signs up, lands in the app, signs out and signs back in', async ({ page }) => {
	const email = `nia.${Date.now()}@example.com`;
	await open(page, '/signup');
	await page.getByLabel('Name').fill('Nia Brook');
	await page.getByLabel('Email').fill(email);
	await page.getByLabel('Password', { exact: true }).fill('loop-station-9');
	await page.getByLabel('Repeat password').fill('loop-station-9');
	await page.getByRole('button', { name: 'Create account' }).click();

	await expect(page).toHaveURL(/\/home$/);
	await expect(page.getByRole('heading', { name: 'Hello, Nia Brook' })).toBeVisible();
	await expect(page.getByTestId('account-menu')).toContainText('student');

	await page.getByRole('button', { name: 'Sign out' }).click();
	await expect(page).toHaveURL(/\/$/);
	await page.goto('/home');
	await expect(page).toHaveURL(/\/signin\?next=%2Fhome$/);

	await signIn(page, email, 'loop-station-9');
	await expect(page).toHaveURL(/\/home$/);
});

test('sign-up explains a password mismatch and keeps what was typed', async ({ page }) => {
	await open(page, '/signup');
	await page.getByLabel('Name').fill('Rae');
	await page.getByLabel('Email').fill('rae@example.com');
	await page.getByLabel('Password', { exact: true }).fill('first-try-1');
	await page.getByLabel('Repeat password').fill('second-try-2');
	await page.getByRole('button', { name: 'Create account' }).click();
	await expect(page.getByText('The two passwords differ.').first()).toBeVisible();
	await expect(page.getByLabel('Email')).toHaveValue('rae@example.com');
});

test('a wrong password is refused with a plain message', async ({ page }) => {
	await open(page, '/signin');
	await page.getByLabel('Email').fill(DEMO.student);
	await page.getByLabel('Password').fill('not-the-password');
	await page.getByRole('button', { name: 'Sign in' }).click();
	await expect(page.getByRole('alert')).toContainText('do not match');
});

test('a student gets 403 from the admin page and from its role action', async ({ page, baseURL }) => {
	await signIn(page, 'student');
	await expect(page.getByRole('link', { name: 'People' })).toHaveCount(0);

	const response = await page.goto('/admin');
	expect(response?.status()).toBe(403);
	await expect(page.getByTestId('error-page')).toContainText('Only admins');

	const post = await page.request.post('/admin?/setRole', {
		form: { userId: 'anyone', role: 'admin' },
		headers: { origin: baseURL! }
	});
	expect(post.status()).toBe(403);

	const teaching = await page.goto('/drills');
	expect(teaching?.status()).toBe(403);
});

test('the admin promotes a student to teacher, who then sees the teaching area', async ({ browser }) => {
	const admin = await browser.newPage();
	await signIn(admin, 'admin');
	await admin.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'People' }).click();
	await admin.getByRole('searchbox').fill('omar');
	await admin.getByRole('button', { name: 'Search' }).click();
	await expect(admin.getByTestId('user-row')).toHaveCount(1);
	await admin.getByLabel('Role of Omar Haddad', { exact: true }).selectOption('teacher');
	await admin.getByRole('button', { name: 'Save role of Omar Haddad' }).click();
	await expect(admin.getByRole('status')).toContainText('Omar Haddad is now teacher.');

	const omar = await browser.newPage();
	await signIn(omar, DEMO.student3, DEMO_PASSWORD);
	await omar.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Classes' }).click();
	await expect(omar.getByTestId('teaching-area')).toBeVisible();
	await expect(omar.getByRole('button', { name: 'Create class' })).toBeVisible();
});

test('a performer changes the password and signs in with the new one only', async ({ page }) => {
	const email = `ray.${Date.now()}@example.com`;
	await open(page, '/signup');
	await page.getByLabel('Name').fill('Ray Okon');
	await page.getByLabel('Email').fill(email);
	await page.getByLabel('Password', { exact: true }).fill('first-pass-1');
	await page.getByLabel('Repeat password').fill('first-pass-1');
	await page.getByRole('button', { name: 'Create account' }).click();
	await expect(page).toHaveURL(/\/home$/);

	await open(page, '/account');
	await page.getByLabel('Current password').fill('not-it-at-all');
	await page.getByLabel('New password', { exact: true }).fill('second-pass-2');
	await page.getByLabel('Repeat new password').fill('second-pass-2');
	await page.getByRole('button', { name: 'Change password' }).click();
	await expect(page.getByText('Your current password is not right.')).toHaveCount(1);

	await page.getByLabel('Current password').fill('first-pass-1');
	await page.getByLabel('New password', { exact: true }).fill('second-pass-2');
	await page.getByLabel('Repeat new password').fill('second-pass-2');
	await page.getByRole('button', { name: 'Change password' }).click();
	await expect(page.getByRole('status')).toContainText('Your password is changed.');

	await page.getByRole('button', { name: 'Sign out' }).click();
	await open(page, '/signin');
	await page.getByLabel('Email').fill(email);
	await page.getByLabel('Password').fill('first-pass-1');
	await page.getByRole('button', { name: 'Sign in' }).click();
	await expect(page.getByRole('alert')).toContainText('do not match');
	await signIn(page, email, 'second-pass-2');
});
