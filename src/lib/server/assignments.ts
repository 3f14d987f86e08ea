// Assignments (a drill given to a class with a due date), submissions (one of the student's
// scored takes of it, plus an optional audio file) and the teacher's review. Privacy: a student
// reaches only their own submissions; a teacher reaches a student's session only through a
// submission to a class they teach. Everyone else is told "not found".
import { parseDrill, scoreSummary, type DrillDocument, type ScoreSummary } from '$lib/engine';
import type { GradebookRow } from '$lib/teaching';
import { and, asc, count, desc, eq, inArray } from 'drizzle-orm';
import { randomUUID } from 'node:crypto';
import { z } from 'zod';
import { classFor, shareMapping, taughtClass, type Person } from './classes';
import { removeAssignments, removeFiles } from './cleanup';
import { writeTransaction, type Database } from './db';
import {
	assignment,
	classMember,
	drill,
	drillTake,
	mappingVersion,
	rehearsal,
	schoolClass,
	submission,
	user
} from './db/schema';
import { drillBasis, ownDrill, scoreTake } from './drills';
import { Refusal } from './http';
import { sendMail } from './mail';
import { assignmentMail, feedbackMail, submissionMail } from './mail-messages';
import { storedDocument } from './mappings';
import { getRehearsal, sessionDocument } from './rehearsals';

export const NO_SUBMISSION = 'That submission does not exist, or it is not yours to see.';

export const assignmentInput = z.object({
	drillId: z.string().min(1, { error: 'Choose a drill.' }).max(64),
	due: z.string().regex(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}/, { error: 'Give a due date and time.' })
});

export const reviewInput = z.object({
	grade: z.string().trim().min(1, { error: 'Give a grade.' }).max(20, { error: 'Keep the grade under 20 characters.' }),
	comment: z.string().trim().max(4000, { error: 'Keep the comment under 4,000 characters.' })
});

export async function createAssignment(
	db: Database,
	teacher: Person,
	classId: string,
	input: { drillId: string; dueAt: Date },
	origin: string
) {
	const c = await taughtClass(db, teacher.id, classId);
	const d = await ownDrill(db, teacher.id, input.drillId);
	const id = randomUUID();
	await db.insert(assignment).values({ id, classId, drillId: d.id, dueAt: input.dueAt });
	// The students need the mapping the drill is played on.
	await shareMapping(db, teacher.id, classId, d.mappingId);
	const members = await db
		.select({ name: user.name, email: user.email })
		.from(classMember)
		.innerJoin(user, eq(user.id, classMember.userId))
		.where(eq(classMember.classId, classId));
	for (const m of members)
		await sendMail(
			assignmentMail({
				to: m.email,
				name: m.name,
				className: c.name,
				drill: d.name,
				due: input.dueAt,
				url: `${origin}/assignments/${id}`
			})
		);
	return id;
}

/** How many takes were handed in for an assignment, and how many of them are graded. */
export async function handInsOf(db: Pick<Database, 'select'>, id: string) {
	const [{ handIns, graded }] = await db
		.select({ handIns: count(), graded: count(submission.gradedAt) })
		.from(submission)
		.where(eq(submission.assignmentId, id));
	return { handIns, graded };
}

/**
 * Deletes an assignment with the submissions handed in for it and their audio files (the students'
 * sessions stay). Graded work goes only when the teacher confirmed that many graded hand-ins
 * (`confirmedGraded`, the number the confirmation named): a grade given since is not lost unseen.
 */
export async function deleteAssignment(db: Database, teacherId: string, id: string, confirmedGraded = 0) {
	const a = await assignmentFor(db, teacherId, id);
	if (a.role !== 'teacher') throw new Refusal(403, 'Only the class teacher can do this.');
	const files = await writeTransaction(db, async (tx) => {
		const { graded } = await handInsOf(tx, id);
		if (graded > confirmedGraded)
			throw new Refusal(
				409,
				`${graded} graded hand-in${graded === 1 ? '' : 's'} of “${a.drill.name}” would go with this assignment, ` +
					`with ${graded === 1 ? 'its grade and comment' : 'their grades and comments'}. Confirm deleting ${graded === 1 ? 'it' : 'them'} to go on.`
			);
		return removeAssignments(tx, eq(assignment.id, id));
	});
	await removeFiles(files);
	return { classId: a.classId };
}

export async function classAssignments(db: Database, classId: string) {
	return db
		.select({
			id: assignment.id,
			dueAt: assignment.dueAt,
			drillId: drill.id,
			drill: drill.name,
			createdAt: assignment.createdAt
		})
		.from(assignment)
		.innerJoin(drill, eq(drill.id, assignment.drillId))
		.where(eq(assignment.classId, classId))
		.orderBy(asc(assignment.dueAt));
}

/** What is given to a student across their classes, with their submission's state. */
export async function assignmentsOf(db: Database, studentId: string) {
	const rows = await db
		.select({
			id: assignment.id,
			dueAt: assignment.dueAt,
			drill: drill.name,
			classId: schoolClass.id,
			className: schoolClass.name
		})
		.from(classMember)
		.innerJoin(assignment, eq(assignment.classId, classMember.classId))
		.innerJoin(schoolClass, eq(schoolClass.id, classMember.classId))
		.innerJoin(drill, eq(drill.id, assignment.drillId))
		.where(eq(classMember.userId, studentId))
		.orderBy(asc(assignment.dueAt));
	if (!rows.length) return [];
	const subs = await db
		.select()
		.from(submission)
		.where(
			and(
				eq(submission.studentId, studentId),
				inArray(
					submission.assignmentId,
					rows.map((r) => r.id)
				)
			)
		);
	return rows.map((r) => {
		const s = subs.find((x) => x.assignmentId === r.id);
		return {
			...r,
			submission: s
				? { id: s.id, submittedAt: s.submittedAt, late: s.late, hitRate: s.hitRate, pass: s.pass, grade: s.grade }
				: null
		};
	});
}

/** The assignment and how the user stands in its class; 404 for anyone outside it. */
export async function assignmentFor(db: Database, userId: string, id: string) {
	const [row] = await db
		.select({ a: assignment, d: drill })
		.from(assignment)
		.innerJoin(drill, eq(drill.id, assignment.drillId))
		.where(eq(assignment.id, id));
	if (!row) throw new Refusal(404, 'That assignment does not exist, or it is not given to you.');
	const c = await classFor(db, userId, row.a.classId).catch(() => {
		throw new Refusal(404, 'That assignment does not exist, or it is not given to you.');
	});
	return { ...row.a, drill: row.d, className: c.name, teacher: c.teacher, teacherId: c.teacherId, role: c.role };
}

/**
 * Hands in one of the student's scored takes of the assignment's drill; a new one replaces an
 * ungraded one. The take is scored again against the drill as it stands (it may have changed since
 * the take), and the submission keeps what its score was counted against: beat 0, the drill
 * document and the mapping version. Once a drill has hand-ins it no longer changes (updateDrill).
 */
export async function submit(
	db: Database,
	student: Person,
	assignmentId: string,
	rehearsalId: string,
	audio: { file: string; type: string } | null,
	origin: string,
	now = new Date()
) {
	const a = await assignmentFor(db, student.id, assignmentId);
	if (a.role !== 'student') throw new Refusal(403, 'Only students of the class hand in takes.');
	const [take] = await db
		.select({ take: drillTake, owner: rehearsal.ownerId, deletedAt: rehearsal.deletedAt })
		.from(drillTake)
		.innerJoin(rehearsal, eq(rehearsal.id, drillTake.rehearsalId))
		.where(eq(drillTake.rehearsalId, rehearsalId));
	if (!take || take.owner !== student.id || take.take.drillId !== a.drillId)
		throw new Refusal(400, 'Choose one of your own takes of this drill.');
	if (take.deletedAt) throw new Refusal(400, 'That take is in the trash. Restore it from the trash to hand it in.');
	const [existing] = await db
		.select()
		.from(submission)
		.where(and(eq(submission.assignmentId, assignmentId), eq(submission.studentId, student.id)));
	if (existing?.gradedAt) throw new Refusal(409, 'Your teacher has graded this assignment already; it is closed.');
	const late = now.getTime() > a.dueAt.getTime();
	const basis = await drillBasis(db, a.drill);
	const { session } = await sessionDocument(db, student.id, rehearsalId);
	const score = scoreSummary(await scoreTake(basis.document, basis.mapping, session, take.take.zero));
	if (JSON.stringify(score) !== JSON.stringify(take.take.score))
		await db
			.update(drillTake)
			.set({ score, hitRate: score.hitRate, pass: score.pass })
			.where(eq(drillTake.rehearsalId, rehearsalId));
	const values = {
		rehearsalId,
		submittedAt: now,
		late,
		score,
		hitRate: score.hitRate,
		pass: score.pass,
		zero: take.take.zero,
		drillDocument: basis.document,
		mappingVersionId: basis.mappingVersionId,
		audioFile: audio?.file ?? null,
		audioType: audio?.type ?? null
	};
	const id = existing?.id ?? randomUUID();
	if (existing) await db.update(submission).set(values).where(eq(submission.id, id));
	else await db.insert(submission).values({ id, assignmentId, studentId: student.id, ...values });
	const [teacher] = await db.select().from(user).where(eq(user.id, a.teacherId));
	await sendMail(
		submissionMail({
			to: teacher.email,
			teacher: teacher.name,
			student: student.name,
			drill: a.drill.name,
			late,
			url: `${origin}/submissions/${id}`
		})
	);
	return { id, late, previousAudio: existing?.audioFile ?? null };
}

/** A submission as its student or its class teacher sees it; 404 for everyone else. */
export async function submissionFor(db: Database, userId: string, id: string) {
	const [row] = await db
		.select({ s: submission, a: assignment, d: drill, c: schoolClass, student: user })
		.from(submission)
		.innerJoin(assignment, eq(assignment.id, submission.assignmentId))
		.innerJoin(drill, eq(drill.id, assignment.drillId))
		.innerJoin(schoolClass, eq(schoolClass.id, assignment.classId))
		.innerJoin(user, eq(user.id, submission.studentId))
		.where(eq(submission.id, id));
	const role = !row ? null : row.c.teacherId === userId ? 'teacher' : row.s.studentId === userId ? 'student' : null;
	if (!row || !role) throw new Refusal(404, NO_SUBMISSION);
	// A student who left the class keeps seeing their own work; nothing else changes.
	return {
		...row.s,
		score: row.s.score as ScoreSummary,
		assignment: row.a,
		drill: row.d,
		class: { id: row.c.id, name: row.c.name },
		student: { id: row.student.id, name: row.student.name, email: row.student.email },
		role: role as 'teacher' | 'student'
	};
}

/**
 * The submission's score worked out target by target, against what its stored score was counted
 * against (beat 0, drill document, mapping version), so it always agrees with the stored score.
 * Hand-ins from before that was kept fall back to the take's beat 0 and the drill as it stands.
 */
export async function submissionBreakdown(db: Database, userId: string, id: string) {
	const s = await submissionFor(db, userId, id);
	// Access was granted through the submission: read the session as its owner would.
	const { row, session } = await getRehearsal(db, s.studentId, s.rehearsalId);
	const parsed = parseDrill(s.drillDocument ?? s.drill.document);
	const drillDoc: DrillDocument | null = parsed.ok ? parsed.drill : null;
	const [v] = await db
		.select()
		.from(mappingVersion)
		.where(eq(mappingVersion.id, s.mappingVersionId ?? s.drill.mappingVersionId));
	const mapping = v ? storedDocument(v.document) : null;
	let zero = s.zero;
	if (zero === null) {
		const [take] = await db.select().from(drillTake).where(eq(drillTake.rehearsalId, s.rehearsalId));
		zero = take?.zero ?? 0;
	}
	const detail = drillDoc && mapping ? await scoreTake(drillDoc, mapping, session, zero) : null;
	return { submission: s, row, session, drill: drillDoc, mapping, zero, detail };
}

export async function review(
	db: Database,
	teacher: Person,
	id: string,
	input: z.infer<typeof reviewInput>,
	origin: string
) {
	const s = await submissionFor(db, teacher.id, id);
	if (s.role !== 'teacher') throw new Refusal(403, 'Only the class teacher grades submissions.');
	await db
		.update(submission)
		.set({ grade: input.grade, comment: input.comment || null, gradedAt: new Date() })
		.where(eq(submission.id, id));
	await sendMail(
		feedbackMail({
			to: s.student.email,
			name: s.student.name,
			teacher: teacher.name,
			drill: s.drill.name,
			grade: input.grade,
			url: `${origin}/submissions/${id}`
		})
	);
}

/** Submissions of one assignment, for its teacher. */
export async function assignmentSubmissions(db: Database, assignmentId: string) {
	return db
		.select({
			id: submission.id,
			student: user.name,
			email: user.email,
			submittedAt: submission.submittedAt,
			late: submission.late,
			hitRate: submission.hitRate,
			pass: submission.pass,
			grade: submission.grade
		})
		.from(submission)
		.innerJoin(user, eq(user.id, submission.studentId))
		.where(eq(submission.assignmentId, assignmentId))
		.orderBy(desc(submission.submittedAt));
}

export type { GradebookRow } from '$lib/teaching';

/**
 * One row per student and assignment of a class, submitted or not. Teacher only. Students who
 * left the class stay, marked `left`, with a row for each assignment, as long as they handed
 * something in here.
 */
export async function gradebook(db: Database, teacherId: string, classId: string): Promise<GradebookRow[]> {
	await taughtClass(db, teacherId, classId);
	const [members, tasks] = await Promise.all([
		db
			.select({ id: user.id, name: user.name, email: user.email })
			.from(classMember)
			.innerJoin(user, eq(user.id, classMember.userId))
			.where(eq(classMember.classId, classId)),
		classAssignments(db, classId)
	]);
	const subs = tasks.length
		? await db
				.select()
				.from(submission)
				.where(
					inArray(
						submission.assignmentId,
						tasks.map((t) => t.id)
					)
				)
		: [];
	const memberIds = new Set(members.map((m) => m.id));
	const formerIds = [...new Set(subs.map((s) => s.studentId))].filter((id) => !memberIds.has(id));
	const former = formerIds.length
		? await db.select({ id: user.id, name: user.name, email: user.email }).from(user).where(inArray(user.id, formerIds))
		: [];
	const people = [...members.map((p) => ({ ...p, left: false })), ...former.map((p) => ({ ...p, left: true }))].sort(
		(a, b) => (a.name < b.name ? -1 : a.name > b.name ? 1 : a.email < b.email ? -1 : 1)
	);
	const rows: GradebookRow[] = [];
	for (const p of people)
		for (const t of tasks) {
			const s = subs.find((x) => x.assignmentId === t.id && x.studentId === p.id);
			const score = s?.score as ScoreSummary | undefined;
			rows.push({
				student: p.name,
				email: p.email,
				assignment: t.drill,
				due: t.dueAt.toISOString(),
				submitted: s ? s.submittedAt.toISOString() : null,
				late: s ? s.late : null,
				hitRate: s ? s.hitRate : null,
				meanAbsMs: score?.meanAbsMs ?? null,
				findings: score?.findings ?? null,
				pass: s ? s.pass : null,
				grade: s?.grade ?? null,
				comment: s?.comment ?? null,
				submissionId: s?.id ?? null,
				left: p.left
			});
		}
	return rows;
}
