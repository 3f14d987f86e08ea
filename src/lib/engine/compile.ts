// A mapping turned into flat step records for `applyEvent`: 0-based indexes, the change path
// precomputed, steps grouped by input in binding order. Cached per mapping object (a WeakMap), so
// the hot path never walks the document again. Mappings are treated as immutable once applied:
// an editor that changes one makes a new object.
import type { Action, DeckId, Guard, Mapping, Phase, Quantize, StepValue, Target } from './types';

export const T = {
	rackOn: 0,
	rackMix: 1,
	rackRoute: 2,
	chain: 3,
	effect: 4,
	effectOn: 5,
	effectParam: 6,
	deckPlay: 7,
	counter: 8
} as const;

export interface CompiledStep {
	kind: (typeof T)[keyof typeof T];
	action: Action;
	phase: Phase;
	value: StepValue | undefined;
	followsKnob: boolean;
	guards: Guard[];
	rack: number; // 0-based, -1 when the target has no rack
	position: number; // 0-based
	param: number; // 0-based
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
	/** Inputs whose quantized binding lets the release act at once. */
	releaseAtOnce: Set<string>;
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
	const releaseAtOnce = new Set<string>();
	mapping.bindings.forEach((b, bi) => {
		if (b.quantize && b.quantize !== 'off' && !quantizeByInput.has(b.input)) {
			quantizeByInput.set(b.input, b.quantize);
			if (b.releaseAtOnce) releaseAtOnce.add(b.input);
		}
		const list = stepsByInput.get(b.input) ?? [];
		stepsByInput.set(b.input, list);
		b.steps.forEach((s, si) => {
			const t = s.target;
			const rack = 'rack' in t ? t.rack - 1 : -1;
			const position = 'position' in t ? t.position - 1 : 0;
			const param = 'param' in t ? t.param - 1 : 0;
			const base = {
				action: s.action,
				phase: s.phase ?? 'press',
				value: s.value,
				followsKnob: s.action === 'set' && s.value === undefined,
				guards: s.guards ?? [],
				rack,
				position,
				param,
				deck: 'deck' in t ? t.deck : null,
				counter: t.kind === 'counter' ? t.counter : null,
				max: t.kind === 'counter' ? (max.get(t.counter) ?? 15) : 0,
				binding: bi,
				index: si
			};
			const [kind, path] = describe(t, rack, position, param);
			list.push({ ...base, kind, path });
		});
	});
	return { stepsByInput, quantizeByInput, releaseAtOnce };
}

function describe(t: Target, r: number, p: number, k: number): [CompiledStep['kind'], string] {
	switch (t.kind) {
		case 'rack-on':
			return [T.rackOn, `racks.${r}.on`];
		case 'rack-mix':
			return [T.rackMix, `racks.${r}.mix`];
		case 'rack-route':
			return [T.rackRoute, `racks.${r}.routes.${t.deck}`];
		case 'chain':
			return [T.chain, `racks.${r}.chain`];
		case 'effect':
			return [T.effect, `racks.${r}.chain.${p}.effect`];
		case 'effect-on':
			return [T.effectOn, `racks.${r}.chain.${p}.on`];
		case 'effect-param':
			return [T.effectParam, `racks.${r}.chain.${p}.params.${k}`];
		case 'deck-play':
			return [T.deckPlay, `decks.${t.deck}.playing`];
		case 'counter':
			return [T.counter, `counters.${t.counter}`];
	}
}
