// Drills (DESIGN.md §4.8) and tries at them. A teacher owns a drill and pins the mapping version
// it is played on; a student reaches a drill only through an assignment to a class they joined.
// A try ("take") is one of the student's recorded sessions whose beat clock's zero is beat 0 of
// the drill (DESIGN.md §4.8); Padproof scores it here, on the server, with the engine's scoring.
// Takes recorded before sessions carried that zero keep theirs in drill_take.zero.
import {
	parseDrill,
	type Score,
	scoreSummary,
	type DrillDocument,
	type Mapping,
	type Problem,
	type ScoreSummary,
	type SessionDocument
} from '$lib/engine';
import { and, count, desc, eq, inArray } from 'drizzle-orm';
import { randomUUID } from 'node:crypto';
import { z } from 'zod';
import { removeDrills, removeFiles } from './cleanup';
import { writeTransaction, type Database } from './db';
import { assignment, classMember, drill, drillTake, mappingVersion, schoolClass, submission } from './db/schema';
import { Refusal } from './http';
import { getMapping, storedDocument } from './mappings';
import { scoreOffThread } from './analysis/pool';
import { finishRehearsal, sessionDocument } from './rehearsals';

export type DrillRow = typeof drill.$inferSelect;

/** A drill document checked against the mapping it is played on: every target's pad exists. */
export function checkDrill(input: unknown, m: Mapping): DrillDocument {
	const parsed = parseDrill(input);
	const problems: Problem[] = parsed.ok ? [] : parsed.problems;
	if (parsed.ok) {
		const pads = new Set(m.profile.inputs.map((i) => i.id));
		parsed.drill.targets.forEach((t, i) => {
			if (!pads.has(t.input))
				problems.push({ path: `targets[${i}].input`, message: `"${t.input}" is not an input of ${m.name}` });
		});
	}
	if (problems.length || !parsed.ok) {
		const first = problems[0];
		throw new Refusal(
			400,
			`This is not a valid drill: ${first.path ? first.path + ': ' : ''}${first.message}` +
				(problems.length > 1 ? ` (and ${problems.length - 1} more)` : ''),
			problems
		);
	}
	return parsed.drill;
}

export const drillInput = z.object({
	mappingId: z.string().min(1, { error: 'Choose the mapping the drill is played on.' }).max(64),
	/** The mapping version the drill is played on; the newest when left out (the current one when saving). */
	mappingVersion: z
		.number({ error: 'Choose a version of the mapping.' })
		.int({ error: 'Choose a version of the mapping.' })
		.min(1, { error: 'Choose a version of the mapping.' })
		.optional(),
	document: z.unknown()
});

export const HAS_HAND_INS = 'This drill has hand-ins; duplicate it to change it.';

export async function createDrill(db: Database, ownerId: string, input: z.infer<typeof drillInput>) {
	// getMapping refuses a mapping the teacher may not read, and a version that is not the mapping's.
	const m = await getMapping(db, ownerId, input.mappingId, input.mappingVersion);
	const document = checkDrill(input.document, m.document);
	const id = randomUUID();
	await db
		.insert(drill)
		.values({ id, ownerId, mappingId: m.id, mappingVersionId: m.versionId, name: document.name, document });
	return id;
}

/** Whether any student handed in a take of the drill (a submission to one of its assignments). */
export async function hasHandIns(db: Database, drillId: string): Promise<boolean> {
	const [one] = await db
		.select({ id: submission.id })
		.from(submission)
		.innerJoin(assignment, eq(assignment.id, submission.assignmentId))
		.where(eq(assignment.drillId, drillId))
		.limit(1);
	return Boolean(one);
}

/** The document without its name: what a score depends on. */
const scored = (doc: DrillDocument) => JSON.stringify({ ...doc, name: '' });

/**
 * Saves a changed drill on the mapping version chosen; without a version it stays on the one it
 * is played on (or, on another mapping, goes to that mapping's newest). Once the drill has
 * hand-ins only its name may change: scores already handed in were counted against it (409).
 */
export async function updateDrill(db: Database, ownerId: string, id: string, input: z.infer<typeof drillInput>) {
	const row = await ownDrill(db, ownerId, id);
	let version = input.mappingVersion;
	if (version === undefined && input.mappingId === row.mappingId) {
		const [pinned] = await db
			.select({ version: mappingVersion.version })
			.from(mappingVersion)
			.where(eq(mappingVersion.id, row.mappingVersionId));
		version = pinned?.version;
	}
	const m = await getMapping(db, ownerId, input.mappingId, version);
	const document = checkDrill(input.document, m.document);
	const before = parseDrill(row.document);
	const changed = m.versionId !== row.mappingVersionId || !before.ok || scored(before.drill) !== scored(document);
	if (changed && (await hasHandIns(db, id))) throw new Refusal(409, HAS_HAND_INS);
	await db
		.update(drill)
		.set({ mappingId: m.id, mappingVersionId: m.versionId, name: document.name, document })
		.where(eq(drill.id, id));
}

/** A copy of one of the teacher's drills, on the same mapping version, to change freely. */
export async function duplicateDrill(db: Database, ownerId: string, id: string): Promise<string> {
	const row = await ownDrill(db, ownerId, id);
	const doc = row.document as DrillDocument;
	const name = `${doc.name} (copy)`.slice(0, 120);
	const copy = randomUUID();
	await db.insert(drill).values({
		id: copy,
		ownerId,
		mappingId: row.mappingId,
		mappingVersionId: row.mappingVersionId,
		name,
		document: { ...doc, name }
	});
	return copy;
}

/** How much hangs on a drill: its assignments, the takes handed in for them, and how many of those are graded. */
export async function drillUse(db: Pick<Database, 'select'>, id: string) {
	const [{ assignments }] = await db
		.select({ assignments: count() })
		.from(assignment)
		.where(eq(assignment.drillId, id));
	const [{ handIns, graded }] = await db
		.select({ handIns: count(), graded: count(submission.gradedAt) })
		.from(submission)
		.innerJoin(assignment, eq(assignment.id, submission.assignmentId))
		.where(eq(assignment.drillId, id));
	return { assignments, handIns, graded };
}

const plural = (n: number, one: string, many = `${one}s`) => `${n} ${n === 1 ? one : many}`;

/**
 * Deletes a drill with its assignments and the scored takes of it (the sessions stay). Refused
 * while students' hand-ins of it exist: those go only with their assignment, one by one, so a
 * teacher never loses a class's work through the drill.
 */
export async function deleteDrill(db: Database, ownerId: string, id: string) {
	await ownDrill(db, ownerId, id);
	const files = await writeTransaction(db, async (tx) => {
		const [row] = await tx.select({ name: drill.name }).from(drill).where(eq(drill.id, id));
		if (!row) throw new Refusal(404, 'That drill does not exist, or it is not yours.');
		const use = await drillUse(tx, id);
		if (use.handIns)
			throw new Refusal(
				409,
				`Students handed in ${plural(use.handIns, 'take')} for “${row.name}”. ` +
					`Remove its ${plural(use.assignments, 'assignment')} first (on each assignment’s page); then the drill can go.`
			);
		return removeDrills(tx, eq(drill.id, id));
	});
	await removeFiles(files);
}

export async function ownDrill(db: Database, ownerId: string, id: string): Promise<DrillRow> {
	const [row] = await db.select().from(drill).where(eq(drill.id, id));
	if (!row || row.ownerId !== ownerId) throw new Refusal(404, 'That drill does not exist, or it is not yours.');
	return row;
}

export async function listDrills(db: Database, ownerId: string) {
	return db
		.select({
			id: drill.id,
			name: drill.name,
			document: drill.document,
			updatedAt: drill.updatedAt,
			mappingId: drill.mappingId
		})
		.from(drill)
		.where(eq(drill.ownerId, ownerId))
		.orderBy(desc(drill.updatedAt));
}

/** Whether the user may play a drill: its owner, or a member of a class it is assigned to. */
async function mayPlay(db: Database, userId: string, row: DrillRow): Promise<boolean> {
	if (row.ownerId === userId) return true;
	const [via] = await db
		.select({ id: assignment.id })
		.from(assignment)
		.innerJoin(classMember, eq(classMember.classId, assignment.classId))
		.where(and(eq(assignment.drillId, row.id), eq(classMember.userId, userId)))
		.limit(1);
	return Boolean(via);
}

/** The drill with the mapping document version it is played on. */
export async function drillFor(db: Database, userId: string, id: string) {
	const [row] = await db.select().from(drill).where(eq(drill.id, id));
	if (!row || !(await mayPlay(db, userId, row)))
		throw new Refusal(404, 'That drill does not exist, or it is not given to you.');
	return { row, ...(await drillBasis(db, row)) };
}

/** What a take of the drill is scored against: its document and the mapping version it is played on. */
export async function drillBasis(db: Database, row: DrillRow) {
	const [v] = await db.select().from(mappingVersion).where(eq(mappingVersion.id, row.mappingVersionId));
	return {
		document: parseDrill(row.document).ok ? (row.document as DrillDocument) : checkStored(row.document),
		mapping: storedDocument(v.document),
		mappingVersion: v.version,
		mappingVersionId: v.id
	};
}

/** What a drill asks for, in one line a student reads before practising. */
export function drillBrief(doc: unknown): string | null {
	const r = parseDrill(doc);
	if (!r.ok) return null;
	const d = r.drill;
	const bars = (n: number) => `${n} bar${n === 1 ? '' : 's'}`;
	const presses = `${d.targets.length} press${d.targets.length === 1 ? '' : 'es'}`;
	const countIn = d.countInBars ? ` after ${bars(d.countInBars)} of count-in` : '';
	const findings = d.pass.findings === 0 ? 'no findings' : `at most ${d.pass.findings} findings`;
	return (
		`${presses} in ${bars(d.lengthBars)} at ${d.tempo} BPM${countIn}; a press counts within ±${d.windowMs} ms. ` +
		`To pass: ${Math.round(d.pass.hitRate * 100)} % of the presses hit, ${findings}.`
	);
}

function checkStored(doc: unknown): DrillDocument {
	const r = parseDrill(doc);
	if (!r.ok) throw new Refusal(500, 'This drill is stored in a shape Padproof cannot read.');
	return r.drill;
}

/**
 * Scores a session against a drill with beat 0 at `zero` on the session clock (its clock's zero by
 * default), in a worker thread: a long drill takes tens of milliseconds that other requests need.
 */
export function scoreTake(
	d: DrillDocument,
	m: Mapping,
	session: SessionDocument,
	zero = session.clock.zero
): Promise<Score> {
	return scoreOffThread({ drill: d, mapping: m, session, zero });
}

export const takeInput = z.object({
	rehearsalId: z.string().min(1).max(64),
	drillId: z.string().min(1).max(64),
	/**
	 * Where beat 0 of the drill fell, in ms on the session clock. Left out: the session clock's zero.
	 * Given and elsewhere: the session's beat clock is moved there, so that the session document
	 * says where beat 0 is (DESIGN.md §4.8) and scores the same wherever it is scored.
	 */
	zero: z
		.number()
		.min(0)
		.max(24 * 3600 * 1000)
		.optional()
});

/** Records one of the user's own sessions as a try at a drill, and scores it. */
export async function recordTake(db: Database, userId: string, input: z.infer<typeof takeInput>) {
	const d = await drillFor(db, userId, input.drillId);
	let { row, session } = await sessionDocument(db, userId, input.rehearsalId);
	if (input.zero !== undefined && Math.abs(input.zero - session.clock.zero) > 1e-3) {
		if (row.status !== 'saved')
			throw new Refusal(409, 'This session is still being recorded: finish it, then score it as a take.');
		// The beat clock keeps its tempo changes; only where beat 0 lies moves. Findings are counted again.
		await finishRehearsal(db, userId, row.id, undefined, { ...session.clock, zero: input.zero });
		({ row, session } = await sessionDocument(db, userId, input.rehearsalId));
	}
	const zero = session.clock.zero;
	const score = scoreSummary(await scoreTake(d.document, d.mapping, session, zero));
	await db
		.insert(drillTake)
		.values({
			rehearsalId: input.rehearsalId,
			drillId: input.drillId,
			userId,
			zero,
			score,
			hitRate: score.hitRate,
			pass: score.pass
		})
		.onConflictDoUpdate({
			target: drillTake.rehearsalId,
			set: { drillId: input.drillId, zero, score, hitRate: score.hitRate, pass: score.pass }
		});
	return score;
}

export async function takesOf(db: Database, userId: string, drillId: string) {
	const rows = await db
		.select()
		.from(drillTake)
		.where(and(eq(drillTake.userId, userId), eq(drillTake.drillId, drillId)))
		.orderBy(desc(drillTake.createdAt));
	return rows.map((r) => ({ ...r, score: r.score as ScoreSummary }));
}

export async function takeOf(db: Database, rehearsalId: string) {
	const [row] = await db.select().from(drillTake).where(eq(drillTake.rehearsalId, rehearsalId));
	return row ? { ...row, score: row.score as ScoreSummary } : null;
}

/** Classes of a teacher that a drill could be given to. */
export async function classesOf(db: Database, teacherId: string) {
	return db
		.select({ id: schoolClass.id, name: schoolClass.name })
		.from(schoolClass)
		.where(eq(schoolClass.teacherId, teacherId));
}

export async function drillNames(db: Database, ids: string[]) {
	if (!ids.length) return new Map<string, string>();
	const rows = await db.select({ id: drill.id, name: drill.name }).from(drill).where(inArray(drill.id, ids));
	return new Map(rows.map((r) => [r.id, r.name]));
}
