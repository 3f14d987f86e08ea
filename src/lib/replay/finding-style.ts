// How each kind of finding is named and coloured on the replay page: red for sound that is wrong
// (gone, stuck, on the wrong deck), amber for what needs attention but may still sound right.
import type { FindingKind } from '$lib/engine';

export const KIND_NAME: Record<FindingKind, string> = {
	dropout: 'Dropout',
	stuck: 'Stuck',
	leak: 'Leak',
	clash: 'Clash',
	drift: 'Drift',
	clamp: 'Clamp'
};

export const KIND_FILL: Record<FindingKind, string> = {
	dropout: 'fill-alarm-400',
	stuck: 'fill-alarm-300',
	leak: 'fill-alarm-600',
	clash: 'fill-cue-300',
	drift: 'fill-cue-400',
	clamp: 'fill-cue-600'
};

export const KIND_BADGE: Record<FindingKind, string> = {
	dropout: 'bg-alarm-400 text-stage-950',
	stuck: 'bg-alarm-300 text-stage-950',
	leak: 'bg-alarm-600 text-ink-100',
	clash: 'bg-cue-300 text-stage-950',
	drift: 'bg-cue-400 text-stage-950',
	clamp: 'bg-cue-600 text-ink-100'
};
