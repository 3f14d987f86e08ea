import { demoMapping, parseMapping } from '$lib/engine';
import { GENERIC_8X8, withLearnedProfile } from '$lib/midi/profiles';
import { describe, expect, it } from 'vitest';

const learned = {
	name: 'Bench pads',
	rows: 4,
	cols: 4,
	// A device whose pads send notes 60–75 on channel 10, counted from the top-left.
	inputs: Array.from({ length: 16 }, (_, i) => ({
		id: `learned-${i}`,
		kind: 'pad' as const,
		channel: 10,
		note: 60 + i,
		row: Math.floor(i / 4),
		col: i % 4
	}))
};

describe('withLearnedProfile', () => {
	it('moves every pad to the note the device sends at the same grid cell and keeps the bindings', () => {
		const before = demoMapping('two-deck');
		const { mapping, matched } = withLearnedProfile(before, learned);
		expect(matched).toBe(16);
		expect(mapping.bindings).toEqual(before.bindings);
		// pad-13 sits top-left (row 0, col 0) in the demo grid; the device sends note 60 there.
		expect(mapping.profile.inputs.find((i) => i.id === 'pad-13')).toMatchObject({
			channel: 10,
			note: 60,
			row: 0,
			col: 0
		});
		// pad-1 sits bottom-left (row 3, col 0): the device's note 72.
		expect(mapping.profile.inputs.find((i) => i.id === 'pad-1')).toMatchObject({ channel: 10, note: 72 });
		expect(parseMapping(mapping).ok).toBe(true);
	});

	it('leaves pads the device has no cell for where they were', () => {
		const small = { ...learned, rows: 2, cols: 2, inputs: learned.inputs.filter((i) => i.row < 2 && i.col < 2) };
		const before = demoMapping('two-deck');
		const { mapping, matched } = withLearnedProfile(before, small);
		expect(matched).toBe(4);
		expect(mapping.profile.inputs.find((i) => i.id === 'pad-1')).toEqual(
			before.profile.inputs.find((i) => i.id === 'pad-1')
		);
	});

	it('plays a 4×4 mapping from the top-left block of a larger grid', () => {
		const { matched } = withLearnedProfile(demoMapping('four-deck'), GENERIC_8X8);
		expect(matched).toBe(16);
	});
});
