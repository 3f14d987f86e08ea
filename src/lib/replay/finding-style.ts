// How each kind of finding is named and coloured on the replay page: red for sound that is wrong
// (gone, stuck on, bleeding to the wrong deck, taken over), amber for what needs attention but may still sound right.
import { FINDING_INFO, type FindingKind } from '$lib/engine';

export const KIND_NAME = Object.fromEntries(
	Object.entries(FINDING_INFO).map(([kind, info]) => [kind, info.label])
) as Record<FindingKind, string>;

export const KIND_FILL: Record<FindingKind, string> = {
	dropout: 'fill-alarm-400',
	'stuck-on': 'fill-alarm-300',
	bleed: 'fill-alarm-600',
	clash: 'fill-cue-300',
	'count-left-over': 'fill-cue-400',
	'count-overflow': 'fill-cue-600',
	takeover: 'fill-ink-100'
};

export const KIND_BADGE: Record<FindingKind, string> = {
	dropout: 'bg-alarm-400 text-stage-950',
	'stuck-on': 'bg-alarm-300 text-stage-950',
	bleed: 'bg-alarm-600 text-ink-100',
	clash: 'bg-cue-300 text-stage-950',
	'count-left-over': 'bg-cue-400 text-stage-950',
	'count-overflow': 'bg-cue-600 text-ink-100',
	takeover: 'bg-ink-100 text-stage-950'
};
