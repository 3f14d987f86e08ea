// When an input event's changes land (DESIGN.md §4.5). Shared by replay and the rig actor so
// quantized engage is decided in one place. A press on a quantized binding waits for the next grid
// line of the rig's beat clock; a release runs at once unless its own press is still waiting, in
// which case it lands right after that press (never before it). Turns are never quantized.
import { compileMapping } from './compile';
import { nextGridLine } from './effects';
import type { InputEvent, Mapping } from './types';

export interface Clock {
	tempo: number; // BPM
	origin: number; // session time (ms) of the beat clock's first beat
}

export const DEFAULT_TEMPO = 120;

export function clockFor(mapping: Mapping, tempo?: number, origin = 0): Clock {
	return { tempo: tempo ?? mapping.tempo ?? DEFAULT_TEMPO, origin };
}

/** `lastPressAt`: when the latest press of this input lands (or landed). */
export function engageAt(mapping: Mapping, event: InputEvent, clock: Clock, lastPressAt: number | undefined): number {
	if (event.type === 'press') {
		const q = compileMapping(mapping).quantizeByInput.get(event.input);
		return q ? nextGridLine(event.t, q, clock.tempo, clock.origin) : event.t;
	}
	if (event.type === 'release' && lastPressAt !== undefined && lastPressAt > event.t) return lastPressAt;
	return event.t;
}

export interface Scheduled {
	index: number;
	at: number;
}

/** Every event with the time it lands, in the order they are applied: by time, then by index. */
export function scheduleEvents(mapping: Mapping, events: readonly InputEvent[], clock: Clock): Scheduled[] {
	const lastPress = new Map<string, number>();
	const out: Scheduled[] = new Array(events.length);
	let sorted = true;
	for (let i = 0; i < events.length; i++) {
		const e = events[i];
		const at = engageAt(mapping, e, clock, lastPress.get(e.input));
		if (e.type === 'press') lastPress.set(e.input, at);
		out[i] = { index: i, at };
		if (i > 0 && at < out[i - 1].at) sorted = false;
	}
	// Array.prototype.sort is stable, so equal times keep their event order.
	return sorted ? out : out.sort((a, b) => a.at - b.at);
}
