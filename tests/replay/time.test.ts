import { describe, expect, it } from 'vitest';
import { momentLink, parseMoment, seconds } from '$lib/replay/time';

describe('moments', () => {
	it.each([
		['12.438', 12438],
		['1.2', 1200],
		['0', 0],
		['3', 3000]
	])('reads ?t=%s as %d ms', (value, ms) => {
		expect(parseMoment(value)).toBe(ms);
	});

	it.each([null, '', '-1', 'abc', '1e3', '1.2.3'])('refuses %j', (value) => {
		expect(parseMoment(value)).toBeNull();
	});

	it('writes the cursor into the link and keeps the other parameters', () => {
		expect(momentLink('http://localhost:4173/sessions/s1?against=m2&version=3&t=9#x', 1500.25)).toBe(
			'http://localhost:4173/sessions/s1?against=m2&version=3&t=1.500'
		);
	});

	it('shows times in seconds with three decimals', () => {
		expect(seconds(12438)).toBe('12.438 s');
	});
});
