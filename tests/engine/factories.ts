// Test fixtures: small mappings and event lists built the way a person would build them.
import { legatoRow, onePressEffect } from '$lib/engine/builders';
import type { Binding, ControllerInput, Counter, InputEvent, Mapping, RackDecl } from '$lib/engine/types';

export function pads(n: number, channel = 1): ControllerInput[] {
	return Array.from({ length: n }, (_, i) => ({
		id: `p${i + 1}`,
		kind: 'pad' as const,
		label: `pad ${i + 1}`,
		channel,
		note: 36 + i,
		row: Math.floor(i / 4),
		col: i % 4
	}));
}

/** `n` declared racks, `r1`… labelled "Rack 1"…. */
export function racks(n = 4): RackDecl[] {
	return Array.from({ length: n }, (_, i) => ({ id: `r${i + 1}`, label: `Rack ${i + 1}` }));
}

export function mappingWith(
	bindings: Binding[],
	options: Partial<Mapping> & { inputs?: ControllerInput[] } = {}
): Mapping {
	const { inputs, ...rest } = options;
	return {
		version: 2,
		name: 'Test set',
		decks: 2,
		profile: { name: 'Test grid', inputs: inputs ?? pads(16) },
		racks: racks(),
		counters: [],
		bindings,
		...rest
	};
}

/** A legato stutter row of n pads, built with the builder. */
export function legatoMapping(n: number, decks: 2 | 4 = 2): Mapping {
	const ids = Array.from({ length: n }, (_, i) => `p${i + 1}`);
	const row = legatoRow({
		pads: ids,
		rack: 1,
		effect: 'stutter',
		variants: ids.map((_, i) => (i + 0.5) / n),
		counter: 'held',
		deck: 'A',
		decks
	});
	return mappingWith(row.bindings, { decks, counters: [row.counter], inputs: pads(Math.max(n, 1)) });
}

/** The same row with plain momentary on/off and no counter: the classic broken row. */
export function brokenRowMapping(n: number): Mapping {
	const bindings = Array.from({ length: n }, (_, i) =>
		onePressEffect({
			input: `p${i + 1}`,
			rack: 1,
			effect: 'stutter',
			params: [(i + 0.5) / n],
			mix: 1,
			deck: 'A',
			decks: 2,
			group: 'row'
		})
	);
	return mappingWith(bindings);
}

export const press = (t: number, input: string): InputEvent => ({ t, input, type: 'press' });
export const release = (t: number, input: string): InputEvent => ({ t, input, type: 'release' });
export const turn = (t: number, input: string, value: number): InputEvent => ({ t, input, type: 'turn', value });

export const counter = (id: string, max = 15, rest = 0): Counter => ({ id, max, rest });
