// When an input event's changes land (DESIGN.md §4.5). Shared by replay and the rig actor so
// quantized timing is decided in one place. On a quantized binding a press waits for the next grid
// line of the beat clock, and so does its release, unless the binding says its release acts at
// once; either way a release never lands before its own press (it lands right after it). Turns are
// never quantized.
import { compileMapping } from './compile';
import { constantClock, gridLine, type Clock } from './clock';
import type { InputEvent, Mapping } from './types';

export type { Clock } from './clock';

export const DEFAULT_TEMPO = 120;

/** A constant-tempo clock: the given tempo, else the mapping's, else 120 BPM; beat 0 at `zero`. */
export function clockFor(mapping: Mapping, tempo?: number, zero = 0): Clock {
	return constantClock(tempo ?? mapping.tempo ?? DEFAULT_TEMPO, zero);
}

/** `lastPressAt`: when the latest press of this input lands (or landed). */
export function engageAt(mapping: Mapping, event: InputEvent, clock: Clock, lastPressAt: number | undefined): number {
	if (event.type === 'turn') return event.t;
	const c = compileMapping(mapping);
	const q = c.quantizeByInput.get(event.input);
	if (event.type === 'press') return q ? gridLine(clock, event.t, q) : event.t;
	const at = q && !c.releaseAtOnce.has(event.input) ? gridLine(clock, event.t, q) : event.t;
	return lastPressAt !== undefined && lastPressAt > at ? lastPressAt : at;
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
