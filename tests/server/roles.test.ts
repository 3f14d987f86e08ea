import { canEnter, isRole, requireArea } from '$lib/server/roles';
import { isHttpError } from '@sveltejs/kit';
import { describe, expect, it } from 'vitest';

function statusOf(fn: () => unknown): number | undefined {
	try {
		fn();
		return undefined;
	} catch (e) {
		return isHttpError(e) ? e.status : -1;
	}
}

describe('canEnter', () => {
	it.each([
		['admin', 'admin', true],
		['admin', 'teaching', true],
		['admin', 'app', true],
		['teacher', 'admin', false],
		['teacher', 'teaching', true],
		['teacher', 'app', true],
		['student', 'admin', false],
		['student', 'teaching', false],
		['student', 'app', true],
		[undefined, 'app', false]
	] as const)('%s entering %s → %s', (role, area, allowed) => {
		expect(canEnter(role, area)).toBe(allowed);
	});
});

describe('requireArea', () => {
	it('refuses a visitor without an account with 401', () => {
		expect(statusOf(() => requireArea({ user: null }, 'app'))).toBe(401);
	});

	it('refuses a student in the admin area with 403', () => {
		expect(statusOf(() => requireArea({ user: { id: 'u1', role: 'student' } }, 'admin'))).toBe(403);
	});

	it('refuses an account whose role is unknown with 403', () => {
		expect(statusOf(() => requireArea({ user: { id: 'u1', role: 'superuser' } }, 'teaching'))).toBe(403);
	});

	it('lets a teacher into the teaching area and returns the user with its role', () => {
		const user = requireArea({ user: { id: 'u2', role: 'teacher', name: 'T' } }, 'teaching');
		expect(user).toEqual({ id: 'u2', role: 'teacher', name: 'T' });
	});
});

describe('isRole', () => {
	it('knows exactly the three roles', () => {
		expect(['admin', 'teacher', 'student', 'owner', '', null].map(isRole)).toEqual([
			true,
			true,
			true,
			false,
			false,
			false
		]);
	});
});
