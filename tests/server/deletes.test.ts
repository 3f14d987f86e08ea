// Deletes never lose or break what a teacher or student handed in, graded or relies on, and give the
// same result with SQLite's foreign keys off (a per-connection setting: a remote libSQL database
// or a connection opened outside prepareDatabase may have them off). Every scene here runs on one
// connection with `PRAGMA foreign_keys = OFF` and ends with SQLite's own orphan check.
import { padId, type SessionEvent } from '$lib/engine';
import { createAssignment, deleteAssignment, handInsOf, review, submissionFor, submit } from '$lib/server/assignments';
import { createClass, deleteClass, joinByCode, shareMapping } from '$lib/server/classes';
import type { Database } from '$lib/server/db';
import {
	assignment,
	classInvite,
	classMapping,
	classMember,
	controllerLayout,
	drill,
	drillTake,
	mapping,
	mappingVersion,
	rehearsal,
	rehearsalChunk,
	schoolClass,
	submission
} from '$lib/server/db/schema';
import { createDrill, deleteDrill, drillUse, recordTake } from '$lib/server/drills';
import { createMapping, deleteMapping, listMappings, setVisibility } from '$lib/server/mappings';
import { attachAudio, deleteRehearsal, getRehearsal, importSession } from '$lib/server/rehearsals';
import { serialWrite } from '$lib/server/db';
import { incomingDir, uploadStore } from '$lib/server/storage';
import { emptyExpiredTrash } from '$lib/server/trash-purge';
import { listTrash, purgeTrash } from '$lib/server/trash';
import { deleteAccountData, heirFor, lastAdminProblem, listUsers } from '$lib/server/users';
import { demoMapping } from '$lib/engine';
import { eq } from 'drizzle-orm';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { demoDatabase, withoutForeignKeys } from './factories';

let t: Awaited<ReturnType<typeof demoDatabase>>;
let off: Awaited<ReturnType<typeof withoutForeignKeys>>;
let db: Database;
let scratch = '';
let people: Awaited<ReturnType<typeof listUsers>>;
const ORIGIN = 'http://padproof.test';
const who = (email: string) => people.find((p) => p.email === email)!;
const DAY = 24 * 60 * 60 * 1000;
const later = (days: number) => new Date(Date.now() + days * DAY);

beforeEach(async () => {
	scratch = mkdtempSync(join(tmpdir(), 'padproof-deletes-'));
	process.env.MAIL_OUTBOX_DIR = join(scratch, 'outbox');
	process.env.UPLOADS_DIR = join(scratch, 'uploads');
	t = await demoDatabase();
	off = await withoutForeignKeys(t.file);
	db = off.db;
	people = await listUsers(db);
	// Without the seeded demo class, so that every table holds only what a test made.
	for (const table of [assignment, classMapping, classMember, drill, schoolClass]) await t.db.delete(table);
}, 30_000);
afterEach(() => {
	off.client.close();
	t.close();
	rmSync(scratch, { recursive: true, force: true });
	delete process.env.MAIL_OUTBOX_DIR;
	delete process.env.UPLOADS_DIR;
});

const drillDoc = {
	version: 1,
	name: 'Four on the floor',
	tempo: 120,
	countInBars: 1,
	lengthBars: 1,
	targets: [0, 1, 2, 3].map((beat) => ({ input: padId(1), beat, beats: 0.5 }))
};
const tap = (at: number): SessionEvent[] => [
	{ t: at, input: { input: padId(1), type: 'press' } },
	{ t: at + 250, input: { input: padId(1), type: 'release' } }
];

/** A file in the upload store, as an upload leaves it. */
async function storedFile(name: string) {
	const temp = join(incomingDir(), `${name}.part`);
	writeFileSync(temp, 'not really audio');
	await uploadStore().put(temp, name, 'audio/webm');
	return name;
}
const stored = async () => (await uploadStore().list()).sort();

/** Someone plays the drill once (a scored take). */
async function take(userId: string, mappingId: string, drillId: string) {
	const id = await importSession(db, userId, mappingId, {
		version: 1,
		tempo: 120,
		startedAt: new Date().toISOString(),
		events: [...tap(2010), ...tap(2510)]
	});
	await recordTake(db, userId, { rehearsalId: id, drillId, zero: 2000 });
	return id;
}

/** Tomas's class with Kai in it, a drill given to it, and Kai's take handed in with an audio file. */
async function scene() {
	const tomas = who('tomas@mixlab.example');
	const kai = who('kai@mixlab.example');
	const classId = await createClass(db, tomas.id, 'Tuesday beginners');
	const [c] = await db.select().from(schoolClass).where(eq(schoolClass.id, classId));
	await joinByCode(db, kai.id, c.joinCode);
	const mappingId = (await listMappings(db, tomas.id)).find((m) => m.name === 'Two-deck pad set')!.id;
	const drillId = await createDrill(db, tomas.id, { mappingId, document: drillDoc });
	const assignmentId = await createAssignment(
		db,
		tomas,
		classId,
		{ drillId, dueAt: new Date(Date.now() + DAY) },
		ORIGIN
	);
	const takeId = await take(kai.id, mappingId, drillId);
	const audio = await storedFile('submission-kai.webm');
	const sub = await submit(db, kai, assignmentId, takeId, { file: audio, type: 'audio/webm' }, ORIGIN);
	return { tomas, kai, classId, mappingId, drillId, assignmentId, takeId, submissionId: sub.id, audio };
}

describe('with foreign keys off', { timeout: 30_000 }, () => {
	it('the connection really has them off: a parent row deleted alone leaves orphans', async () => {
		const { drillId } = await scene();
		await db.delete(drill).where(eq(drill.id, drillId));
		expect(await off.orphans()).toContain('assignment → drill');
	});

	it('deleting an assignment removes its submissions and their audio; the student’s session stays', async () => {
		const { tomas, assignmentId, takeId, audio, kai } = await scene();
		expect(await stored()).toEqual([audio]);
		await deleteAssignment(db, tomas.id, assignmentId);
		expect(await db.select().from(assignment)).toEqual([]);
		expect(await db.select().from(submission)).toEqual([]);
		expect(await stored()).toEqual([]);
		expect((await getRehearsal(db, kai.id, takeId)).row.id).toBe(takeId);
		expect(await off.orphans()).toEqual([]);
	});

	it('deleting a class removes members, invitations, shares, assignments and hand-ins with their audio', async () => {
		const { tomas, classId, mappingId, drillId } = await scene();
		await db.insert(classInvite).values({ token: 'invite-token-1234', classId, email: 'new@mixlab.example' });
		await shareMapping(db, tomas.id, classId, mappingId);
		await deleteClass(db, tomas.id, classId);
		for (const table of [schoolClass, classMember, classInvite, classMapping, assignment, submission])
			expect(await db.select().from(table)).toEqual([]);
		expect(await stored()).toEqual([]);
		// The drill and the mapping are the teacher's, not the class's.
		expect(await db.select({ id: drill.id }).from(drill)).toEqual([{ id: drillId }]);
		expect(await off.orphans()).toEqual([]);
	});

	it('deleting a drill nobody handed in removes its assignments and the scored takes of it', async () => {
		const tomas = who('tomas@mixlab.example');
		const kai = who('kai@mixlab.example');
		const classId = await createClass(db, tomas.id, 'Thursday');
		const [c] = await db.select().from(schoolClass).where(eq(schoolClass.id, classId));
		await joinByCode(db, kai.id, c.joinCode);
		const mappingId = (await listMappings(db, tomas.id)).find((m) => m.name === 'Two-deck pad set')!.id;
		const drillId = await createDrill(db, tomas.id, { mappingId, document: drillDoc });
		await createAssignment(db, tomas, classId, { drillId, dueAt: later(1) }, ORIGIN);
		const takeId = await take(kai.id, mappingId, drillId);
		expect(await drillUse(db, drillId)).toEqual({ assignments: 1, handIns: 0, graded: 0 });

		await deleteDrill(db, tomas.id, drillId);
		for (const table of [drill, assignment, drillTake]) expect(await db.select().from(table)).toEqual([]);
		expect((await getRehearsal(db, kai.id, takeId)).row.id).toBe(takeId);
		expect(await off.orphans()).toEqual([]);
	});

	it('purging the trash removes a session’s events and scored takes, and a mapping’s versions and shares', async () => {
		const tomas = who('tomas@mixlab.example');
		const mappingId = (await listMappings(db, tomas.id)).find((m) => m.name === 'Two-deck pad set')!.id;
		const drillId = await createDrill(db, tomas.id, { mappingId, document: drillDoc });
		const takeId = await take(tomas.id, mappingId, drillId);
		const audio = await storedFile(`${takeId}-take.webm`);
		await attachAudio(db, tomas.id, takeId, audio, 'audio/webm', 16);
		await deleteRehearsal(db, tomas.id, takeId);

		const scratchMapping = await createMapping(db, tomas.id, { document: demoMapping('two-deck'), name: 'Scratch' });
		const classId = await createClass(db, tomas.id, 'Friday');
		await shareMapping(db, tomas.id, classId, scratchMapping);
		await deleteMapping(db, tomas.id, scratchMapping);

		expect(await emptyExpiredTrash(db, later(31))).toMatchObject({ sessions: 1, mappings: 1 });
		expect(await db.select().from(rehearsal).where(eq(rehearsal.id, takeId))).toEqual([]);
		expect(await db.select().from(rehearsalChunk).where(eq(rehearsalChunk.rehearsalId, takeId))).toEqual([]);
		expect(await db.select().from(drillTake)).toEqual([]);
		expect(await db.select().from(mappingVersion).where(eq(mappingVersion.mappingId, scratchMapping))).toEqual([]);
		expect(await db.select().from(classMapping)).toEqual([]);
		expect(await stored()).toEqual([]);
		expect(await off.orphans()).toEqual([]);
	});

	it('deleting a teacher’s account data removes their classes, drills and the hand-ins to them, with the audio', async () => {
		const { tomas } = await scene();
		await db.insert(controllerLayout).values({ id: 'layout-1', ownerId: tomas.id, name: 'Mine', profile: {} });
		await deleteAccountData(db, tomas.id, await heirFor(db, tomas.id));
		for (const table of [schoolClass, classMember, drill, assignment, submission, drillTake, controllerLayout])
			expect(await db.select().from(table)).toEqual([]);
		expect(await stored()).toEqual([]);
		expect(await off.orphans()).toEqual([]);
	});

	it('deleting a student’s account data removes what they handed in, their takes and memberships', async () => {
		const { kai, drillId } = await scene();
		await deleteAccountData(db, kai.id, await heirFor(db, kai.id));
		for (const table of [classMember, submission, drillTake]) expect(await db.select().from(table)).toEqual([]);
		expect(await db.select().from(rehearsal).where(eq(rehearsal.ownerId, kai.id))).toEqual([]);
		expect(await stored()).toEqual([]);
		expect(await db.select({ id: drill.id }).from(drill)).toEqual([{ id: drillId }]);
		expect(await off.orphans()).toEqual([]);
	});
});

describe('a take handed in for an assignment', { timeout: 30_000 }, () => {
	it('cannot be trashed or deleted by its student while the assignment keeps it; the teacher’s review keeps working', async () => {
		const { tomas, kai, takeId, submissionId, assignmentId } = await scene();
		const refusal = await deleteRehearsal(db, kai.id, takeId).catch((e) => e);
		expect(refusal).toMatchObject({
			status: 409,
			message: 'This take was handed in for “Four on the floor”; it stays while the class keeps it.'
		});
		expect(await listTrash(db, kai.id)).toEqual([]);
		expect((await submissionFor(db, tomas.id, submissionId)).rehearsalId).toBe(takeId);
		expect((await getRehearsal(db, kai.id, takeId)).row.deletedAt).toBeNull();

		// Once the teacher removes the assignment, the take is the student's to delete.
		await deleteAssignment(db, tomas.id, assignmentId);
		await deleteRehearsal(db, kai.id, takeId);
		expect((await listTrash(db, kai.id)).map((i) => i.id)).toEqual([takeId]);
	});

	it('trashed before this rule, is taken out of the trash by the purge, with its submission', async () => {
		const { tomas, kai, takeId, submissionId } = await scene();
		await db.update(rehearsal).set({ deletedAt: new Date() }).where(eq(rehearsal.id, takeId));
		expect(await purgeTrash(db, later(31))).toMatchObject({ sessions: 0 });
		expect((await submissionFor(db, tomas.id, submissionId)).id).toBe(submissionId);
		expect((await getRehearsal(db, kai.id, takeId)).row.deletedAt).toBeNull();
	});

	it('cannot be handed in from the trash', async () => {
		const { kai, assignmentId, mappingId, drillId } = await scene();
		const other = await take(kai.id, mappingId, drillId);
		await deleteRehearsal(db, kai.id, other);
		const refusal = await submit(db, kai, assignmentId, other, null, ORIGIN).catch((e) => e);
		expect(refusal).toMatchObject({
			status: 400,
			message: 'That take is in the trash. Restore it from the trash to hand it in.'
		});
	});
});

describe('deleting a drill or an assignment with hand-ins', { timeout: 30_000 }, () => {
	it('refuses to delete a drill while hand-ins of it exist, saying what to do', async () => {
		const { tomas, drillId, assignmentId } = await scene();
		expect(await drillUse(db, drillId)).toEqual({ assignments: 1, handIns: 1, graded: 0 });
		const refusal = await deleteDrill(db, tomas.id, drillId).catch((e) => e);
		expect(refusal).toMatchObject({ status: 409 });
		expect(refusal.message).toBe(
			'Students handed in 1 take for “Four on the floor”. Remove its 1 assignment first (on each assignment’s page); then the drill can go.'
		);
		expect(await db.select({ id: assignment.id }).from(assignment)).toEqual([{ id: assignmentId }]);
		expect(await db.select().from(submission)).toHaveLength(1);

		await deleteAssignment(db, tomas.id, assignmentId);
		await deleteDrill(db, tomas.id, drillId);
		expect(await db.select().from(drill)).toEqual([]);
	});

	it('deletes an assignment with graded hand-ins only when that many were confirmed', async () => {
		const { tomas, assignmentId, submissionId } = await scene();
		await review(db, tomas, submissionId, { grade: 'B+', comment: 'Steady.' }, ORIGIN);
		expect(await handInsOf(db, assignmentId)).toEqual({ handIns: 1, graded: 1 });
		const refusal = await deleteAssignment(db, tomas.id, assignmentId).catch((e) => e);
		expect(refusal).toMatchObject({ status: 409 });
		expect(refusal.message).toMatch(/^1 graded hand-in of “Four on the floor” would go with this assignment/);
		expect(await db.select().from(submission)).toHaveLength(1);

		await deleteAssignment(db, tomas.id, assignmentId, 1);
		expect(await db.select().from(submission)).toEqual([]);
	});

	it('is for the class teacher only', async () => {
		const { kai, assignmentId, drillId } = await scene();
		await expect(deleteAssignment(db, kai.id, assignmentId)).rejects.toMatchObject({ status: 403 });
		await expect(deleteDrill(db, kai.id, drillId)).rejects.toMatchObject({ status: 404 });
	});
});

describe('mappings others rely on', { timeout: 30_000 }, () => {
	it('the purge keeps a trashed mapping a drill is played on, and the drill keeps working', async () => {
		const tomas = who('tomas@mixlab.example');
		const own = await createMapping(db, tomas.id, { document: demoMapping('two-deck'), name: 'Drill set' });
		const drillId = await createDrill(db, tomas.id, { mappingId: own, document: drillDoc });
		await deleteMapping(db, tomas.id, own);
		expect(await purgeTrash(db, later(31))).toMatchObject({ mappings: 0 });
		const [d] = await db.select().from(drill).where(eq(drill.id, drillId));
		expect(await db.select().from(mappingVersion).where(eq(mappingVersion.id, d.mappingVersionId))).toHaveLength(1);
		expect(await off.orphans()).toEqual([]);
	});

	it('account deletion passes on a private mapping shared with a class that others recorded with', async () => {
		const tomas = who('tomas@mixlab.example');
		const kai = who('kai@mixlab.example');
		const classId = await createClass(db, tomas.id, 'Tuesday');
		const [c] = await db.select().from(schoolClass).where(eq(schoolClass.id, classId));
		await joinByCode(db, kai.id, c.joinCode);
		const shared = await createMapping(db, tomas.id, { document: demoMapping('two-deck'), name: 'Class set' });
		await shareMapping(db, tomas.id, classId, shared);
		const kaisSession = await importSession(db, kai.id, shared, {
			version: 1,
			tempo: 120,
			startedAt: new Date().toISOString(),
			events: tap(100)
		});
		const heir = await heirFor(db, tomas.id);
		await deleteAccountData(db, tomas.id, heir);
		const [kept] = await db.select().from(mapping).where(eq(mapping.id, shared));
		expect(kept.ownerId).toBe(heir);
		const replay = await getRehearsal(db, kai.id, kaisSession);
		expect(replay.row.mappingId).toBe(shared);
		expect(replay.mapping).not.toBeNull();
	});

	it('account deletion passes on a mapping another teacher’s drill is played on', async () => {
		const tomas = who('tomas@mixlab.example');
		const ines = who('ines@mixlab.example');
		const lent = await createMapping(db, tomas.id, { document: demoMapping('two-deck'), name: 'Lent set' });
		await setVisibility(db, tomas.id, lent, 'public');
		const drillId = await createDrill(db, ines.id, { mappingId: lent, document: drillDoc });
		await setVisibility(db, tomas.id, lent, 'private');
		await deleteAccountData(db, tomas.id, ines.id);
		expect((await db.select().from(mapping).where(eq(mapping.id, lent)))[0].ownerId).toBe(ines.id);
		expect(await db.select({ id: drill.id }).from(drill)).toEqual([{ id: drillId }]);
		expect(await off.orphans()).toEqual([]);
	});
});

describe('deleting a session while its audio arrives', { timeout: 30_000 }, () => {
	it('decides on the row inside the transaction: an upload attached meanwhile goes to the trash with it', async () => {
		const kai = who('kai@mixlab.example');
		const mappingId = (await listMappings(db, kai.id)).find((m) => m.name === 'Two-deck pad set')!.id;
		const empty = await importSession(db, kai.id, mappingId, {
			version: 1,
			tempo: 120,
			startedAt: new Date().toISOString(),
			events: []
		});
		// Hold this process's write queue, so the delete has read the row and waits to write.
		let open!: () => void;
		const gate = new Promise<void>((r) => (open = r));
		const held = serialWrite(() => gate);
		const deleting = deleteRehearsal(db, kai.id, empty);
		await new Promise((r) => setTimeout(r, 200));
		const audio = await storedFile(`${empty}-late.webm`);
		await attachAudio(db, kai.id, empty, audio, 'audio/webm', 16);
		open();
		await held;
		await deleting;
		const [row] = await db.select().from(rehearsal).where(eq(rehearsal.id, empty));
		expect(row).toMatchObject({ audioFile: audio });
		expect(row.deletedAt).not.toBeNull();
		expect(await stored()).toEqual([audio]);
	});
});

describe('the last admin', { timeout: 30_000 }, () => {
	it('survives two admins disabling each other at the same moment from two app instances', async () => {
		const tomas = who('tomas@mixlab.example');
		const ines = who('ines@mixlab.example');
		const { changeRole } = await import('$lib/server/users');
		await changeRole(t.db, tomas.id, 'admin');
		const results = await Promise.all([
			lastAdminProblem(t.db, ines.id, { claim: true }),
			lastAdminProblem(db, tomas.id, { claim: true })
		]);
		expect(results.filter((r) => r === null)).toHaveLength(1);
		const active = (await listUsers(t.db)).filter((u) => u.role === 'admin' && !u.banned);
		expect(active).toHaveLength(1);
	});
});
