import { DEMO_PASSWORD } from '$lib/server/db/seed';
import { MIN_PASSWORD, passwordProblem } from '$lib/server/passwords';
import { email, password, personName, validate } from '$lib/server/validate';
import { describe, expect, it } from 'vitest';
import { z } from 'zod';

describe('new passwords', () => {
	it.each([
		['short-1', /at least 10 characters/],
		['a'.repeat(129), /at most 128 characters/],
		// Entries of the common-password list in @zxcvbn-ts/language-common, or close to them.
		['password123', /common password/],
		['1234567890', /common password/],
		['qwertyuiop', /common password/],
		['Password1!', /common password/],
		['iloveyou12', /common password/],
		['aaaaaaaaaa', /common password/],
		['padproof2024', /this app’s name/]
	])('refuses %j with a clear reason', (value, reason) => {
		expect(passwordProblem(value)).toMatch(reason);
	});

	it('refuses a password built on the person’s own name', () => {
		expect(passwordProblem('marlowines1', ['Ines Marlow', 'ines@mixlab.example'])).toMatch(/your name/);
	});

	it.each([['loop-station-9'], ['first-pass-1'], ['cobalt tram violin'], ['Zoë-spielt-Pads-7']])(
		'accepts %j',
		(value) => {
			expect(passwordProblem(value)).toBeNull();
		}
	);

	it('accepts the published demo password, so seeded demo accounts can also set it again', () => {
		expect(DEMO_PASSWORD.length).toBeGreaterThanOrEqual(MIN_PASSWORD);
		expect(passwordProblem(DEMO_PASSWORD)).toBeNull();
	});

	it('is the rule of the zod field used by every form and the auth API', () => {
		const result = validate(z.object({ password }), { password: 'password123' });
		expect(result.ok).toBe(false);
		if (!result.ok) expect(result.errors.password).toMatch(/common password/);
	});
});

describe('bounded fields', () => {
	it('bounds names to 80 characters and emails to 254', () => {
		expect(personName.safeParse('N'.repeat(80)).success).toBe(true);
		expect(personName.safeParse('N'.repeat(81)).success).toBe(false);
		expect(personName.safeParse('   ').success).toBe(false);
		expect(email.safeParse(`${'a'.repeat(64)}@example.com`).success).toBe(true);
		expect(email.safeParse(`${'a'.repeat(250)}@example.com`).success).toBe(false);
		expect(email.parse('  Kai@Mixlab.Example ')).toBe('kai@mixlab.example');
	});
});
