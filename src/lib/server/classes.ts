// Classes: a teacher's own classes, who belongs to them, invitations and join codes, and the
// mappings shared with a class. Every function checks who is asking: a teacher reaches only the
// classes they teach, a student only the classes they joined. Anyone else is told "not found"
// (404), so a class id reveals nothing.
import { and, count, desc, eq, inArray, isNull, max, sql } from 'drizzle-orm';
import { randomBytes, randomUUID } from 'node:crypto';
import { z } from 'zod';
import { removeClasses, removeFiles } from './cleanup';
import { writeTransaction, type Database } from './db';
import {
	assignment,
	classInvite,
	classMapping,
	classMember,
	mapping,
	rehearsal,
	schoolClass,
	submission,
	user
} from './db/schema';
import { Refusal } from './http';
import { sendMail } from './mail';
import { invitationMail } from './mail-messages';

export interface Person {
	id: string;
	name: string;
	email: string;
	role?: string | null;
}

export const className = z
	.string()
	.trim()
	.min(1, { error: 'Give the class a name.' })
	.max(80, { error: 'Keep the class name under 80 characters.' });

export const joinCodeSchema = z
	.string()
	.trim()
	.toUpperCase()
	.regex(/^[A-Z0-9]{4}-?[A-Z0-9]{4}$/, { error: 'A join code looks like ABCD-2345.' })
	.transform((c) => (c.includes('-') ? c : `${c.slice(0, 4)}-${c.slice(4)}`));

export const inviteEmails = z
	.string()
	.transform((s) =>
		s
			.split(/[\s,;]+/)
			.map((x) => x.trim().toLowerCase())
			.filter(Boolean)
	)
	.pipe(
		z
			.array(z.email({ error: 'One of these is not an e-mail address like name@example.com.' }))
			.min(1, { error: 'Enter at least one e-mail address.' })
			.max(50, { error: 'Invite at most 50 people at once.' })
	);

// No 0/O or 1/I: codes are read aloud and copied from a projector (common practice).
const CODE_ALPHABET = 'ABCDEFGHJKLMNPQRSTUVWXYZ23456789';
export function newJoinCode(): string {
	const bytes = randomBytes(8);
	const chars = [...bytes].map((b) => CODE_ALPHABET[b % CODE_ALPHABET.length]);
	return `${chars.slice(0, 4).join('')}-${chars.slice(4).join('')}`;
}

export type ClassRow = typeof schoolClass.$inferSelect;
export const NOT_FOUND = 'That class does not exist, or you are not in it.';

/** The class if the user teaches it; 404 otherwise (a student of it gets 403). */
export async function taughtClass(db: Database, userId: string, classId: string): Promise<ClassRow> {
	const [row] = await db.select().from(schoolClass).where(eq(schoolClass.id, classId));
	if (row?.teacherId === userId) return row;
	if (row && (await isMember(db, classId, userId))) throw new Refusal(403, 'Only the class teacher can do this.');
	throw new Refusal(404, NOT_FOUND);
}

export async function isMember(db: Database, classId: string, userId: string): Promise<boolean> {
	const [m] = await db
		.select({ id: classMember.userId })
		.from(classMember)
		.where(and(eq(classMember.classId, classId), eq(classMember.userId, userId)));
	return Boolean(m);
}

/** The class and how the user stands in it: its teacher or a member; 404 for anyone else. */
export async function classFor(db: Database, userId: string, classId: string) {
	const [row] = await db
		.select({ c: schoolClass, teacher: user.name })
		.from(schoolClass)
		.innerJoin(user, eq(user.id, schoolClass.teacherId))
		.where(eq(schoolClass.id, classId));
	if (!row) throw new Refusal(404, NOT_FOUND);
	if (row.c.teacherId === userId) return { ...row.c, teacher: row.teacher, role: 'teacher' as const };
	if (await isMember(db, classId, userId)) return { ...row.c, teacher: row.teacher, role: 'student' as const };
	throw new Refusal(404, NOT_FOUND);
}

export async function createClass(db: Database, teacherId: string, name: string) {
	const id = randomUUID();
	for (let attempt = 0; ; attempt++) {
		try {
			await db.insert(schoolClass).values({ id, teacherId, name, joinCode: newJoinCode() });
			return id;
		} catch (e) {
			if (attempt > 4) throw e; // a join code collided five times: something else is wrong
		}
	}
}

export async function renameClass(db: Database, teacherId: string, classId: string, name: string) {
	await taughtClass(db, teacherId, classId);
	await db.update(schoolClass).set({ name }).where(eq(schoolClass.id, classId));
}

/** Deletes a class with its members, invitations, shares and assignments (with their submissions and audio). */
export async function deleteClass(db: Database, teacherId: string, classId: string) {
	await taughtClass(db, teacherId, classId);
	await removeFiles(await writeTransaction(db, (tx) => removeClasses(tx, eq(schoolClass.id, classId))));
}

/** The classes a teacher teaches, with how many students and assignments each has. */
export async function taughtClasses(db: Database, teacherId: string) {
	const rows = await db
		.select()
		.from(schoolClass)
		.where(eq(schoolClass.teacherId, teacherId))
		.orderBy(schoolClass.name);
	if (!rows.length) return [];
	const ids = rows.map((r) => r.id);
	const members = await db
		.select({ classId: classMember.classId, n: count() })
		.from(classMember)
		.where(inArray(classMember.classId, ids))
		.groupBy(classMember.classId);
	const tasks = await db
		.select({ classId: assignment.classId, n: count() })
		.from(assignment)
		.where(inArray(assignment.classId, ids))
		.groupBy(assignment.classId);
	const n = (list: { classId: string; n: number }[], id: string) => list.find((x) => x.classId === id)?.n ?? 0;
	return rows.map((r) => ({ ...r, students: n(members, r.id), assignments: n(tasks, r.id) }));
}

/** The classes a student joined. */
export async function joinedClasses(db: Database, userId: string) {
	return db
		.select({ id: schoolClass.id, name: schoolClass.name, teacher: user.name, joinedAt: classMember.joinedAt })
		.from(classMember)
		.innerJoin(schoolClass, eq(schoolClass.id, classMember.classId))
		.innerJoin(user, eq(user.id, schoolClass.teacherId))
		.where(eq(classMember.userId, userId))
		.orderBy(schoolClass.name);
}

async function addMember(db: Database, classId: string, userId: string) {
	await db.insert(classMember).values({ classId, userId }).onConflictDoNothing();
}

export async function joinByCode(db: Database, userId: string, code: string) {
	const [row] = await db.select().from(schoolClass).where(eq(schoolClass.joinCode, code));
	if (!row) throw new Refusal(404, 'No class has this join code. Check it with your teacher.');
	if (row.teacherId === userId) throw new Refusal(400, 'You teach this class; students join it with this code.');
	await addMember(db, row.id, userId);
	return row;
}

/** Invites people by e-mail: one link each, which signs them up or in and joins them. */
export async function inviteByEmail(db: Database, teacher: Person, classId: string, emails: string[], origin: string) {
	const c = await taughtClass(db, teacher.id, classId);
	const sent: string[] = [];
	for (const email of new Set(emails)) {
		const token = randomBytes(24).toString('base64url');
		await db.insert(classInvite).values({ token, classId, email });
		await sendMail(
			invitationMail({ to: email, teacher: teacher.name, className: c.name, url: `${origin}/join/${token}` })
		);
		sent.push(email);
	}
	return sent;
}

export async function invitation(db: Database, token: string) {
	if (!/^[\w-]{10,64}$/.test(token)) return null;
	const [row] = await db
		.select({ invite: classInvite, className: schoolClass.name, teacher: user.name })
		.from(classInvite)
		.innerJoin(schoolClass, eq(schoolClass.id, classInvite.classId))
		.innerJoin(user, eq(user.id, schoolClass.teacherId))
		.where(eq(classInvite.token, token));
	return row ?? null;
}

/** Accepts an invitation for the signed-in user, whose e-mail must be the invited one. */
export async function acceptInvitation(db: Database, who: Person, token: string) {
	const found = await invitation(db, token);
	if (!found) throw new Refusal(404, 'This invitation link is not valid. Ask your teacher for a new one.');
	const { invite } = found;
	if (invite.acceptedBy && invite.acceptedBy !== who.id)
		throw new Refusal(410, 'This invitation has been used already. Ask your teacher for a new one.');
	if (invite.email.toLowerCase() !== who.email.toLowerCase())
		throw new Refusal(
			403,
			`This invitation was sent to ${invite.email}, but you are signed in as ${who.email}. Sign in with the invited address.`
		);
	await addMember(db, invite.classId, who.id);
	await db
		.update(classInvite)
		.set({ acceptedAt: new Date(), acceptedBy: who.id })
		.where(and(eq(classInvite.token, token), isNull(classInvite.acceptedBy)));
	return invite.classId;
}

/**
 * Where to go after signing up or in. Coming from an invitation link (`next` is /join/<token>)
 * sent to this account's address, the person joins the class there and then, and goes to it with
 * a "you joined" message; any other case keeps `next` (the invitation page then explains).
 */
export async function joinAfterSignIn(db: Database, who: Person, next: string): Promise<string> {
	const token = /^\/join\/([\w-]{10,64})$/.exec(next)?.[1];
	if (!token) return next;
	const found = await invitation(db, token);
	if (!found || found.invite.email.toLowerCase() !== who.email.toLowerCase()) return next;
	try {
		return `/classes/${await acceptInvitation(db, who, token)}?joined=1`;
	} catch (e) {
		if (e instanceof Refusal) return next;
		throw e;
	}
}

export async function pendingInvites(db: Database, classId: string) {
	return db
		.select({ email: classInvite.email, createdAt: classInvite.createdAt })
		.from(classInvite)
		.where(and(eq(classInvite.classId, classId), isNull(classInvite.acceptedBy)))
		.orderBy(desc(classInvite.createdAt));
}

export async function removeMember(db: Database, teacherId: string, classId: string, userId: string) {
	await taughtClass(db, teacherId, classId);
	await db.delete(classMember).where(and(eq(classMember.classId, classId), eq(classMember.userId, userId)));
}

/** Name, e-mail, last practice and average score (mean hit rate of their submissions here). */
export async function roster(db: Database, classId: string) {
	const people = await db
		.select({ id: user.id, name: user.name, email: user.email, joinedAt: classMember.joinedAt })
		.from(classMember)
		.innerJoin(user, eq(user.id, classMember.userId))
		.where(eq(classMember.classId, classId))
		.orderBy(user.name);
	if (!people.length) return [];
	const ids = people.map((p) => p.id);
	const practice = await db
		.select({ userId: rehearsal.ownerId, last: max(rehearsal.createdAt) })
		.from(rehearsal)
		.where(inArray(rehearsal.ownerId, ids))
		.groupBy(rehearsal.ownerId);
	const scores = await db
		.select({ userId: submission.studentId, avg: sql<number>`avg(${submission.hitRate})`, n: count() })
		.from(submission)
		.innerJoin(assignment, eq(assignment.id, submission.assignmentId))
		.where(and(eq(assignment.classId, classId), inArray(submission.studentId, ids)))
		.groupBy(submission.studentId);
	return people.map((p) => {
		const last = practice.find((x) => x.userId === p.id)?.last ?? null;
		const s = scores.find((x) => x.userId === p.id);
		return {
			...p,
			lastPractice: last ? new Date(last as unknown as number) : null,
			averageScore: s ? Number(s.avg) : null,
			submissions: s?.n ?? 0
		};
	});
}

// ---- Mappings shared with a class ----

export async function shareMapping(db: Database, teacherId: string, classId: string, mappingId: string) {
	await taughtClass(db, teacherId, classId);
	const [m] = await db.select().from(mapping).where(eq(mapping.id, mappingId));
	if (!m || (m.ownerId !== teacherId && m.visibility !== 'public'))
		throw new Refusal(404, 'That mapping does not exist, or it is private to someone else.');
	await db.insert(classMapping).values({ classId, mappingId }).onConflictDoNothing();
}

export async function unshareMapping(db: Database, teacherId: string, classId: string, mappingId: string) {
	await taughtClass(db, teacherId, classId);
	await db.delete(classMapping).where(and(eq(classMapping.classId, classId), eq(classMapping.mappingId, mappingId)));
}

export async function sharedMappings(db: Database, classId: string) {
	return db
		.select({ id: mapping.id, name: mapping.name, version: mapping.currentVersion })
		.from(classMapping)
		.innerJoin(mapping, eq(mapping.id, classMapping.mappingId))
		.where(eq(classMapping.classId, classId))
		.orderBy(mapping.name);
}

/**
 * Whether a mapping is shared with a class the user is in by the class teacher who owns it. A mapping of
 * someone else, shared while it was public, is no longer reachable this way once its owner makes
 * it private: the owner's choice wins over an earlier share.
 */
export async function sharedWith(db: Database, userId: string, mappingId: string): Promise<boolean> {
	const ownerTeaches = and(eq(classMapping.mappingId, mappingId), eq(mapping.ownerId, schoolClass.teacherId));
	const [shared] = await db
		.select({ id: classMapping.mappingId })
		.from(classMapping)
		.innerJoin(mapping, eq(mapping.id, classMapping.mappingId))
		.innerJoin(schoolClass, eq(schoolClass.id, classMapping.classId))
		.innerJoin(classMember, eq(classMember.classId, classMapping.classId))
		.where(and(ownerTeaches, eq(classMember.userId, userId)))
		.limit(1);
	return Boolean(shared);
}
