import { describe, expect, it } from 'vitest';
import type { Finding } from '$lib/engine';
import { compareFindings } from '$lib/replay/compare';

const finding = (kind: Finding['kind']): Finding => ({
	kind,
	start: 0,
	end: null,
	event: 0,
	binding: null,
	input: null,
	deck: null,
	rack: null,
	counter: null,
	message: ''
});

describe('compareFindings', () => {
	it('says the fix worked when every finding is gone', () => {
		const c = compareFindings([finding('dropout')], []);
		expect([c.summary, c.verdict, c.kinds]).toEqual([
			'1 finding → 0 findings',
			'fixed',
			[{ kind: 'dropout', before: 1, after: 0 }]
		]);
	});

	it.each([
		[['dropout', 'count-left-over'], ['count-left-over'], 'better'],
		[['dropout'], ['bleed'], 'same'],
		[[], ['stuck-on'], 'worse'],
		[[], [], 'same']
	] as const)('%j → %j is %s', (before, after, verdict) => {
		expect(compareFindings(before.map(finding), after.map(finding)).verdict).toBe(verdict);
	});
});
