// What the step form offers for each target: the actions that fit it, the kind of value it takes,
// and a sensible fresh step. The engine's schema (mapping.ts) stays the judge of what is valid;
// this only keeps the form from offering choices it would refuse.
import { DECK_IDS, type Action, type Mapping, type Step, type Target, type TargetKind } from '$lib/engine';

export const TARGET_KINDS: { kind: TargetKind; label: string }[] = [
	{ kind: 'chain', label: 'Load a chain of effects into a rack' },
	{ kind: 'effect-param', label: 'Set an effect parameter' },
	{ kind: 'rack-mix', label: 'Set a rack’s dry/wet mix' },
	{ kind: 'rack-route', label: 'Route a rack to or away from a deck' },
	{ kind: 'rack-on', label: 'Switch a rack on or off' },
	{ kind: 'effect', label: 'Put an effect in one chain position' },
	{ kind: 'effect-on', label: 'Switch one chain position on or off' },
	{ kind: 'deck-play', label: 'Start or stop a deck' },
	{ kind: 'counter', label: 'Change a counter' }
];

export const ACTION_LABELS: Record<Action, string> = {
	momentary: 'on while held (momentary)',
	toggle: 'flip on each press (toggle)',
	set: 'set to a value',
	'count-up': 'count up by one',
	'count-down': 'count down by one',
	reset: 'reset to 0'
};

const SWITCHES: TargetKind[] = ['rack-on', 'rack-route', 'effect-on', 'deck-play'];

export function actionsFor(kind: TargetKind): Action[] {
	if (SWITCHES.includes(kind)) return ['set', 'momentary', 'toggle'];
	if (kind === 'counter') return ['count-up', 'count-down', 'reset', 'set'];
	return ['set'];
}

export type ValueKind = 'none' | 'switch' | 'level' | 'chain' | 'effect' | 'count';

export function valueKind(kind: TargetKind, action: Action): ValueKind {
	if (action !== 'set') return 'none';
	if (SWITCHES.includes(kind)) return 'switch';
	if (kind === 'rack-mix' || kind === 'effect-param') return 'level';
	if (kind === 'chain') return 'chain';
	if (kind === 'effect') return 'effect';
	return 'count';
}

export function targetFor(kind: TargetKind, m: Pick<Mapping, 'counters'>, from?: Target): Target {
	const rack = from && 'rack' in from ? from.rack : 1;
	const deck = from && 'deck' in from ? from.deck : DECK_IDS[0];
	const position = from && 'position' in from ? from.position : 1;
	switch (kind) {
		case 'rack-route':
			return { kind, rack, deck };
		case 'deck-play':
			return { kind, deck };
		case 'effect':
		case 'effect-on':
			return { kind, rack, position };
		case 'effect-param':
			return { kind, rack, position, param: 1 };
		case 'counter':
			return { kind, counter: m.counters[0]?.id ?? 'held' };
		default:
			return { kind, rack };
	}
}

const DEFAULT_VALUE: Record<ValueKind, Step['value']> = {
	none: undefined,
	switch: 1,
	level: 1,
	chain: ['echo'],
	effect: 'echo',
	count: 0
};

/** A step of `kind` keeping what it can of `from`, with the first action that fits. */
export function freshStep(kind: TargetKind, m: Pick<Mapping, 'counters'>, from?: Step): Step {
	const actions = actionsFor(kind);
	const action = from && actions.includes(from.action) ? from.action : actions[0];
	const step: Step = { target: targetFor(kind, m, from?.target), action };
	const value = DEFAULT_VALUE[valueKind(kind, action)];
	if (value !== undefined) step.value = value;
	if (from?.phase === 'release') step.phase = 'release';
	if (from?.guards?.length) step.guards = from.guards;
	return step;
}

/** The same step with another action; the value follows what the action needs. */
export function withAction(step: Step, action: Action): Step {
	const next: Step = { ...step, action };
	const kind = valueKind(step.target.kind, action);
	if (kind === 'none') delete next.value;
	else if (valueKind(step.target.kind, step.action) !== kind) next.value = DEFAULT_VALUE[kind];
	if (action === 'momentary' || action === 'toggle') delete next.phase;
	return next;
}
