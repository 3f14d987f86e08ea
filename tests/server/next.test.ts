import { safeNext } from '$lib/server/next';
import { describe, expect, it } from 'vitest';

// `value` is what `url.searchParams.get('next')` hands over: already percent-decoded once.
describe('safeNext keeps a sign-in inside the app', () => {
	it.each([
		['/home', '/home'],
		['/sessions?filter=kai', '/sessions?filter=kai'],
		['/mappings#public', '/mappings#public'],
		['/rehearse/abc-123', '/rehearse/abc-123'],
		['/sessions/a%20b', '/sessions/a%20b'],
		['/sessions/a b', '/sessions/a%20b']
	])('accepts %j → %j', (value, expected) => {
		expect(safeNext(value)).toBe(expected);
	});

	it.each([
		[null],
		[undefined],
		[''],
		['home'],
		['//evil.example'],
		['//evil.example/home'],
		['/\\evil.example'],
		['\\\\evil.example'],
		['/\t/evil.example'], // what `?next=/%09/evil.example` decodes to; browsers drop the tab → //evil.example
		['/\n/evil.example'],
		['/\r\n/evil.example'],
		['/home\r\nSet-Cookie: x=1'],
		['/home\u0000'],
		['/home\u007f'],
		['/ /evil.example'.replace(' ', '\u000b')],
		['https://evil.example/home'],
		['http:/evil.example'],
		['javascript:alert(1)'],
		['/%2F/evil.example'.replace('%2F', '/')],
		['/.//evil.example']
	])('refuses %j and goes home', (value) => {
		expect(safeNext(value)).toBe('/home');
	});

	it('never returns something the browser would resolve to another origin', () => {
		const candidates = ['/%09/evil.example', '/%5Cevil.example', '/a/../..//evil.example', '/..//evil.example'];
		for (const value of candidates) {
			const target = new URL(safeNext(value), 'https://school.example');
			expect(target.origin).toBe('https://school.example');
		}
	});

	it('uses the given fallback', () => {
		expect(safeNext('//evil', '/account')).toBe('/account');
	});
});
