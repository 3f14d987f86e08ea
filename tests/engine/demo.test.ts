import { describe, expect, it } from 'vitest';
import { DEMO_MAPPINGS, demoMapping } from '$lib/engine/demo';
import { parseMapping } from '$lib/engine/mapping';
import { lintMapping } from '$lib/engine/lint';
import { groupInputs, verifyGroupSync } from '$lib/engine/verify';

describe('demo mappings', () => {
	it('have stable slugs', () => {
		expect(DEMO_MAPPINGS.map((d) => d.slug)).toEqual(['two-deck', 'four-deck', 'broken-row']);
	});

	it.each(DEMO_MAPPINGS.map((d) => [d.slug, d.mapping] as const))(
		'%s survives JSON and the schema unchanged',
		(_, m) => {
			const r = parseMapping(JSON.parse(JSON.stringify(m)));
			expect(r.ok && r.mapping).toEqual(m);
		}
	);

	it('lay out 16 pads on notes 36–51, channel 1, bottom-left first, top row 48–51', () => {
		const inputs = demoMapping('two-deck').profile.inputs;
		expect(inputs.map((i) => i.note)).toEqual(Array.from({ length: 16 }, (_, i) => 36 + i));
		expect(inputs.every((i) => i.channel === 1)).toBe(true);
		expect(inputs.find((i) => i.note === 36)).toMatchObject({ id: 'pad-1', row: 3, col: 0 });
		expect(inputs.filter((i) => i.row === 0).map((i) => i.note)).toEqual([48, 49, 50, 51]);
	});

	it('give the four-deck set four decks and routing away from B, C and D', () => {
		const m = demoMapping('four-deck');
		expect(m.decks).toBe(4);
		const routes = m.bindings[0].steps.filter((s) => s.target.kind === 'rack-route');
		expect(routes.map((s) => [s.target.kind === 'rack-route' && s.target.deck, s.value])).toEqual([
			['A', 1],
			['B', 0],
			['C', 0],
			['D', 0]
		]);
	});

	it('lint clean, except the broken row that is broken on purpose', () => {
		expect(lintMapping(demoMapping('two-deck'))).toEqual([]);
		expect(lintMapping(demoMapping('four-deck'))).toEqual([]);
		expect(lintMapping(demoMapping('broken-row')).map((f) => f.rule)).toEqual(['legato-without-counter']);
	});

	it('have a stutter row the verifier proves, and a broken one it refutes', () => {
		const good = demoMapping('two-deck');
		expect(verifyGroupSync(good, groupInputs(good, 'stutter-row')).ok).toBe(true);
		const bad = demoMapping('broken-row');
		expect(verifyGroupSync(bad, groupInputs(bad, 'stutter-row')).status).toBe('broken');
		expect(bad.counters).toEqual([]);
	});
});
