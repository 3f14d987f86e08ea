import { describe, expect, it } from 'vitest';
import { FINDING_INFO, findingKind, numberedFinding, storedFinding } from '$lib/engine/findings';
import { FINDING_KINDS, type Finding } from '$lib/engine/types';

describe('finding labels (DESIGN.md §2)', () => {
	it('give every kind a plain label and a one-line sentence', () => {
		for (const kind of FINDING_KINDS) {
			expect(FINDING_INFO[kind].label).toMatch(/^[A-Z][a-z ]+$/);
			expect(FINDING_INFO[kind].explain).toMatch(/^[A-Z].+\.$/);
			expect(FINDING_INFO[kind].explain).not.toMatch(/\n/);
		}
		expect(FINDING_KINDS.map((k) => FINDING_INFO[k].label)).toEqual([
			'Dropout',
			'Stuck on',
			'Bleed',
			'Clash',
			'Count left over',
			'Count overflow',
			'Takeover'
		]);
	});

	it.each([
		['stuck', 'stuck-on'],
		['leak', 'bleed'],
		['drift', 'count-left-over'],
		['clamp', 'count-overflow'],
		['dropout', 'dropout'],
		['takeover', 'takeover']
	])('reads the stored kind %s as %s', (old, now) => {
		expect(findingKind(old)).toBe(now);
		expect(storedFinding({ kind: old, start: 1 })).toEqual({ kind: now, start: 1 });
	});

	it('refuses a stored kind that never was one', () => {
		expect(findingKind('toString')).toBeNull();
		expect(storedFinding({ kind: 'wobble' })).toBeNull();
	});

	it('numbers a finding from 1 for people and scripts', () => {
		const f: Finding = {
			kind: 'bleed',
			start: 0,
			end: null,
			event: 0,
			binding: 2,
			input: 'p3',
			deck: 'B',
			rack: 1,
			counter: null,
			message: 'x'
		};
		expect(numberedFinding(f)).toMatchObject({ event: 1, binding: 3, label: 'Bleed', rack: 1 });
	});
});
