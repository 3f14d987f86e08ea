// Builders write the whole step list a person would otherwise enter by hand. They produce plain
// bindings (the mapping document's own shape), so an editor can show and tweak every step after.
import { paramForDivision } from './effects';
import {
	DECK_IDS,
	SLOT_COUNT,
	type Binding,
	type Counter,
	type DeckId,
	type EffectId,
	type Quantize,
	type RackMode,
	type Step
} from './types';

export interface OnePressOptions {
	input: string;
	label?: string;
	rack: number;
	slot?: number; // chain mode; focus mode always uses slot 1
	effect: EffectId;
	amount?: number; // the slot's amount knob (chain mode)
	params?: (number | undefined)[]; // focus parameters 1–3, 0..1; undefined leaves one alone
	mix: number;
	mode?: RackMode; // default focus
	deck: DeckId;
	decks: 2 | 4;
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
function routeSteps(rack: number, deck: DeckId, decks: 2 | 4, extra: Partial<Step> = {}): Step[] {
	return DECK_IDS.slice(0, decks).map((d) => set({ kind: 'rack-route', rack, deck: d }, d === deck ? 1 : 0, extra));
}

/** Everything but switching the rack on: mode, effect, slots, parameters, mix, routing. */
function setupSteps(o: Omit<OnePressOptions, 'input'>): Step[] {
	const mode = o.mode ?? 'focus';
	const slot = mode === 'focus' ? 1 : (o.slot ?? 1);
	if (mode === 'focus' && o.slot !== undefined && o.slot !== 1)
		throw new Error('in focus mode the effect lives in slot 1');
	const { rack } = o;
	const steps: Step[] = [
		set({ kind: 'rack-mode', rack }, mode),
		set({ kind: 'slot-effect', rack, slot }, o.effect),
		set({ kind: 'slot-on', rack, slot }, 1)
	];
	// A chain left with other slots on by an earlier pad would play their effects too.
	if (mode === 'chain')
		for (let s = 1; s <= SLOT_COUNT; s++) if (s !== slot) steps.push(set({ kind: 'slot-on', rack, slot: s }, 0));
	if (o.amount !== undefined) steps.push(set({ kind: 'slot-amount', rack, slot }, o.amount));
	o.params?.forEach((v, i) => {
		if (v !== undefined) steps.push(set({ kind: 'focus-param', rack, param: i + 1 }, v));
	});
	steps.push(set({ kind: 'rack-mix', rack }, o.mix));
	steps.push(...routeSteps(rack, o.deck, o.decks));
	return steps;
}

/** One pad sets up a whole rack and plays it while held; release switches the rack off. */
export function onePressEffect(o: OnePressOptions): Binding {
	return {
		input: o.input,
		...(o.label !== undefined && { label: o.label }),
		intent: 'while-held',
		deck: o.deck,
		...(o.group !== undefined && { group: o.group }),
		...(o.quantize !== undefined && { quantize: o.quantize }),
		steps: [...setupSteps(o), { target: { kind: 'rack-on', rack: o.rack }, action: 'momentary' }]
	};
}

/** A pad's setting in a legato row: a division like '1/16' for parameter 1, a value, or several. */
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
 * Pads played like a keyboard on one effect: each pad counts up on press and down on release,
 * and the rack switches on only when the count was 0 before the press and off only when it was 1
 * before the release, so the effect lasts until the last finger lifts.
 */
export function legatoRow(o: LegatoRowOptions): { bindings: Binding[]; counter: Counter } {
	if (o.variants.length !== o.pads.length) throw new Error('legatoRow needs one variant per pad');
	const group = o.group ?? o.counter;
	const counterTarget = { kind: 'counter', counter: o.counter } as const;
	const rackOn = { kind: 'rack-on', rack: o.rack } as const;
	const bindings = o.pads.map((input, i): Binding => {
		const v = o.variants[i];
		const label = o.labels?.[i] ?? (typeof v === 'object' ? v.label : undefined);
		const setup = setupSteps({ ...o, params: variantParams(o.effect, v), mix: o.mix ?? 1, mode: 'focus' });
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
