// Demo mappings for the seeded school, built with our builders. The grid: a 4×4 pad profile on
// notes 36–51, MIDI channel 1. pad-1 is note 36 at the bottom left; notes rise left to right,
// then upward row by row, so the top row (row 0) is notes 48–51 (pad-13..pad-16). Each pad's
// light answers on its own note (velocity 127 lit, 0 dark).
//   two-deck:  bottom row one-press echo/reverb/filter/gate for deck A, next row the same for
//              deck B, third row bitcrush/flanger for A and B (all on rack 1, each pad routing it
//              to its deck and away from the other); top row a hold-group stutter row on deck A
//              (rack 2, 1/4 1/8 1/16 1/32) with the `held` counter.
//   four-deck: rows of echo, reverb and filter pads for decks A–D on rack 1 (each routing away
//              from the three other decks), the same stutter row on top.
//   broken-row: the two-deck set whose stutter row is plain momentary on/off with no counter, so
//              lifting one finger of a chord cuts the effect (for teaching).
import { legatoRow, onePressEffect } from './builders';
import { paramForDivision } from './effects';
import { DECK_IDS, type Binding, type ControllerProfile, type DeckId, type EffectId, type Mapping } from './types';

export const PAD_NOTE_BASE = 36;

export const padId = (n: number) => `pad-${n}`;

export function padGridProfile(name = 'Sixteen-pad grid'): ControllerProfile {
	const inputs = Array.from({ length: 16 }, (_, i) => ({
		id: padId(i + 1),
		kind: 'pad' as const,
		label: `Pad ${i + 1}`,
		channel: 1,
		note: PAD_NOTE_BASE + i,
		row: 3 - Math.floor(i / 4),
		col: i % 4,
		led: { note: PAD_NOTE_BASE + i, on: 127, off: 0 }
	}));
	return { name, rows: 4, cols: 4, inputs };
}

/** How each demo effect sounds when a pad plays it: parameters 1–3 and dry/wet. */
const SOUND: Record<string, { params: number[]; mix: number; label: string }> = {
	echo: { params: [paramForDivision('echo', 1, '1/8'), 0.45, 0.6], mix: 0.5, label: 'Echo' },
	reverb: { params: [0.7, 0.6, 0.4], mix: 0.45, label: 'Reverb' },
	filter: { params: [0.3, 0.5, 0.1], mix: 1, label: 'Filter' },
	gate: { params: [paramForDivision('gate', 1, '1/16'), 1, 0.3], mix: 1, label: 'Gate' },
	bitcrush: { params: [0.4, 0.5, 0.7], mix: 0.7, label: 'Crush' },
	flanger: { params: [paramForDivision('flanger', 1, '1/4'), 0.6, 0.5], mix: 0.6, label: 'Flanger' }
};

function effectPad(pad: number, effect: EffectId, deck: DeckId, decks: 2 | 4): Binding {
	const s = SOUND[effect];
	return onePressEffect({
		input: padId(pad),
		label: `${s.label} ${deck}`,
		rack: 1,
		effect,
		params: s.params,
		mix: s.mix,
		deck,
		decks
	});
}

const DEMO_RACKS = [
	{ id: 'pads', label: 'One-press pads' },
	{ id: 'stutter', label: 'Stutter row' }
];

const STUTTER = ['1/4', '1/8', '1/16', '1/32'];
const STUTTER_PADS = [13, 14, 15, 16].map(padId);
const stutterLabels = STUTTER.map((d) => `Stutter ${d}`);

function stutterRow(decks: 2 | 4) {
	return legatoRow({
		pads: STUTTER_PADS,
		rack: 2,
		effect: 'stutter',
		variants: STUTTER,
		counter: 'held',
		group: 'stutter-row',
		deck: 'A',
		decks,
		labels: stutterLabels
	});
}

function twoDeck(): Mapping {
	const row = stutterRow(2);
	const bindings: Binding[] = [];
	(['echo', 'reverb', 'filter', 'gate'] as const).forEach((fx, i) => {
		bindings.push(effectPad(1 + i, fx, 'A', 2), effectPad(5 + i, fx, 'B', 2));
	});
	bindings.push(
		effectPad(9, 'bitcrush', 'A', 2),
		effectPad(10, 'flanger', 'A', 2),
		effectPad(11, 'bitcrush', 'B', 2),
		effectPad(12, 'flanger', 'B', 2),
		...row.bindings
	);
	return {
		version: 2,
		name: 'Two-deck pad set',
		decks: 2,
		tempo: 124,
		profile: padGridProfile(),
		racks: DEMO_RACKS,
		counters: [row.counter],
		bindings
	};
}

function fourDeck(): Mapping {
	const row = stutterRow(4);
	const bindings: Binding[] = [];
	(['echo', 'reverb', 'filter'] as const).forEach((fx, r) =>
		DECK_IDS.forEach((deck, c) => bindings.push(effectPad(1 + r * 4 + c, fx, deck, 4)))
	);
	bindings.push(...row.bindings);
	return {
		version: 2,
		name: 'Four-deck pad set',
		decks: 4,
		tempo: 124,
		profile: padGridProfile(),
		racks: DEMO_RACKS,
		counters: [row.counter],
		bindings
	};
}

function brokenRow(): Mapping {
	const base = twoDeck();
	const row = STUTTER_PADS.map((input, i) =>
		onePressEffect({
			input,
			label: stutterLabels[i],
			rack: 2,
			effect: 'stutter',
			params: [paramForDivision('stutter', 1, STUTTER[i])],
			mix: 1,
			deck: 'A',
			decks: 2,
			group: 'stutter-row'
		})
	);
	return {
		...base,
		name: 'Broken stutter row',
		counters: [],
		bindings: [...base.bindings.filter((b) => !STUTTER_PADS.includes(b.input)), ...row]
	};
}

export interface DemoMapping {
	slug: 'two-deck' | 'four-deck' | 'broken-row';
	title: string;
	summary: string;
	mapping: Mapping;
}

export const DEMO_MAPPINGS: readonly DemoMapping[] = [
	{
		slug: 'two-deck',
		title: 'Two-deck pad set',
		summary:
			'One-press echo, reverb, filter, gate, crush and flanger pads for decks A and B, and a hold-group stutter row.',
		mapping: twoDeck()
	},
	{
		slug: 'four-deck',
		title: 'Four-deck pad set',
		summary: 'One-press echo, reverb and filter pads for each of four decks, and a hold-group stutter row.',
		mapping: fourDeck()
	},
	{
		slug: 'broken-row',
		title: 'Broken stutter row',
		summary: 'The two-deck set with a stutter row that has no held-pad counter: lift one finger and it cuts out.',
		mapping: brokenRow()
	}
];

export function demoMapping(slug: DemoMapping['slug']): Mapping {
	const found = DEMO_MAPPINGS.find((d) => d.slug === slug);
	if (!found) throw new Error(`no demo mapping "${slug}"`);
	return found.mapping;
}
