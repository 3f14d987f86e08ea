// Classes, drills, assignments and submissions on a real (temporary) database: the whole path a
// teacher and a student take, and who may see what. Mail goes to a temporary outbox.
import { padId, scoreSummary as scoreSummaryOf, type SessionEvent } from '$lib/engine';
import {
	assignmentFor,
	assignmentsOf,
	createAssignment,
	gradebook,
	review,
	submissionBreakdown,
	submissionFor,
	submit
} from '$lib/server/assignments';
import {
	acceptInvitation,
	classFor,
	createClass,
	inviteByEmail,
	joinAfterSignIn,
	joinByCode,
	removeMember,
	roster,
	taughtClass
} from '$lib/server/classes';
import { drill as drillTable, schoolClass, user } from '$lib/server/db/schema';
import { gradebookCsv } from '$lib/server/gradebook-csv';
import Papa from 'papaparse';
import {
	createDrill,
	drillFor,
	duplicateDrill,
	HAS_HAND_INS,
	ownDrill,
	recordTake,
	updateDrill
} from '$lib/server/drills';
import { Refusal } from '$lib/server/http';
import { readOutbox } from '$lib/server/mail';
import { createMapping, getMapping, listMappings, saveVersion, setVisibility } from '$lib/server/mappings';
import {
	appendChunk,
	createRehearsal,
	finishRehearsal,
	getRehearsal,
	importSession,
	sessionDocument
} from '$lib/server/rehearsals';
import { runCli } from '$lib/cli/padproof';
import { writeFileSync } from 'node:fs';
import { listUsers } from '$lib/server/users';
import { eq } from 'drizzle-orm';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { demoDatabase } from './factories';

let t: Awaited<ReturnType<typeof demoDatabase>>;
let outbox = '';
const ORIGIN = 'http://padproof.test';
let people: Awaited<ReturnType<typeof listUsers>>;
const who = (email: string) => people.find((p) => p.email === email)!;

beforeEach(async () => {
	outbox = mkdtempSync(join(tmpdir(), 'padproof-outbox-'));
	process.env.MAIL_OUTBOX_DIR = outbox;
	t = await demoDatabase();
	people = await listUsers(t.db);
});
afterEach(() => {
	t.close();
	rmSync(outbox, { recursive: true, force: true });
	delete process.env.MAIL_OUTBOX_DIR;
});

const refused = async (p: Promise<unknown>, status: number) => {
	const e = await p.then(
		() => null,
		(x: unknown) => x
	);
	expect(e).toBeInstanceOf(Refusal);
	expect((e as Refusal).status).toBe(status);
};

// Tempo 120: a beat is 500 ms. Pad 1 on beats 0, 1, 2, 3 of a one-bar drill, half a beat each.
const drillDoc = {
	version: 1,
	name: 'Four on the floor',
	tempo: 120,
	countInBars: 1,
	lengthBars: 1,
	targets: [0, 1, 2, 3].map((beat) => ({ input: padId(1), beat, beats: 0.5 }))
};
const tap = (at: number, held = 250): SessionEvent[] => [
	{ t: at, input: { input: padId(1), type: 'press' } },
	{ t: at + held, input: { input: padId(1), type: 'release' } }
];

/** Teacher Tomas with a class, Kai in it, and a drill given to it; Kai's take is scored. */
async function scene() {
	const tomas = who('tomas@mixlab.example');
	const kai = who('kai@mixlab.example');
	const classId = await createClass(t.db, tomas.id, 'Tuesday beginners');
	await inviteByEmail(t.db, tomas, classId, [kai.email], ORIGIN);
	const mappingId = (await listMappings(t.db, tomas.id)).find((m) => m.name === 'Two-deck pad set')!.id;
	const drillId = await createDrill(t.db, tomas.id, { mappingId, document: drillDoc });
	return { tomas, kai, classId, mappingId, drillId };
}

/** Kai plays the drill: beat 0 at 2000 ms (after a one-bar count-in), presses 10 ms late except one missed. */
async function kaiTake(kaiId: string, mappingId: string, drillId: string) {
	const events = [...tap(2010), ...tap(2510), ...tap(3010)];
	const id = await importSession(t.db, kaiId, mappingId, {
		version: 1,
		tempo: 120,
		startedAt: new Date().toISOString(),
		events
	});
	const score = await recordTake(t.db, kaiId, { rehearsalId: id, drillId, zero: 2000 });
	return { id, score };
}

describe('classes', () => {
	it('a student joins by the invitation link mailed to them', async () => {
		const { kai, classId } = await scene();
		const [mail] = await readOutbox();
		expect(mail.to).toBe(kai.email);
		expect(mail.subject).toBe('Tomas Reyes invites you to the class “Tuesday beginners”');
		const link = mail.body.match(/http:\/\/padproof\.test\/join\/([\w-]+)/);
		expect(link).not.toBeNull();
		await refused(classFor(t.db, kai.id, classId), 404);
		expect(await acceptInvitation(t.db, kai, link![1])).toBe(classId);
		expect((await classFor(t.db, kai.id, classId)).role).toBe('student');
		expect((await roster(t.db, classId)).map((p) => p.email)).toEqual([kai.email]);
	});

	it('signing up or in from the invitation link joins at once, for the invited address only', async () => {
		const { kai, classId } = await scene();
		const token = (await readOutbox())[0].body.match(/\/join\/([\w-]+)/)![1];
		const lena = who('lena@mixlab.example');
		// Someone else signing in from the link: no class joined, the invitation page explains.
		expect(await joinAfterSignIn(t.db, lena, `/join/${token}`)).toBe(`/join/${token}`);
		await refused(classFor(t.db, lena.id, classId), 404);
		expect(await joinAfterSignIn(t.db, kai, '/home')).toBe('/home');
		expect(await joinAfterSignIn(t.db, kai, `/join/${token}`)).toBe(`/classes/${classId}?joined=1`);
		expect((await classFor(t.db, kai.id, classId)).role).toBe('student');
		expect(await joinAfterSignIn(t.db, lena, '/join/not-a-real-token-at-all')).toBe('/join/not-a-real-token-at-all');
	});

	it('an invitation works only for the invited address, and only once', async () => {
		const { classId } = await scene();
		const [mail] = await readOutbox();
		const token = mail.body.match(/\/join\/([\w-]+)/)![1];
		const lena = who('lena@mixlab.example');
		await refused(acceptInvitation(t.db, lena, token), 403);
		await refused(classFor(t.db, lena.id, classId), 404);
		await refused(acceptInvitation(t.db, lena, 'not-a-real-token-at-all'), 404);
	});

	it('a student joins by the join code; a wrong code is refused', async () => {
		const { classId } = await scene();
		const [row] = await t.db.select().from(schoolClass).where(eq(schoolClass.id, classId));
		const lena = who('lena@mixlab.example');
		await refused(joinByCode(t.db, lena.id, 'ZZZZ-ZZZZ'), 404);
		await joinByCode(t.db, lena.id, row.joinCode);
		expect((await classFor(t.db, lena.id, classId)).role).toBe('student');
	});

	it("another teacher's class is not found; a student of it can't act as its teacher", async () => {
		const { classId, kai } = await scene();
		const ines = who('ines@mixlab.example'); // admin, teaches no class here
		await refused(taughtClass(t.db, ines.id, classId), 404);
		await refused(classFor(t.db, ines.id, classId), 404);
		await refused(gradebook(t.db, ines.id, classId), 404);
		await refused(removeMember(t.db, ines.id, classId, kai.id), 404);
		const [mail] = await readOutbox();
		await acceptInvitation(t.db, kai, mail.body.match(/\/join\/([\w-]+)/)![1]);
		await refused(taughtClass(t.db, kai.id, classId), 403);
	});

	it('a private mapping shared with the class opens for its students only', async () => {
		const { tomas, kai, classId } = await scene();
		const [mail] = await readOutbox();
		await acceptInvitation(t.db, kai, mail.body.match(/\/join\/([\w-]+)/)![1]);
		const doc = (await getMapping(t.db, tomas.id, (await listMappings(t.db, tomas.id))[0].id)).document;
		const secret = await createMapping(t.db, tomas.id, { document: doc, name: 'Class-only set' });
		await refused(getMapping(t.db, kai.id, secret), 404);
		const { shareMapping } = await import('$lib/server/classes');
		await shareMapping(t.db, tomas.id, classId, secret);
		expect((await getMapping(t.db, kai.id, secret)).name).toBe('Class-only set');
		await refused(getMapping(t.db, who('lena@mixlab.example').id, secret), 404);
	});

	it('a mapping of someone else, shared while public, closes to the class once its owner makes it private', async () => {
		const { tomas, kai, classId } = await scene();
		const [mail] = await readOutbox();
		await acceptInvitation(t.db, kai, mail.body.match(/\/join\/([\w-]+)/)![1]);
		const ines = who('ines@mixlab.example');
		const doc = (await getMapping(t.db, tomas.id, (await listMappings(t.db, tomas.id))[0].id)).document;
		const theirs = await createMapping(t.db, ines.id, { document: doc, name: 'Lent set', visibility: 'public' });
		const { shareMapping } = await import('$lib/server/classes');
		await shareMapping(t.db, tomas.id, classId, theirs);
		expect((await getMapping(t.db, kai.id, theirs)).name).toBe('Lent set');
		await setVisibility(t.db, ines.id, theirs, 'private');
		await refused(getMapping(t.db, kai.id, theirs), 404);
		await refused(getMapping(t.db, tomas.id, theirs), 404);
		expect((await getMapping(t.db, ines.id, theirs)).name).toBe('Lent set');
	});
});

describe('drills, assignments and submissions', () => {
	it('refuses a drill whose target is not a pad of the mapping', async () => {
		const { tomas, mappingId } = await scene();
		await refused(
			createDrill(t.db, tomas.id, {
				mappingId,
				document: { ...drillDoc, targets: [{ input: 'pad-99', beat: 0, beats: 1 }] }
			}),
			400
		);
	});

	it('scores a take, hands it in, reviews it, and keeps everyone else out', async () => {
		const { tomas, kai, classId, mappingId, drillId } = await scene();
		const [invite] = await readOutbox();
		await acceptInvitation(t.db, kai, invite.body.match(/\/join\/([\w-]+)/)![1]);
		const due = new Date(Date.now() + 86_400_000);
		const assignmentId = await createAssignment(t.db, tomas, classId, { drillId, dueAt: due }, ORIGIN);
		expect((await readOutbox())[0].subject).toBe('New drill in Tuesday beginners: Four on the floor');
		expect((await assignmentsOf(t.db, kai.id)).map((a) => a.drill)).toEqual(['Four on the floor']);

		// Targets at 2000, 2500, 3000, 3500; presses at 2010, 2510, 3010 (+10 ms each); 3500 missed.
		// hits 3, misses 1, hit rate 0.75 < 0.9: not passed; mean signed +10, held 250 = target length.
		const { id: take, score } = await kaiTake(kai.id, mappingId, drillId);
		expect(score).toMatchObject({
			hits: 3,
			misses: 1,
			extras: 0,
			hitRate: 0.75,
			meanSignedMs: 10,
			holdMeanAbsMs: 0,
			pass: false
		});

		const lena = who('lena@mixlab.example');
		await refused(drillFor(t.db, lena.id, drillId), 404);
		await refused(assignmentFor(t.db, lena.id, assignmentId), 404);
		await refused(recordTake(t.db, lena.id, { rehearsalId: take, drillId, zero: 0 }), 404);

		const sub = await submit(t.db, kai, assignmentId, take, null, ORIGIN);
		expect(sub.late).toBe(false);
		expect((await readOutbox())[0].subject).toBe('Kai Lindqvist handed in Four on the floor');

		// The teacher reaches the take only through the submission; Lena and another teacher don't.
		await refused(getRehearsal(t.db, tomas.id, take), 404);
		expect((await submissionFor(t.db, tomas.id, sub.id)).role).toBe('teacher');
		expect((await submissionFor(t.db, kai.id, sub.id)).score.hits).toBe(3);
		await refused(submissionFor(t.db, lena.id, sub.id), 404);
		await refused(submissionFor(t.db, who('ines@mixlab.example').id, sub.id), 404);
		await refused(review(t.db, kai, sub.id, { grade: 'A', comment: 'me' }, ORIGIN), 403);

		await review(t.db, tomas, sub.id, { grade: 'B+', comment: 'Steady; catch the last beat.' }, ORIGIN);
		const feedback = (await readOutbox())[0];
		expect(feedback.to).toBe(kai.email);
		expect(feedback.subject).toBe('Feedback on Four on the floor: B+');
		expect(await submissionFor(t.db, kai.id, sub.id)).toMatchObject({
			grade: 'B+',
			comment: 'Steady; catch the last beat.'
		});
		await refused(submit(t.db, kai, assignmentId, take, null, ORIGIN), 409);

		const book = await gradebook(t.db, tomas.id, classId);
		expect(book).toEqual([
			expect.objectContaining({
				student: 'Kai Lindqvist',
				assignment: 'Four on the floor',
				hitRate: 0.75,
				grade: 'B+',
				late: false
			})
		]);
		expect((await roster(t.db, classId))[0].averageScore).toBe(0.75);
	});

	it('marks a submission after the due date late', async () => {
		const { tomas, kai, classId, mappingId, drillId } = await scene();
		await acceptInvitation(t.db, kai, (await readOutbox())[0].body.match(/\/join\/([\w-]+)/)![1]);
		const assignmentId = await createAssignment(
			t.db,
			tomas,
			classId,
			{ drillId, dueAt: new Date(Date.now() - 60_000) },
			ORIGIN
		);
		const { id } = await kaiTake(kai.id, mappingId, drillId);
		expect((await submit(t.db, kai, assignmentId, id, null, ORIGIN)).late).toBe(true);
		expect((await readOutbox())[0].subject).toBe('Kai Lindqvist handed in Four on the floor (late)');
	});

	it("refuses another student's take and a session that is no take of the drill", async () => {
		const { tomas, kai, classId, mappingId, drillId } = await scene();
		const lena = who('lena@mixlab.example');
		await acceptInvitation(t.db, kai, (await readOutbox())[0].body.match(/\/join\/([\w-]+)/)![1]);
		const [row] = await t.db.select().from(schoolClass).where(eq(schoolClass.id, classId));
		await joinByCode(t.db, lena.id, row.joinCode);
		const assignmentId = await createAssignment(
			t.db,
			tomas,
			classId,
			{ drillId, dueAt: new Date(Date.now() + 1e7) },
			ORIGIN
		);
		const { id: kaisTake } = await kaiTake(kai.id, mappingId, drillId);
		await refused(submit(t.db, lena, assignmentId, kaisTake, null, ORIGIN), 400);
		const plain = await importSession(t.db, lena.id, mappingId, {
			version: 1,
			tempo: 120,
			startedAt: new Date().toISOString(),
			events: tap(100)
		});
		await refused(submit(t.db, lena, assignmentId, plain, null, ORIGIN), 400);
	});
});

describe('gradebook', () => {
	/** Kai in the class, a take of the drill handed in for its assignment. */
	async function handedIn() {
		const sc = await scene();
		await acceptInvitation(t.db, sc.kai, (await readOutbox())[0].body.match(/\/join\/([\w-]+)/)![1]);
		const assignmentId = await createAssignment(
			t.db,
			sc.tomas,
			sc.classId,
			{ drillId: sc.drillId, dueAt: new Date(Date.now() + 1e7) },
			ORIGIN
		);
		const { id } = await kaiTake(sc.kai.id, sc.mappingId, sc.drillId);
		const sub = await submit(t.db, sc.kai, assignmentId, id, null, ORIGIN);
		return { ...sc, assignmentId, submissionId: sub.id };
	}

	it('keeps a student who left the class, with their hand-in, marked as having left', async () => {
		const { tomas, kai, classId, submissionId } = await handedIn();
		const lena = who('lena@mixlab.example');
		const [row] = await t.db.select().from(schoolClass).where(eq(schoolClass.id, classId));
		await joinByCode(t.db, lena.id, row.joinCode);
		await removeMember(t.db, tomas.id, classId, kai.id);
		const book = await gradebook(t.db, tomas.id, classId);
		expect(book.map((r) => [r.student, r.left, r.submissionId])).toEqual([
			['Kai Lindqvist', true, submissionId],
			['Lena Osei', false, null]
		]);
		const csv = Papa.parse<Record<string, string>>(gradebookCsv(book).replace(/^\uFEFF/, ''), {
			header: true,
			skipEmptyLines: true
		});
		expect(csv.data.map((r) => [r.student, r.left_class])).toEqual([
			['Kai Lindqvist', 'yes'],
			['Lena Osei', 'no']
		]);
	});

	it('writes a name that starts like a formula as text in the CSV', async () => {
		// OWASP "CSV Injection": a cell beginning with = + - @ (or tab, CR) runs as a formula in a
		// spreadsheet; prefixing it with a single quote makes the spreadsheet show it as text.
		const { tomas, kai, classId } = await handedIn();
		const names = ['=HYPERLINK("http://evil.example","Kai")', '+1+1', '-2+3', '@SUM(A1)'];
		const texts: string[] = [];
		for (const name of names) {
			await t.db.update(user).set({ name }).where(eq(user.id, kai.id));
			const book = await gradebook(t.db, tomas.id, classId);
			const csv = Papa.parse<Record<string, string>>(gradebookCsv(book).replace(/^\uFEFF/, ''), {
				header: true,
				skipEmptyLines: true
			});
			texts.push(csv.data[0].student);
		}
		expect(texts).toEqual(names.map((n) => `'${n}`));
	});
});

describe('a take scores the same in the app and on the command line', () => {
	const FIELDS = ['hits', 'misses', 'extras', 'hitRate', 'meanSignedMs', 'meanAbsMs', 'medianAbsMs', 'p95AbsMs'];

	/** Scores the exported drill, mapping version and session document with `padproof score --json`. */
	async function cliScore(userId: string, drillId: string, rehearsalId: string) {
		const d = await drillFor(t.db, userId, drillId);
		const { session } = await sessionDocument(t.db, userId, rehearsalId);
		const file = (name: string, doc: unknown) => {
			const path = join(outbox, name);
			writeFileSync(path, JSON.stringify(doc));
			return path;
		};
		const r = runCli([
			'score',
			file('drill.json', d.document),
			file('mapping.json', d.mapping),
			file('session.json', session),
			'--json'
		]);
		return { ...(JSON.parse(r.out) as Record<string, unknown>), zero: session.clock.zero } as Record<string, unknown>;
	}

	it("a practice take: its session document carries the drill's beat 0 as its clock zero", async () => {
		const { kai, classId, tomas, mappingId, drillId } = await scene();
		await acceptInvitation(t.db, kai, (await readOutbox())[0].body.match(/\/join\/([\w-]+)/)![1]);
		await createAssignment(t.db, tomas, classId, { drillId, dueAt: new Date(Date.now() + 1e7) }, ORIGIN);
		// As the practice room records it: the take begins on the room's clock (beat 0 long before the
		// take), and the room puts the take clock's zero on the drill's beat 0 (2000 ms in) before it
		// finishes. Presses 10 ms late on beats 0–2, beat 3 missed.
		const { id } = await createRehearsal(t.db, kai.id, {
			mappingId,
			tempo: 120,
			clock: { zero: -48_213.25, tempos: [{ at: -48_213.25, bpm: 120 }] }
		});
		await appendChunk(t.db, kai.id, id, { seq: 0, events: [...tap(2010), ...tap(2510), ...tap(3010)] });
		await finishRehearsal(t.db, kai.id, id, 'Four on the floor · try 1', {
			zero: 2000,
			tempos: [{ at: 2000, bpm: 120 }]
		});
		const app = await recordTake(t.db, kai.id, { rehearsalId: id, drillId, zero: 2000 });
		const cli = await cliScore(kai.id, drillId, id);
		expect(cli.zero).toBe(2000);
		expect(app).toMatchObject({ hits: 3, misses: 1, meanSignedMs: 10 });
		for (const f of FIELDS) expect(cli[f], f).toEqual(app[f as keyof typeof app]);
		expect(cli.findings).toBe(app.findings);
		expect(cli.pass).toBe(app.pass);
	});

	it('a take whose beat 0 is given apart from its session clock: the session clock moves there', async () => {
		const { kai, classId, tomas, mappingId, drillId } = await scene();
		await acceptInvitation(t.db, kai, (await readOutbox())[0].body.match(/\/join\/([\w-]+)/)![1]);
		await createAssignment(t.db, tomas, classId, { drillId, dueAt: new Date(Date.now() + 1e7) }, ORIGIN);
		// A version 1 session (beat 0 at 0) scored with beat 0 at 2000 ms, as a script might.
		const { id, score } = await kaiTake(kai.id, mappingId, drillId);
		const cli = await cliScore(kai.id, drillId, id);
		expect(cli.zero).toBe(2000);
		for (const f of FIELDS) expect(cli[f], f).toEqual(score[f as keyof typeof score]);
		// Scored again without a zero: the session's own beat 0, the same score.
		expect(await recordTake(t.db, kai.id, { rehearsalId: id, drillId })).toEqual(score);
	});
});

describe('a drill with hand-ins', () => {
	/** Kai in the class with the drill assigned, and a take of it (not handed in yet). */
	async function assigned() {
		const sc = await scene();
		await acceptInvitation(t.db, sc.kai, (await readOutbox())[0].body.match(/\/join\/([\w-]+)/)![1]);
		const assignmentId = await createAssignment(
			t.db,
			sc.tomas,
			sc.classId,
			{ drillId: sc.drillId, dueAt: new Date(Date.now() + 1e7) },
			ORIGIN
		);
		const { id: take, score } = await kaiTake(sc.kai.id, sc.mappingId, sc.drillId);
		return { ...sc, assignmentId, take, score };
	}
	const summaryOf = async (userId: string, id: string) => {
		const b = await submissionBreakdown(t.db, userId, id);
		const { findingKinds: _k, ...detail } = scoreSummaryOf(b.detail!);
		const { findingKinds: _s, ...stored } = b.submission.score;
		return { detail, stored };
	};

	it('is no longer changed: targets, pass mark and mapping version are refused (409), the name may change', async () => {
		const { tomas, kai, mappingId, drillId, assignmentId, take } = await assigned();
		// Before any hand-in the teacher may still change it.
		await updateDrill(t.db, tomas.id, drillId, { mappingId, document: { ...drillDoc, windowMs: 50 } });
		await submit(t.db, kai, assignmentId, take, null, ORIGIN);
		const e = await updateDrill(t.db, tomas.id, drillId, {
			mappingId,
			document: { ...drillDoc, windowMs: 50, targets: drillDoc.targets.slice(1) }
		}).catch((x: unknown) => x);
		expect(e).toBeInstanceOf(Refusal);
		expect((e as Refusal).status).toBe(409);
		expect((e as Refusal).message).toBe(HAS_HAND_INS);
		expect(HAS_HAND_INS).toBe('This drill has hand-ins; duplicate it to change it.');
		await refused(
			updateDrill(t.db, tomas.id, drillId, {
				mappingId,
				document: { ...drillDoc, windowMs: 50, pass: { hitRate: 0.5 } }
			}),
			409
		);
		const doc = (await getMapping(t.db, tomas.id, mappingId)).document;
		await saveVersion(t.db, tomas.id, mappingId, doc, 1);
		await refused(
			updateDrill(t.db, tomas.id, drillId, { mappingId, mappingVersion: 2, document: { ...drillDoc, windowMs: 50 } }),
			409
		);
		// Saving it unchanged keeps it on its version even though the mapping has a newer one.
		await updateDrill(t.db, tomas.id, drillId, {
			mappingId,
			document: { ...drillDoc, name: 'Four, renamed', windowMs: 50 }
		});
		const d = await drillFor(t.db, tomas.id, drillId);
		expect([d.document.name, d.document.targets.length, d.mappingVersion]).toEqual(['Four, renamed', 4, 1]);
		// A copy changes freely.
		const copy = await duplicateDrill(t.db, tomas.id, drillId);
		expect((await ownDrill(t.db, tomas.id, copy)).name).toBe('Four, renamed (copy)');
		await updateDrill(t.db, tomas.id, copy, { mappingId, mappingVersion: 2, document: { ...drillDoc, lengthBars: 2 } });
		expect((await drillFor(t.db, tomas.id, copy)).mappingVersion).toBe(2);
		await refused(duplicateDrill(t.db, kai.id, drillId), 404);
	});

	it('the review breakdown always equals the score stored at hand-in', async () => {
		const { tomas, kai, mappingId, drillId, assignmentId, take, score } = await assigned();
		// The teacher moves beat 2's target to 2.5 after Kai's take (his press at 3010 ms no longer
		// hits 3250 ms): the hand-in is scored on the drill as it stands, 2 hits instead of 3.
		const moved = {
			...drillDoc,
			targets: drillDoc.targets.map((x) => (x.beat === 2 ? { ...x, beat: 2.5 } : x))
		};
		await updateDrill(t.db, tomas.id, drillId, { mappingId, document: moved });
		const sub = await submit(t.db, kai, assignmentId, take, null, ORIGIN);
		expect(score.hits).toBe(3);
		expect((await submissionFor(t.db, tomas.id, sub.id)).score.hits).toBe(2);
		let { detail, stored: kept } = await summaryOf(tomas.id, sub.id);
		expect(detail).toEqual(kept);
		// Even if the drill row changed underneath (an old hand-in, a change made outside the app),
		// the breakdown is worked out against what the stored score was counted against.
		await t.db
			.update(drillTable)
			.set({ document: { ...moved, windowMs: 1 } })
			.where(eq(drillTable.id, drillId));
		({ detail, stored: kept } = await summaryOf(kai.id, sub.id));
		expect(detail).toEqual(kept);
		expect(detail.hits).toBe(2);
	});
});

describe('the mapping version a drill is played on', () => {
	it('is the one the teacher chose, kept on save, and must be a version of that mapping they may read', async () => {
		const { tomas, mappingId } = await scene();
		const doc = (await getMapping(t.db, tomas.id, mappingId)).document;
		await saveVersion(t.db, tomas.id, mappingId, doc, 1);
		const onV1 = await createDrill(t.db, tomas.id, { mappingId, mappingVersion: 1, document: drillDoc });
		expect((await drillFor(t.db, tomas.id, onV1)).mappingVersion).toBe(1);
		const newest = await createDrill(t.db, tomas.id, { mappingId, document: drillDoc });
		expect((await drillFor(t.db, tomas.id, newest)).mappingVersion).toBe(2);
		await updateDrill(t.db, tomas.id, onV1, { mappingId, document: { ...drillDoc, tempo: 100 } });
		expect((await drillFor(t.db, tomas.id, onV1)).mappingVersion).toBe(1);
		await updateDrill(t.db, tomas.id, onV1, { mappingId, mappingVersion: 2, document: drillDoc });
		expect((await drillFor(t.db, tomas.id, onV1)).mappingVersion).toBe(2);
		await refused(createDrill(t.db, tomas.id, { mappingId, mappingVersion: 7, document: drillDoc }), 404);
		// Another teacher's private mapping, version 1: not readable, so not found.
		const ines = who('ines@mixlab.example');
		const theirs = await createMapping(t.db, ines.id, { document: doc, name: 'Private set' });
		await refused(createDrill(t.db, tomas.id, { mappingId: theirs, mappingVersion: 1, document: drillDoc }), 404);
	});
});
