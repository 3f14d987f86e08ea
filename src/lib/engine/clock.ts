// The beat clock of a rig or a session (DESIGN.md §4.5): the time of beat 0 and every tempo change,
// in ms on the session clock. A tempo change keeps the beat where it is, so the grid never jumps
// under a held pad. Replay, the rig actor and the recorder all read grid lines from here, so a
// replay lands on the same lines as the take.
import { divisionFraction, msPerBeat, nextGridLine, type Division } from './effects';

export interface TempoChange {
	at: number; // ms on the session clock
	bpm: number;
}

export interface Clock {
	zero: number; // ms of beat 0
	tempos: TempoChange[]; // in time order; the first also holds before its time. Never empty.
}

export function constantClock(bpm: number, zero = 0): Clock {
	return { zero, tempos: [{ at: zero, bpm }] };
}

/** The clock with `bpm` from `at` on (later changes dropped: they are replaced by this one). */
export function withTempo(clock: Clock, bpm: number, at: number): Clock {
	const kept = clock.tempos.filter((c) => c.at < at);
	if (!kept.length) return { zero: clock.zero + shiftFor(clock, bpm, at), tempos: [{ at, bpm }] };
	return { zero: clock.zero, tempos: [...kept, { at, bpm }] };
}

/** With a single tempo, a change at `at` moves beat 0 so the beat at `at` stays put. */
function shiftFor(clock: Clock, bpm: number, at: number): number {
	const beat = beatAt(clock, at);
	return at - beat * msPerBeat(bpm) - clock.zero;
}

export function tempoAt(clock: Clock, t: number): number {
	return clock.tempos[segmentAt(clock.tempos, t)].bpm;
}

/** Raw beats from the first tempo entry to `t` (negative before it). */
function raw(clock: Clock, t: number): number {
	const list = clock.tempos;
	let beats = 0;
	for (let i = 0; i + 1 < list.length && t >= list[i + 1].at; i++)
		beats += (list[i + 1].at - list[i].at) / msPerBeat(list[i].bpm);
	const seg = segmentAt(list, t);
	return beats + (t - list[seg].at) / msPerBeat(list[seg].bpm);
}

function segmentAt(list: TempoChange[], t: number): number {
	for (let i = list.length - 1; i > 0; i--) if (list[i].at <= t) return i;
	return 0;
}

export function beatAt(clock: Clock, t: number): number {
	return raw(clock, t) - raw(clock, clock.zero);
}

export function timeAtBeat(clock: Clock, beat: number): number {
	const list = clock.tempos;
	const want = beat + raw(clock, clock.zero);
	let i = 0;
	let start = 0; // raw beats at list[i].at
	while (i + 1 < list.length) {
		const next = start + (list[i + 1].at - list[i].at) / msPerBeat(list[i].bpm);
		if (next > want) break;
		start = next;
		i++;
	}
	return list[i].at + (want - start) * msPerBeat(list[i].bpm);
}

/** The first grid line at or after `t`; none before beat 0, so earlier times land on beat 0. */
export function gridLine(clock: Clock, t: number, division: Division): number {
	if (clock.tempos.length === 1) return nextGridLine(t, division, clock.tempos[0].bpm, clock.zero);
	const step = divisionFraction(division) * 4;
	// The small tolerance keeps a press logged exactly on a line from jumping a whole step.
	const n = Math.max(0, Math.ceil(beatAt(clock, t) / step - 1e-9));
	return timeAtBeat(clock, n * step);
}
