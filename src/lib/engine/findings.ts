// What each kind of finding is called and means, in the product's plain words (DESIGN.md §2,
// §4.6). The replay page, the room, the doctor panel, the glossary and the CLI all read this one
// table: a finding kind never reaches a person without its label and sentence.
import type { Finding, FindingKind } from './types';

export interface FindingInfo {
	label: string;
	explain: string; // one line
}

export const FINDING_INFO: Record<FindingKind, FindingInfo> = {
	dropout: {
		label: 'Dropout',
		explain: 'A pad of a hold group is held, yet its effect is not heard on its deck.'
	},
	'stuck-on': {
		label: 'Stuck on',
		explain: 'The effect is still heard after the last pad of its group was lifted.'
	},
	bleed: {
		label: 'Bleed',
		explain: 'The effect is heard on a deck the pad that set it up does not target.'
	},
	clash: {
		label: 'Clash',
		explain: 'Two bindings answer the same MIDI address, so one press runs both.'
	},
	'count-left-over': {
		label: 'Count left over',
		explain: 'No pad of its group is held, yet a held-pad counter is not back at its rest value.'
	},
	'count-overflow': {
		label: 'Count overflow',
		explain: 'A count step tried to go past 0 or the counter’s max and was stopped there.'
	},
	takeover: {
		label: 'Takeover',
		explain: 'Another pad changed or cut a rack while a latched effect was on in it.'
	}
};

/** Names findings had before they were given plain words; stored documents may still carry them. */
const OLD_KINDS: Record<string, FindingKind> = {
	stuck: 'stuck-on',
	leak: 'bleed',
	drift: 'count-left-over',
	clamp: 'count-overflow'
};

/** A stored kind, old or current, as today's kind; null for something that is no finding kind. */
export function findingKind(stored: string): FindingKind | null {
	if (Object.hasOwn(FINDING_INFO, stored)) return stored as FindingKind;
	return Object.hasOwn(OLD_KINDS, stored) ? OLD_KINDS[stored] : null;
}

/** A finding read back from storage, its kind brought up to today's name; null if it has none. */
export function storedFinding<T extends { kind: string }>(f: T): (T & { kind: FindingKind }) | null {
	const kind = findingKind(f.kind);
	return kind ? { ...f, kind } : null;
}

/** A finding for people and scripts: numbered from 1 (event, binding), with its label and sentence. */
export function numberedFinding(f: Finding) {
	return {
		...f,
		event: f.event + 1,
		binding: f.binding === null || f.binding < 0 ? null : f.binding + 1,
		label: FINDING_INFO[f.kind].label,
		explain: FINDING_INFO[f.kind].explain
	};
}
