// The session document, version 1 (our own format): one recorded rehearsal. Tempo, start time and
// every event with its time in ms from the start, the raw MIDI bytes when it came from a device,
// and the resolved input event (null for a message no input answers: logged, then ignored).
// `parseSession` validates like `parseMapping`; `sessionEvents` gives replay its input events.
import { z } from 'zod';
import { toProblems, type Problem } from './mapping';
import type { InputEvent, SessionDocument } from './types';

const byte = z.number().int().min(0).max(255);

export const sessionSchema = z.object({
	version: z.literal(1),
	tempo: z.number().min(40).max(300),
	startedAt: z.iso.datetime({ offset: true }),
	mapping: z.string().max(200).optional(),
	events: z
		.array(
			z.object({
				t: z.number().min(0),
				midi: z.array(byte).min(1).max(3).optional(),
				input: z
					.object({
						input: z.string().min(1).max(64),
						type: z.enum(['press', 'release', 'turn']),
						value: z.number().min(0).max(1).optional()
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
		})
});

export type SessionResult = { ok: true; session: SessionDocument } | { ok: false; problems: Problem[] };

export function parseSession(input: unknown): SessionResult {
	const r = sessionSchema.safeParse(input);
	if (!r.success) return { ok: false, problems: toProblems(r.error) };
	const session: SessionDocument = r.data;
	return { ok: true, session };
}

/**
 * The resolved events, for replay. Unmapped messages are dropped, so `indexes[k]` gives the
 * session event behind replay event k (findings point at replay indexes).
 */
export function sessionEvents(session: SessionDocument): { events: InputEvent[]; indexes: number[] } {
	const events: InputEvent[] = [];
	const indexes: number[] = [];
	session.events.forEach((e, i) => {
		if (!e.input) return;
		events.push({ t: e.t, ...e.input });
		indexes.push(i);
	});
	return { events, indexes };
}

/** A session document around plain input events, e.g. a verifier counterexample to save. */
export function sessionFromEvents(
	events: InputEvent[],
	tempo: number,
	startedAt = new Date(0).toISOString()
): SessionDocument {
	return {
		version: 1,
		tempo,
		startedAt,
		events: events.map(({ t, ...input }) => ({ t, input }))
	};
}
