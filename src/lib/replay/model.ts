// What the replay page draws, built from one session and one mapping with the engine's own
// replay and analysis: a lane per input the performer touched (held spans, knob turns), an
// audible lane per rack × deck, a step line per counter, and the findings. Pure: no DOM.
import {
	analyze,
	initialRigState,
	inputName,
	replay,
	scheduleEvents,
	sessionEvents,
	sessionReplay,
	type ReplayOptions,
	type AudibleInterval,
	type DeckId,
	type Finding,
	type InputEvent,
	type Mapping,
	type RigChange,
	type SessionDocument,
	type Timeline
} from '$lib/engine';

export interface HeldSpan {
	start: number;
	end: number | null; // null: still held when the session ends
	pressEvent: number; // replay event index
	releaseEvent: number | null;
}

export interface PadLane {
	input: string;
	label: string;
	detail: string | null; // what its binding is called, when it has a label of its own
	spans: HeldSpan[];
	turns: { t: number; value: number; event: number }[];
}

export interface AudibleLane {
	key: string;
	rack: number;
	deck: DeckId;
	intervals: AudibleInterval[];
}

export interface CounterLane {
	id: string;
	label: string;
	max: number;
	rest: number;
	peak: number; // the highest value it reached (at least 1): the lane's scale
	steps: { t: number; value: number }[]; // the first step is the rest value at 0
}

export interface ReplayModel {
	mapping: Mapping | null;
	tempo: number;
	options: ReplayOptions; // the session's beat clock and starting rig, for every run of its events
	events: InputEvent[];
	indexes: number[]; // replay event k → session event index
	times: number[]; // when replay event k lands (quantized presses wait for their grid line)
	timeline: Timeline | null;
	findings: Finding[];
	pads: PadLane[];
	audible: AudibleLane[];
	counters: CounterLane[];
	/** The session's one length (ms): its last event, landing or finding end; 0 when it has no events. */
	length: number;
	duration: number; // ms the plot spans: the length and a little room after it
}

/** What the plot spans for a session with no events (nothing plays; the empty plot still has a scale). */
export const EMPTY_PLOT_MS = 1000;

/** An input's name as the engine's messages give it (one naming rule: `inputName`). */
export function inputLabel(mapping: Mapping | null, input: string): string {
	return mapping ? inputName(mapping, input) : input;
}

export function padLanes(mapping: Mapping | null, events: readonly InputEvent[]): PadLane[] {
	const lanes = new Map<string, PadLane>();
	const open = new Map<string, HeldSpan>();
	events.forEach((e, k) => {
		let lane = lanes.get(e.input);
		if (!lane) {
			const binding = mapping?.bindings.find((b) => b.input === e.input);
			const label = inputLabel(mapping, e.input);
			lane = {
				input: e.input,
				label,
				detail: binding?.label && binding.label !== label ? binding.label : null,
				spans: [],
				turns: []
			};
			lanes.set(e.input, lane);
		}
		if (e.type === 'turn') lane.turns.push({ t: e.t, value: e.value ?? 0, event: k });
		else if (e.type === 'press' && !open.has(e.input)) {
			const span: HeldSpan = { start: e.t, end: null, pressEvent: k, releaseEvent: null };
			lane.spans.push(span);
			open.set(e.input, span);
		} else if (e.type === 'release') {
			const span = open.get(e.input);
			if (span) Object.assign(span, { end: e.t, releaseEvent: k });
			open.delete(e.input);
		}
	});
	return [...lanes.values()];
}

export function audibleLanes(timeline: Timeline, findings: readonly Finding[]): AudibleLane[] {
	const lanes = new Map<string, AudibleLane>();
	const lane = (rack: number, deck: DeckId) => {
		const key = `${rack}-${deck}`;
		if (!lanes.has(key)) lanes.set(key, { key, rack, deck, intervals: [] });
		return lanes.get(key)!;
	};
	for (const iv of timeline.audible) lane(iv.rack, iv.deck).intervals.push(iv);
	// A rack that should have sounded but never did still gets its lane: that's where the gap is.
	for (const f of findings) if (f.rack !== null && f.deck !== null) lane(f.rack, f.deck);
	return [...lanes.values()].sort((a, b) => a.rack - b.rack || a.deck.localeCompare(b.deck));
}

export function counterLanes(mapping: Mapping, timeline: Timeline, start = initialRigState(mapping)): CounterLane[] {
	return mapping.counters.map((c) => {
		const steps = [{ t: 0, value: start.counters[c.id] ?? c.rest }];
		for (const ch of timeline.changes)
			if (ch.path === `counters.${c.id}`) steps.push({ t: ch.t, value: Number(ch.to) });
		const peak = steps.reduce((m, s) => Math.max(m, s.value), Math.max(c.rest, 1));
		return { id: c.id, label: c.label ?? c.id, max: c.max, rest: c.rest, peak, steps };
	});
}

/** When each replay event acts: its own time, or the beat-grid line a quantized binding waits for. */
export function landingTimes(
	mapping: Mapping | null,
	events: readonly InputEvent[],
	session: SessionDocument
): number[] {
	const times = events.map((e) => e.t);
	if (mapping) for (const s of scheduleEvents(mapping, events, session.clock)) times[s.index] = s.at;
	return times;
}

/**
 * A session's length as its replay shows it (ms): the last recorded event, the last quantized
 * landing, or the end of the last finding, whichever is latest. The sessions list stores the same.
 */
export function replayLength(session: SessionDocument, times: readonly number[], findings: readonly Finding[]): number {
	let last = session.events.at(-1)?.t ?? 0;
	for (const t of times) if (t > last) last = t;
	for (const f of findings) last = Math.max(last, f.end ?? f.start);
	return last;
}

export function buildReplay(mapping: Mapping | null, session: SessionDocument): ReplayModel {
	const { events, indexes } = sessionEvents(session);
	const tempo = session.tempo;
	const times = landingTimes(mapping, events, session);
	let timeline: Timeline | null = null;
	let findings: Finding[] = [];
	let options: ReplayOptions = { clock: session.clock };
	if (mapping) {
		options = sessionReplay(mapping, session);
		timeline = replay(mapping, events, options);
		findings = analyze(mapping, events, options);
	}
	const last = replayLength(session, times, findings);
	return {
		mapping,
		tempo,
		options,
		events,
		indexes,
		times,
		timeline,
		findings,
		pads: padLanes(mapping, events),
		audible: timeline ? audibleLanes(timeline, findings) : [],
		counters: mapping && timeline ? counterLanes(mapping, timeline, options.from) : [],
		length: last,
		duration: last === 0 ? EMPTY_PLOT_MS : last + Math.max(500, last * 0.05)
	};
}

/** The changes that landed after `from` and up to `to` (ms), from a timeline's changes in order. */
export function changesBetween(changes: readonly RigChange[], from: number, to: number): RigChange[] {
	let lo = 0;
	let hi = changes.length;
	while (lo < hi) {
		const mid = (lo + hi) >> 1;
		if (changes[mid].t <= from) lo = mid + 1;
		else hi = mid;
	}
	const out: RigChange[] = [];
	for (let i = lo; i < changes.length && changes[i].t <= to; i++) out.push(changes[i]);
	return out;
}

/** Index of the latest session event at or before `ms`, -1 before the first. */
export function eventAt(events: readonly { t: number }[], ms: number): number {
	let lo = 0;
	let hi = events.length;
	while (lo < hi) {
		const mid = (lo + hi) >> 1;
		if (events[mid].t <= ms) lo = mid + 1;
		else hi = mid;
	}
	return lo - 1;
}
