// Recorded sessions. Events arrive in numbered chunks while a rehearsal runs; a chunk's number is
// its identity, so a resent chunk (after a lost answer, a reload or an offline queue) is stored
// once. The session document is the chunks in number order.
import {
	analyze,
	clockSchema,
	constantClock,
	parseSession,
	sessionEvents,
	sessionEventsSchema,
	sessionReplay,
	sessionStartSchema,
	type Mapping,
	type SessionClock,
	type SessionDocument,
	type SessionEvent
} from '$lib/engine';
import { and, asc, desc, eq, sql } from 'drizzle-orm';
import { randomUUID } from 'node:crypto';
import { z } from 'zod';
import { serialWrite, type Database } from './db';
import { mappingVersion, rehearsal, rehearsalChunk } from './db/schema';
import { Refusal } from './http';
import { getMapping, storedDocument } from './mappings';

export const MAX_CHUNK_EVENTS = 5000;

export const chunkSchema = z.object({
	seq: z.number().int().min(0).max(10_000_000),
	events: sessionEventsSchema.element.array().max(MAX_CHUNK_EVENTS)
});

export const newRehearsalSchema = z.object({
	mappingId: z.string().min(1).max(64),
	name: z.string().trim().max(120).optional(),
	tempo: z.number().min(40).max(300),
	startedAt: z.iso.datetime({ offset: true }).optional(),
	// The beat clock and the rig as they stood when recording began, on the take's clock.
	clock: clockSchema.optional(),
	initial: sessionStartSchema.optional()
});

export type RehearsalRow = typeof rehearsal.$inferSelect;

async function mine(db: Database, userId: string, id: string): Promise<RehearsalRow> {
	const [row] = await db.select().from(rehearsal).where(eq(rehearsal.id, id));
	if (!row || row.ownerId !== userId)
		throw new Refusal(404, 'That session does not exist, or it belongs to someone else.');
	return row;
}

export async function createRehearsal(db: Database, userId: string, input: z.infer<typeof newRehearsalSchema>) {
	const m = await getMapping(db, userId, input.mappingId);
	const id = randomUUID();
	const startedAt = input.startedAt ?? new Date().toISOString();
	const name = input.name || `${m.name} · ${startedAt.slice(0, 16).replace('T', ' ')}`;
	await db.insert(rehearsal).values({
		id,
		ownerId: userId,
		mappingId: m.id,
		mappingVersionId: m.versionId,
		mappingName: m.name,
		name,
		tempo: input.tempo,
		startedAt,
		clock: input.clock ?? null,
		initial: input.initial ?? null
	});
	return { id, name };
}

/** Stores a chunk unless one with its number is there already; answers what the server holds. */
export async function appendChunk(db: Database, userId: string, id: string, chunk: z.infer<typeof chunkSchema>) {
	await mine(db, userId, id);
	const last = chunk.events.at(-1)?.t ?? 0;
	const stored = await serialWrite(() =>
		db.transaction(async (tx) => {
			const inserted = await tx
				.insert(rehearsalChunk)
				.values({ rehearsalId: id, seq: chunk.seq, events: chunk.events, eventCount: chunk.events.length })
				.onConflictDoNothing()
				.returning({ seq: rehearsalChunk.seq });
			if (inserted.length === 0) return false;
			await tx
				.update(rehearsal)
				.set({
					eventCount: sql`${rehearsal.eventCount} + ${chunk.events.length}`,
					durationMs: sql`max(${rehearsal.durationMs}, ${last})`
				})
				.where(eq(rehearsal.id, id));
			return true;
		})
	);
	const [row] = await db.select({ eventCount: rehearsal.eventCount }).from(rehearsal).where(eq(rehearsal.id, id));
	return { stored, duplicate: !stored, eventCount: row.eventCount };
}

export async function sessionDocument(
	db: Database,
	userId: string,
	id: string
): Promise<{ row: RehearsalRow; session: SessionDocument }> {
	const row = await mine(db, userId, id);
	const chunks = await db
		.select({ events: rehearsalChunk.events })
		.from(rehearsalChunk)
		.where(eq(rehearsalChunk.rehearsalId, id))
		.orderBy(asc(rehearsalChunk.seq));
	const events = chunks.flatMap((c) => c.events as SessionEvent[]);
	// Chunks from two tabs or a late offline queue can interleave in time; keep time order, stably.
	events.sort((a, b) => a.t - b.t);
	const session: SessionDocument = {
		version: 2,
		tempo: row.tempo,
		startedAt: row.startedAt,
		mapping: row.mappingName,
		// Recordings from before version 2 have no stored clock: beat 0 at 0, constant tempo.
		clock: row.clock ?? constantClock(row.tempo, 0),
		...(row.initial && { initial: row.initial }),
		events
	};
	return { row, session };
}

async function pinnedMapping(db: Database, row: RehearsalRow): Promise<Mapping | null> {
	if (!row.mappingVersionId) return null;
	const [v] = await db
		.select({ document: mappingVersion.document })
		.from(mappingVersion)
		.where(eq(mappingVersion.id, row.mappingVersionId));
	return v ? storedDocument(v.document) : null;
}

/** Ends the recording: names it, counts its findings against the mapping version it was played with. */
export async function finishRehearsal(db: Database, userId: string, id: string, name?: string, clock?: SessionClock) {
	if (clock) {
		await mine(db, userId, id);
		await db.update(rehearsal).set({ clock }).where(eq(rehearsal.id, id));
	}
	const { row, session } = await sessionDocument(db, userId, id);
	const doc = await pinnedMapping(db, row);
	const findings = doc ? analyze(doc, sessionEvents(session).events, sessionReplay(doc, session)) : [];
	await db
		.update(rehearsal)
		.set({ status: 'saved', name: name?.trim() || row.name, findingCount: findings.length })
		.where(eq(rehearsal.id, id));
	return { findings: findings.length };
}

export async function renameRehearsal(db: Database, userId: string, id: string, name: string) {
	await mine(db, userId, id);
	await db.update(rehearsal).set({ name }).where(eq(rehearsal.id, id));
}

export async function listRehearsals(db: Database, userId: string, filter = '') {
	const q = filter.trim();
	const pattern = `%${q.replace(/[%_\\]/g, (c) => '\\' + c)}%`;
	return db
		.select()
		.from(rehearsal)
		.where(
			and(
				eq(rehearsal.ownerId, userId),
				q
					? sql`(${rehearsal.name} like ${pattern} escape '\\' or ${rehearsal.mappingName} like ${pattern} escape '\\')`
					: undefined
			)
		)
		.orderBy(desc(rehearsal.createdAt));
}

export async function getRehearsal(db: Database, userId: string, id: string) {
	const { row, session } = await sessionDocument(db, userId, id);
	return { row, session, mapping: await pinnedMapping(db, row) };
}

export async function deleteRehearsal(db: Database, userId: string, id: string) {
	const row = await mine(db, userId, id);
	await db.delete(rehearsal).where(eq(rehearsal.id, id));
	return row;
}

/** Saves an imported session document (already parsed) as a finished session of a mapping. */
export async function importSession(db: Database, userId: string, mappingId: string, input: unknown, name?: string) {
	const parsed = parseSession(input);
	if (!parsed.ok) {
		const first = parsed.problems[0];
		throw new Refusal(
			400,
			`This is not a valid session file: ${first.path ? first.path + ': ' : ''}${first.message}`,
			parsed.problems
		);
	}
	const { id } = await createRehearsal(db, userId, {
		mappingId,
		name: name || 'Imported session',
		tempo: parsed.session.tempo,
		startedAt: parsed.session.startedAt,
		clock: parsed.session.clock,
		initial: parsed.session.initial
	});
	const events = parsed.session.events;
	for (let seq = 0; seq * MAX_CHUNK_EVENTS < Math.max(events.length, 1); seq++) {
		await appendChunk(db, userId, id, {
			seq,
			events: events.slice(seq * MAX_CHUNK_EVENTS, (seq + 1) * MAX_CHUNK_EVENTS)
		});
	}
	await finishRehearsal(db, userId, id);
	return id;
}

export async function attachAudio(db: Database, userId: string, id: string, file: string, type: string, bytes: number) {
	const row = await mine(db, userId, id);
	await db.update(rehearsal).set({ audioFile: file, audioType: type, audioBytes: bytes }).where(eq(rehearsal.id, id));
	return row.audioFile;
}
