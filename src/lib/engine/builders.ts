// Builders write the whole step list a person would otherwise enter by hand. They produce plain
// bindings (the mapping document's own shape), so an editor can show and tweak every step after.
// A pad built here loads its rack's whole chain on every press: it never relies on what an
// earlier pad left in the rack (DESIGN.md §4.3).
import { paramForDivision } from './effects';
import {
	DECK_IDS,
	type Binding,
	type Counter,
	type DeckId,
	type EffectId,
	type Intent,
	type Quantize,
	type Step
} from './types';

export interface OnePressOptions {
	input: string;
	label?: string;
	rack: number;
	/** The chain to load, 1–4 effects; `effect` alone is a chain of one. */
	chain?: EffectId[];
	effect?: EffectId;
	/** Parameters 1–3 (0..1) per chain position; undefined leaves the catalog default. */
	params?: (number | undefined)[] | (number | undefined)[][];
	mix: number;
	deck: DeckId;
	decks: 2 | 4;
	intent?: Intent; // default while-held (momentary); latched toggles on press
	group?: string;
	quantize?: Quantize;
}

const set = (target: Step['target'], value: Step['value'], extra: Partial<Step> = {}): Step => ({
	target,
	action: 'set',
	value,
	...extra
});

/** Route the rack to `deck` and away from every other deck of the mapping. */
function routeSteps(rack: number, deck: DeckId, decks: 2 | 4): Step[] {
	return DECK_IDS.slice(0, decks).map((d) => set({ kind: 'rack-route', rack, deck: d }, d === deck ? 1 : 0));
}

export function chainOf(o: Pick<OnePressOptions, 'chain' | 'effect'>): EffectId[] {
	const chain = o.chain ?? (o.effect ? [o.effect] : []);
	if (chain.length < 1 || chain.length > 4) throw new Error('a chain holds 1 to 4 effects');
	return chain;
}

function paramsByPosition(params: OnePressOptions['params']): (number | undefined)[][] {
	if (!params?.length) return [];
	return Array.isArray(params[0]) ? (params as (number | undefined)[][]) : [params as (number | undefined)[]];
}

/** Everything but switching the rack on: chain, parameters, mix, routing. */
function setupSteps(o: Omit<OnePressOptions, 'input'>): Step[] {
	const { rack } = o;
	const steps: Step[] = [set({ kind: 'chain', rack }, chainOf(o))];
	paramsByPosition(o.params).forEach((list, p) =>
		list.forEach((v, k) => {
			if (v !== undefined) steps.push(set({ kind: 'effect-param', rack, position: p + 1, param: k + 1 }, v));
		})
	);
	steps.push(set({ kind: 'rack-mix', rack }, o.mix));
	steps.push(...routeSteps(rack, o.deck, o.decks));
	return steps;
}

/** One pad sets up a whole rack and plays it while held (or latches it on and off). */
export function onePressEffect(o: OnePressOptions): Binding {
	const intent = o.intent ?? 'while-held';
	return {
		input: o.input,
		...(o.label !== undefined && { label: o.label }),
		intent,
		deck: o.deck,
		...(o.group !== undefined && { group: o.group }),
		...(o.quantize !== undefined && { quantize: o.quantize }),
		steps: [
			...setupSteps(o),
			{ target: { kind: 'rack-on', rack: o.rack }, action: intent === 'latched' ? 'toggle' : 'momentary' }
		]
	};
}

/** A pad's setting in a hold group: a division like '1/16' for parameter 1, a value, or several. */
export type LegatoVariant = string | number | { label?: string; params: (number | undefined)[] };

export interface LegatoRowOptions {
	pads: string[];
	rack: number;
	effect: EffectId;
	variants: LegatoVariant[]; // one per pad
	counter: string;
	deck: DeckId;
	decks: 2 | 4;
	mix?: number; // default 1
	group?: string; // default: the counter's id
	labels?: string[];
	quantize?: Quantize;
}

function variantParams(effect: EffectId, v: LegatoVariant): (number | undefined)[] {
	if (typeof v === 'string') return [paramForDivision(effect, 1, v)];
	if (typeof v === 'number') return [v];
	return v.params;
}

/**
 * A hold group: pads played like a keyboard on one effect. Each pad counts up on press and down on
 * release, and the rack switches on only when the count was 0 before the press and off only when
 * it was 1 before the release, so the effect lasts until the last finger lifts.
 */
export function legatoRow(o: LegatoRowOptions): { bindings: Binding[]; counter: Counter } {
	if (o.variants.length !== o.pads.length) throw new Error('a hold-group row needs one variant per pad');
	const group = o.group ?? o.counter;
	const counterTarget = { kind: 'counter', counter: o.counter } as const;
	const rackOn = { kind: 'rack-on', rack: o.rack } as const;
	const bindings = o.pads.map((input, i): Binding => {
		const v = o.variants[i];
		const label = o.labels?.[i] ?? (typeof v === 'object' ? v.label : undefined);
		const setup = setupSteps({ ...o, params: variantParams(o.effect, v), mix: o.mix ?? 1 });
		return {
			input,
			...(label !== undefined && { label }),
			intent: 'while-held',
			deck: o.deck,
			group,
			...(o.quantize !== undefined && { quantize: o.quantize }),
			steps: [
				{ target: counterTarget, action: 'count-up' },
				...setup,
				set(rackOn, 1, { guards: [{ counter: o.counter, op: '=', value: 0 }] }),
				{ target: counterTarget, action: 'count-down', phase: 'release' },
				set(rackOn, 0, { phase: 'release', guards: [{ counter: o.counter, op: '=', value: 1 }] })
			]
		};
	});
	// Room for every finger of the row, so a full chord never clamps.
	const counter: Counter = { id: o.counter, label: 'Pads held', max: Math.max(15, o.pads.length), rest: 0 };
	return { bindings, counter };
}

/** The builders' name in the product's words; `legatoRow` stays for code that uses it. */
export const holdGroupRow = legatoRow;
