// Recorded sessions. Events arrive in numbered chunks while a rehearsal runs; a chunk's number is
// its identity, so a resent chunk (after a lost answer, a reload or an offline queue) is stored
// once. The session document is the chunks in number order.
import { documentKind } from '$lib/documents';
import { buildReplay } from '$lib/replay/model';
import {
	clockSchema,
	constantClock,
	parseSession,
	sessionEventsSchema,
	sessionStartSchema,
	type Mapping,
	type SessionClock,
	type SessionDocument,
	type SessionEvent
} from '$lib/engine';
import { and, asc, count, desc, eq, inArray, isNull, sql } from 'drizzle-orm';
import { randomUUID } from 'node:crypto';
import { z } from 'zod';
import { analyseSessionOffThread } from './analysis/pool';
import { limits } from './config';
import { removeSessions } from './cleanup';
import { serialWrite, writeTransaction, type Database } from './db';
import { assignment, drill, mappingVersion, rehearsal, rehearsalChunk, submission } from './db/schema';
import { Refusal } from './http';
import { getMapping, storedDocument } from './mappings';
import { CHUNK_MAX_EVENTS } from '$lib/recorder/limits';

export const chunkSchema = z.object({
	seq: z.number().int().min(0).max(10_000_000),
	events: sessionEventsSchema.element.array().max(CHUNK_MAX_EVENTS)
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
	if (row.deletedAt) throw new Refusal(404, 'That session is in the trash. Restore it from the trash to open it.');
	return row;
}

/** The session row, when it is the user's; 404 otherwise. */
export const getRehearsalRow = mine;

export async function createRehearsal(db: Database, userId: string, input: z.infer<typeof newRehearsalSchema>) {
	const m = await getMapping(db, userId, input.mappingId);
	const [{ kept }] = await db.select({ kept: count() }).from(rehearsal).where(eq(rehearsal.ownerId, userId));
	if (kept >= limits.sessions())
		throw new Refusal(
			409,
			`You keep ${kept} sessions, the most one person may keep (${limits.sessions()} sessions). Delete old sessions to record new ones.`
		);
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

/**
 * Stores a chunk unless one with its number is there already; answers what the server holds.
 * The same chunk sent again is a duplicate (answered, not stored); a different chunk under a
 * number already used, a chunk for a finished session and a chunk past the session's limit are
 * refused (409, 409, 413), never dropped silently.
 */
export async function appendChunk(db: Database, userId: string, id: string, chunk: z.infer<typeof chunkSchema>) {
	const last = chunk.events.at(-1)?.t ?? 0;
	const n = chunk.events.length;
	const max = limits.sessionEvents();
	const events = JSON.stringify(chunk.events);
	// One write transaction of two statements, run by the driver in one go (a batch): nothing else
	// of this process runs while it holds the write lock, and a remote database gets one round
	// trip. The insert happens only when the session is the user's, still recording and has room;
	// the count grows only when the insert just added a row (`changes()` is the row count of the
	// statement before, https://sqlite.org/lang_corefunc.html#changes).
	const [inserted, counted] = await serialWrite(() =>
		db.$client.batch(
			[
				{
					sql: `insert into rehearsal_chunk (rehearsal_id, seq, events, event_count)
						select id, ?, ?, ? from rehearsal
						where id = ? and owner_id = ? and status = 'recording' and event_count + ? <= ?
						on conflict do nothing`,
					args: [chunk.seq, events, n, id, userId, n, max]
				},
				{
					sql: `update rehearsal set event_count = event_count + ?, duration_ms = max(duration_ms, ?), updated_at = ?
						where id = ? and changes() = 1
						returning event_count`,
					args: [n, last, Date.now(), id]
				}
			],
			'write'
		)
	);
	if (inserted.rowsAffected === 1 && counted.rows.length === 1)
		return { stored: true, duplicate: false, eventCount: Number(counted.rows[0].event_count) };
	// Not stored: say why, in the order a person can act on. Everything checked here only ever
	// moves one way (a stored chunk stays, a finished session stays finished, counts only grow), so
	// what is read now is why the insert above did not happen.
	const [row] = await db
		.select({ ownerId: rehearsal.ownerId, status: rehearsal.status, eventCount: rehearsal.eventCount })
		.from(rehearsal)
		.where(eq(rehearsal.id, id));
	if (!row || row.ownerId !== userId)
		throw new Refusal(404, 'That session does not exist, or it belongs to someone else.');
	const [kept] = await db
		.select({ events: sql<string>`${rehearsalChunk.events}` })
		.from(rehearsalChunk)
		.where(and(eq(rehearsalChunk.rehearsalId, id), eq(rehearsalChunk.seq, chunk.seq)));
	if (kept) {
		if (kept.events === events) return { stored: false, duplicate: true, eventCount: row.eventCount };
		throw new Refusal(
			409,
			`The server already holds a different chunk ${chunk.seq} of this session; this one was not stored.`
		);
	}
	if (row.status !== 'recording')
		throw new Refusal(409, 'This recording is finished; events sent after “Stop” are not added to it.');
	if (row.eventCount + n > max)
		throw new Refusal(
			413,
			`A session holds at most ${max} events; this one is full. Stop it and start a new recording.`
		);
	throw new Error(`chunk ${chunk.seq} of session ${id} was neither stored nor refused`);
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

/**
 * Ends the recording: closes it to new chunks, names it, and counts its findings against the
 * mapping version it was played with — in a worker thread, so that a long take does not hold up
 * other people's requests. Finishing again counts again.
 */
export async function finishRehearsal(db: Database, userId: string, id: string, name?: string, clock?: SessionClock) {
	const row = await mine(db, userId, id);
	if (clock) await serialWrite(() => db.update(rehearsal).set({ clock }).where(eq(rehearsal.id, id)));
	const { session } = await sessionDocument(db, userId, id);
	// The events' length for now; the replay with the pinned mapping (off this thread, below) gives
	// the length the replay page shows — quantized landings and finding ends included — and it replaces this.
	const durationMs = buildReplay(null, session).length;
	await serialWrite(() =>
		db
			.update(rehearsal)
			.set({ status: 'saved', name: name?.trim() || row.name, durationMs })
			.where(eq(rehearsal.id, id))
	);
	const mapping = await pinnedMapping(db, row);
	const analysis = mapping ? await analyseSessionOffThread({ mapping, session }) : { findings: 0, length: durationMs };
	await serialWrite(() =>
		db
			.update(rehearsal)
			.set({ findingCount: analysis.findings, durationMs: analysis.length })
			.where(eq(rehearsal.id, id))
	);
	return { findings: analysis.findings };
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
				isNull(rehearsal.deletedAt),
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

/** The sessions among `ids` that are handed in for an assignment, with the drill each was handed in for. */
export async function handedIn(db: Pick<Database, 'select'>, ids: string[]): Promise<Map<string, string>> {
	if (!ids.length) return new Map();
	const rows = await db
		.select({ id: submission.rehearsalId, drill: drill.name })
		.from(submission)
		.innerJoin(assignment, eq(assignment.id, submission.assignmentId))
		.innerJoin(drill, eq(drill.id, assignment.drillId))
		.where(inArray(submission.rehearsalId, ids));
	return new Map(rows.map((r) => [r.id, r.drill]));
}

/** Why a session handed in for an assignment cannot be deleted by its student. */
export const handedInProblem = (drillName: string) =>
	`This take was handed in for “${drillName}”; it stays while the class keeps it.`;

/**
 * Moves a session to the trash; its events and audio stay until the trash is purged. A session
 * with no events and no audio (an empty take thrown away) is removed at once: nothing to restore.
 * A take handed in for an assignment is refused (409): the teacher reviews it. Whether to remove
 * or to trash is decided on the row as it stands inside the write transaction, so an upload
 * attached meanwhile is trashed with the session, never orphaned.
 */
export async function deleteRehearsal(db: Database, userId: string, id: string) {
	await mine(db, userId, id);
	return writeTransaction(db, async (tx) => {
		const [row] = await tx.select().from(rehearsal).where(eq(rehearsal.id, id));
		if (!row || row.ownerId !== userId || row.deletedAt)
			throw new Refusal(404, 'That session does not exist, or it belongs to someone else.');
		const drillName = (await handedIn(tx, [id])).get(id);
		if (drillName !== undefined) throw new Refusal(409, handedInProblem(drillName));
		if (row.eventCount === 0 && !row.audioFile) await removeSessions(tx, eq(rehearsal.id, id));
		else await tx.update(rehearsal).set({ deletedAt: new Date() }).where(eq(rehearsal.id, id));
		return row;
	});
}

/** Saves an imported session document (already parsed) as a finished session of a mapping. */
export async function importSession(db: Database, userId: string, mappingId: string, input: unknown, name?: string) {
	const kind = documentKind(input);
	if (kind === 'mapping' || kind === 'drill')
		throw new Refusal(
			400,
			`This is a ${kind} file, not a session.${kind === 'mapping' ? ' Import it on the Mappings page.' : ''}`
		);
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
	if (events.length > limits.sessionEvents())
		throw new Refusal(413, `A session holds at most ${limits.sessionEvents()} events; this file has ${events.length}.`);
	for (let seq = 0; seq * CHUNK_MAX_EVENTS < Math.max(events.length, 1); seq++) {
		await appendChunk(db, userId, id, {
			seq,
			events: events.slice(seq * CHUNK_MAX_EVENTS, (seq + 1) * CHUNK_MAX_EVENTS)
		});
	}
	await finishRehearsal(db, userId, id);
	return id;
}

/**
 * Points the session at a newly stored audio file and answers the file it replaces (for the caller
 * to remove). Compare-and-set: the update only lands when the row still holds the file read just
 * before, so of two uploads racing, each replaced file is answered exactly once; a session
 * deleted meanwhile answers 404 and the caller removes its new file.
 */
export async function attachAudio(db: Database, userId: string, id: string, file: string, type: string, bytes: number) {
	for (let attempt = 0; attempt < 50; attempt++) {
		const row = await mine(db, userId, id);
		const updated = await db
			.update(rehearsal)
			.set({ audioFile: file, audioType: type, audioBytes: bytes })
			.where(
				and(
					eq(rehearsal.id, id),
					row.audioFile === null ? isNull(rehearsal.audioFile) : eq(rehearsal.audioFile, row.audioFile)
				)
			)
			.returning({ id: rehearsal.id });
		if (updated.length) return row.audioFile;
	}
	throw new Refusal(409, 'The recording changed too often at once; try the upload again.');
}
