// The session document (our own format): one recorded rehearsal. Version 2 holds the beat clock
// the take was played on (beat 0 and every tempo change) and the rig as it stood when recording
// began (held pads, counters, racks, decks), so a replay lands on the same grid lines and starts
// where the take did. Version 1 documents (tempo only) still parse, as version 2 with beat 0 at
// time 0, a constant tempo and the mapping's starting rig. `parseSession` validates like
// `parseMapping`; `sessionEvents` gives replay its input events and `sessionReplay` its options.
import { z } from 'zod';
import { constantClock } from './clock';
import { toProblems, type Problem } from './mapping';
import { initialRack, initialRigState } from './rig';
import {
	CHAIN_MAX,
	EFFECT_IDS,
	PARAM_COUNT,
	type InputEvent,
	type Mapping,
	type RigState,
	type SessionClock,
	type SessionDocument,
	type SessionStart
} from './types';

const byte = z.number().int().min(0).max(255);
const unit = z.number().min(0).max(1);
const bpm = z.number().min(40).max(300);
const bool = z.boolean();

export const sessionEventsSchema = z
	.array(
		z.object({
			t: z.number().min(0),
			midi: z.array(byte).min(1).max(3).optional(),
			input: z
				.object({
					input: z.string().min(1).max(64),
					type: z.enum(['press', 'release', 'turn']),
					value: unit.optional()
				})
				.nullable()
		})
	)
	.max(2_000_000)
	.superRefine((events, ctx) => {
		for (let i = 1; i < events.length; i++)
			if (events[i].t < events[i - 1].t) {
				ctx.addIssue({
					code: 'custom',
					path: [i, 't'],
					message: `comes before the event above it (${events[i - 1].t} ms): events must be in time order`
				});
				return;
			}
	});

export const clockSchema = z.object({
	zero: z.number().finite(),
	tempos: z
		.array(z.object({ at: z.number().finite(), bpm }))
		.min(1)
		.max(10_000)
		.refine((list) => list.every((c, i) => i === 0 || c.at > list[i - 1].at), 'tempo changes must be in time order')
});

const deckMap = <T extends z.ZodType>(v: T) => z.object({ A: v, B: v, C: v, D: v });

export const sessionStartSchema = z.object({
	held: z.array(z.string().min(1).max(64)).max(512),
	counters: z.record(z.string().min(1).max(64), z.number().int().min(0).max(127)),
	racks: z
		.array(
			z.object({
				on: bool,
				mix: unit,
				routes: deckMap(bool),
				chain: z
					.array(
						z.object({ effect: z.enum(EFFECT_IDS).nullable(), on: bool, params: z.array(unit).length(PARAM_COUNT) })
					)
					.length(CHAIN_MAX)
			})
		)
		.max(8),
	decks: deckMap(z.object({ playing: bool }))
});

const common = {
	tempo: bpm,
	startedAt: z.iso.datetime({ offset: true }),
	mapping: z.string().max(200).optional(),
	events: sessionEventsSchema
};

export const sessionV1Schema = z.object({ version: z.literal(1), ...common });
export const sessionV2Schema = z.object({
	version: z.literal(2),
	...common,
	clock: clockSchema,
	initial: sessionStartSchema.optional()
});
/** Either version; `parseSession` gives version 2 back. */
export const sessionSchema = z.discriminatedUnion('version', [sessionV1Schema, sessionV2Schema]);

export type SessionResult = { ok: true; session: SessionDocument } | { ok: false; problems: Problem[] };

export function parseSession(input: unknown): SessionResult {
	const r = sessionSchema.safeParse(input);
	if (!r.success) return { ok: false, problems: toProblems(r.error) };
	const d = r.data;
	const session: SessionDocument = d.version === 2 ? d : { ...d, version: 2, clock: constantClock(d.tempo, 0) };
	return { ok: true, session };
}

/**
 * The resolved events, for replay. Unmapped messages are dropped, so `indexes[k]` gives the
 * session event behind replay event k (findings point at replay indexes).
 */
export function sessionEvents(session: Pick<SessionDocument, 'events'>): { events: InputEvent[]; indexes: number[] } {
	const events: InputEvent[] = [];
	const indexes: number[] = [];
	session.events.forEach((e, i) => {
		if (!e.input) return;
		events.push({ t: e.t, ...e.input });
		indexes.push(i);
	});
	return { events, indexes };
}

/**
 * The rig a replay of this session starts from: the stored starting rig fitted to the mapping
 * (racks it doesn't declare dropped, missing ones at their start, counters it doesn't have dropped
 * and the rest kept within their max, held pads it doesn't know dropped).
 */
export function sessionStartRig(mapping: Mapping, initial: SessionStart | undefined): RigState {
	const start = initialRigState(mapping);
	if (!initial) return start;
	const counters = { ...start.counters };
	for (const c of mapping.counters)
		if (initial.counters[c.id] !== undefined) counters[c.id] = Math.min(c.max, Math.max(0, initial.counters[c.id]));
	const known = new Set(mapping.profile.inputs.map((i) => i.id));
	return {
		racks: mapping.racks.map((_, i) => initial.racks[i] ?? initialRack()),
		decks: { ...initial.decks },
		counters,
		held: initial.held.filter((h) => known.has(h))
	};
}

/** Replay options that put a session's events on its own beat clock, from its own starting rig. */
export function sessionReplay(mapping: Mapping, session: Pick<SessionDocument, 'clock' | 'initial'>) {
	return { clock: session.clock, from: sessionStartRig(mapping, session.initial) };
}

/** What a recording stores when it begins: the rig actor's clock and state, on the take's clock. */
export function sessionStart(
	state: RigState,
	clock: SessionClock,
	takeStart: number
): { clock: SessionClock; initial: SessionStart } {
	const shift = (t: number) => Math.round((t - takeStart) * 1000) / 1000;
	return {
		clock: { zero: shift(clock.zero), tempos: clock.tempos.map((c) => ({ at: shift(c.at), bpm: c.bpm })) },
		initial: { held: [...state.held], counters: { ...state.counters }, racks: state.racks, decks: state.decks }
	};
}

/** A session document around plain input events, e.g. a verifier counterexample to save. */
export function sessionFromEvents(
	events: InputEvent[],
	tempo: number,
	startedAt = new Date(0).toISOString()
): SessionDocument {
	return {
		version: 2,
		tempo,
		startedAt,
		clock: constantClock(tempo, 0),
		events: events.map(({ t, ...input }) => ({ t, input }))
	};
}
