// The version 1 engine as it stood before the rack model changed, kept only as the test oracle for
// upgrade.test.ts: version 1 replay must equal the replay of the upgraded version 2 document.
// A mapping turned into flat step records for `applyEvent`: 0-based indexes, the change path
// precomputed, steps grouped by input in binding order. Cached per mapping object (a WeakMap), so
// the hot path never walks the document again. Mappings are treated as immutable once applied:
// an editor that changes one makes a new object.
import type { Action, DeckId, Guard, Mapping, Phase, Quantize, StepValue } from './types';

export const T = {
	rackOn: 0,
	rackMode: 1,
	rackMix: 2,
	rackRoute: 3,
	slotEffect: 4,
	slotOn: 5,
	slotAmount: 6,
	focusParam: 7,
	deckPlay: 8,
	counter: 9
} as const;

export interface CompiledStep {
	kind: (typeof T)[keyof typeof T];
	action: Action;
	phase: Phase;
	value: StepValue | undefined;
	followsKnob: boolean;
	guards: Guard[];
	rack: number; // 0-based, -1 when the target has no rack
	slot: number;
	param: number;
	deck: DeckId | null;
	counter: string | null;
	max: number; // the counter's max
	path: string; // RigChange path
	binding: number;
	index: number;
}

export interface CompiledMapping {
	stepsByInput: Map<string, CompiledStep[]>;
	/** The first quantize other than `off` among an input's bindings. */
	quantizeByInput: Map<string, Exclude<Quantize, 'off'>>;
}

const cache = new WeakMap<Mapping, CompiledMapping>();

export function compileMapping(mapping: Mapping): CompiledMapping {
	let c = cache.get(mapping);
	if (!c) {
		c = build(mapping);
		cache.set(mapping, c);
	}
	return c;
}

function build(mapping: Mapping): CompiledMapping {
	const max = new Map(mapping.counters.map((c) => [c.id, c.max]));
	const stepsByInput = new Map<string, CompiledStep[]>();
	const quantizeByInput = new Map<string, Exclude<Quantize, 'off'>>();
	mapping.bindings.forEach((b, bi) => {
		if (b.quantize && b.quantize !== 'off' && !quantizeByInput.has(b.input)) quantizeByInput.set(b.input, b.quantize);
		const list = stepsByInput.get(b.input) ?? [];
		stepsByInput.set(b.input, list);
		b.steps.forEach((s, si) => {
			const t = s.target;
			const rack = 'rack' in t ? t.rack - 1 : -1;
			const slot = 'slot' in t ? t.slot - 1 : 0;
			const param = 'param' in t ? t.param - 1 : 0;
			const base = {
				action: s.action,
				phase: s.phase ?? 'press',
				value: s.value,
				followsKnob: s.action === 'set' && s.value === undefined,
				guards: s.guards ?? [],
				rack,
				slot,
				param,
				deck: 'deck' in t ? t.deck : null,
				counter: t.kind === 'counter' ? t.counter : null,
				max: t.kind === 'counter' ? (max.get(t.counter) ?? 15) : 0,
				binding: bi,
				index: si
			};
			const [kind, path] = describe(t, rack, slot, param);
			list.push({ ...base, kind, path });
		});
	});
	return { stepsByInput, quantizeByInput };
}

function describe(
	t: Mapping['bindings'][0]['steps'][0]['target'],
	r: number,
	s: number,
	p: number
): [CompiledStep['kind'], string] {
	switch (t.kind) {
		case 'rack-on':
			return [T.rackOn, `racks.${r}.on`];
		case 'rack-mode':
			return [T.rackMode, `racks.${r}.mode`];
		case 'rack-mix':
			return [T.rackMix, `racks.${r}.mix`];
		case 'rack-route':
			return [T.rackRoute, `racks.${r}.routes.${t.deck}`];
		case 'slot-effect':
			return [T.slotEffect, `racks.${r}.slots.${s}.effect`];
		case 'slot-on':
			return [T.slotOn, `racks.${r}.slots.${s}.on`];
		case 'slot-amount':
			return [T.slotAmount, `racks.${r}.slots.${s}.amount`];
		case 'focus-param':
			return [T.focusParam, `racks.${r}.params.${p}`];
		case 'deck-play':
			return [T.deckPlay, `decks.${t.deck}.playing`];
		case 'counter':
			return [T.counter, `counters.${t.counter}`];
	}
}
