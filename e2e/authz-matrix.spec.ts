// The authorization matrix: every route (pages, form actions, API, file downloads) × every kind
// of person → the status the built app must answer. One table; a cell that answers anything else
// fails, and an answer of 2xx/3xx-into-the-app where a refusal is expected counts as an allow
// that must not happen.
//
// To add a route: add a row to ROUTES. `expect` gives the status for each person; the helpers
// below cover the usual shapes (everyone signed in, owner only, teachers, admins). `fresh`
// makes a new fixture for every cell (for DELETE and other one-time requests).
import { expect, test, type APIRequestContext } from '@playwright/test';
import { readdirSync, readFileSync } from 'node:fs';
import { join, relative } from 'node:path';
import { fileURLToPath } from 'node:url';
import {
	apiAs,
	createdId,
	demoDocument,
	demoId,
	DRILL,
	everyone,
	freshAccount,
	FRESH_PASSWORD,
	joinClass,
	newToken,
	newAssignment,
	newClass,
	newDrill,
	newSession,
	newTake,
	OTHER_TEACHER,
	PEOPLE,
	postForm,
	SMALL_WEBM,
	submitTake,
	userIdOf,
	type Person
} from './api-support';
import { waitForMail } from './outbox';
import { DEMO } from './support';

type Expect = Record<Person, number>;
interface Fixtures {
	privateMapping: string; // the student's private mapping
	publicMapping: string; // the teacher's public demo mapping
	session: string; // the student's finished session, with audio
	recording: string; // the student's unfinished recording
	document: unknown;
	otherStudentId: string;
	classId: string; // taught by `teacher`; `student` is its only member
	drill: string; // the teacher's drill on the public mapping, given to the class
	assignment: string;
	take: string; // the student's scored take of the drill (a session with audio), handed in
	submission: string; // the student's submission of `take`, with an audio file
	sharedMapping: string; // the teacher's private mapping, shared with the class
	revokedMapping: string; // another teacher's mapping, shared while public, then made private
	inviteToken: string; // an invitation to the class, sent to someone with no account
}
interface Body {
	json?: unknown;
	form?: Record<string, string>;
	multipart?: Record<string, string | { name: string; mimeType: string; buffer: Buffer }>;
	bytes?: Buffer;
	type?: string;
}
interface Row {
	name: string;
	method: 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';
	path: (f: Fixtures, fresh: string) => string;
	body?: (f: Fixtures, fresh: string) => Body;
	/** Makes a new fixture for each cell; its id is passed to `path` and `body` as `fresh`. */
	fresh?: (f: Fixtures, person: Person) => Promise<string>;
	/** Who sends the request instead of the shared context (a new session, or a new account of the same kind). */
	actor?: (person: Person) => Promise<APIRequestContext>;
	expect: Expect;
}

const all = (status: number): Expect => Object.fromEntries(PEOPLE.map((p) => [p, status])) as Expect;
/** Pages behind an account: visitors are sent to sign in. */
const signedInPage = (status = 200): Expect => ({ ...all(status), anonymous: 303 });
/** API behind an account. */
const signedInApi = (status = 200): Expect => ({ ...all(status), anonymous: 401 });
/** Only the student who owns it; to everyone else it does not exist. */
const studentOnly = (status: number, anonymous = 401): Expect => ({ ...all(404), anonymous, student: status });
/** Owned by the teacher and public: others may read but not change it. */
const teacherOwns = (status: number): Expect => ({ ...all(403), anonymous: 401, teacher: status });
const teachersPage: Expect = { ...all(200), anonymous: 303, student: 403, otherStudent: 403 };
const adminsPage: Expect = { ...all(403), anonymous: 303, admin: 200 };

/** The class's teacher and its member; anyone else is told it does not exist. */
const classOnly = (status: number, anonymous = 401): Expect => ({
	...all(404),
	anonymous,
	student: status,
	teacher: status
});
/** The class's teacher only: the member student is outside the teaching area (403), others are told "not found". */
const classTeacherPage = (status: number): Expect => ({
	...all(404),
	anonymous: 303,
	student: 403,
	otherStudent: 403,
	teacher: status
});
/** Any teacher (or admin) for their own work; students are outside the teaching area. */
const anyTeacher = (status: number, anonymous = 303): Expect => ({
	...all(status),
	anonymous,
	student: 403,
	otherStudent: 403
});
/** The admin only (forms of the admin page). */
const adminForm = (status: number): Expect => ({ ...all(403), anonymous: 303, admin: status });

const ROLE_OF: Record<Exclude<Person, 'anonymous'>, 'student' | 'teacher' | 'admin'> = {
	student: 'student',
	otherStudent: 'student',
	teacher: 'teacher',
	otherTeacher: 'teacher',
	admin: 'admin'
};
/** A new account of the person's kind, signed in (for requests that end or change an account). */
const freshPerson = async (person: Person) =>
	person === 'anonymous' ? apiAs(null) : (await freshAccount(ROLE_OF[person], 'matrix')).ctx;
const DEMO_EMAILS: Record<Exclude<Person, 'anonymous'>, string> = {
	student: DEMO.student,
	otherStudent: DEMO.student2,
	teacher: DEMO.teacher,
	otherTeacher: OTHER_TEACHER.email,
	admin: DEMO.admin
};
/** A new sign-in of the same person (for sign-out, which ends the session it is sent with). */
const newSignIn = async (person: Person) => {
	const email = { anonymous: null, ...DEMO_EMAILS }[person];
	return email === OTHER_TEACHER.email ? apiAs(email, OTHER_TEACHER.password) : apiAs(email);
};
/** An account no test signs in with, as the target of an admin form. */
const freshTarget = async () => {
	const { email, ctx } = await freshAccount('student', 'target');
	await ctx.dispose();
	return userIdOf(email);
};
/** A drill document as the drill editor posts it. */
const drillForm = (f: Fixtures, name = 'Matrix form drill') => ({
	mappingId: f.publicMapping,
	document: JSON.stringify({ ...DRILL, name })
});

const ROUTES: Row[] = [
	// ---- pages ----
	{ name: 'landing page', method: 'GET', path: () => '/', expect: all(200) },
	{ name: 'API reference', method: 'GET', path: () => '/help/api', expect: all(200) },
	{ name: 'sign-in page', method: 'GET', path: () => '/signin', expect: { ...all(303), anonymous: 200 } },
	{ name: 'sign-up page', method: 'GET', path: () => '/signup', expect: { ...all(303), anonymous: 200 } },
	{ name: 'home', method: 'GET', path: () => '/home', expect: signedInPage() },
	{ name: 'mappings page', method: 'GET', path: () => '/mappings', expect: signedInPage() },
	{ name: 'sessions page', method: 'GET', path: () => '/sessions', expect: signedInPage() },
	{ name: 'controllers page', method: 'GET', path: () => '/controllers', expect: signedInPage() },
	{ name: 'sounds page', method: 'GET', path: () => '/sounds', expect: signedInPage() },
	{ name: 'account page', method: 'GET', path: () => '/account', expect: signedInPage() },
	{ name: 'classes page', method: 'GET', path: () => '/classes', expect: signedInPage() },
	{ name: 'drills page', method: 'GET', path: () => '/drills', expect: teachersPage },
	{ name: 'new drill page', method: 'GET', path: () => '/drills/new', expect: teachersPage },
	{ name: 'new mapping page', method: 'GET', path: () => '/mappings/new', expect: signedInPage() },
	{ name: 'trash page', method: 'GET', path: () => '/trash', expect: signedInPage() },
	{ name: 'admin page', method: 'GET', path: () => '/admin', expect: adminsPage },
	{ name: 'mail outbox page', method: 'GET', path: () => '/admin/outbox', expect: adminsPage },
	{
		name: 'rehearsal room of a private mapping',
		method: 'GET',
		path: (f) => `/rehearse/${f.privateMapping}`,
		expect: studentOnly(200, 303)
	},
	{
		name: 'rehearsal room of a public mapping',
		method: 'GET',
		path: (f) => `/rehearse/${f.publicMapping}`,
		expect: signedInPage()
	},
	{ name: 'replay of a session', method: 'GET', path: (f) => `/sessions/${f.session}`, expect: studentOnly(200, 303) },
	{ name: 'sign-out page', method: 'GET', path: () => '/signout', expect: all(303) },
	// ---- form actions (visitors are sent to sign in) ----
	{
		name: 'change a role (admin form)',
		method: 'POST',
		path: () => '/admin?/setRole',
		body: (f) => ({ form: { userId: f.otherStudentId, role: 'student' } }),
		expect: { ...all(403), anonymous: 303, admin: 200 }
	},
	{
		name: 'change the password (account form, wrong current password)',
		method: 'POST',
		path: () => '/account?/password',
		body: () => ({
			form: { currentPassword: 'not-it-at-all', newPassword: 'a-new-password-99', confirm: 'a-new-password-99' }
		}),
		expect: { ...all(400), anonymous: 303 }
	},
	// ---- JSON API ----
	{ name: 'list mappings', method: 'GET', path: () => '/api/mappings', expect: signedInApi() },
	{
		name: 'create a mapping',
		method: 'POST',
		path: () => '/api/mappings',
		body: (f) => ({ json: { document: f.document, name: 'Matrix copy' } }),
		expect: signedInApi(201)
	},
	{
		name: 'read a private mapping',
		method: 'GET',
		path: (f) => `/api/mappings/${f.privateMapping}`,
		expect: studentOnly(200)
	},
	{
		name: 'download a private mapping',
		method: 'GET',
		path: (f) => `/api/mappings/${f.privateMapping}?download`,
		expect: studentOnly(200)
	},
	{
		name: 'read an earlier version of a private mapping',
		method: 'GET',
		path: (f) => `/api/mappings/${f.privateMapping}?version=1`,
		expect: studentOnly(200)
	},
	{
		// A save must say which version it started from: without one it is refused before anything is read.
		name: 'save a version of a private mapping without a base version',
		method: 'PUT',
		path: (f) => `/api/mappings/${f.privateMapping}`,
		body: (f) => ({ json: { document: f.document } }),
		expect: signedInApi(400)
	},
	{
		name: 'change the visibility of a private mapping',
		method: 'PATCH',
		path: (f) => `/api/mappings/${f.privateMapping}`,
		body: () => ({ json: { visibility: 'private' } }),
		expect: studentOnly(200)
	},
	{
		name: 'delete a private mapping',
		method: 'DELETE',
		path: (_f, fresh) => `/api/mappings/${fresh}`,
		fresh: async (f) => createdId(await as.student.post('/api/mappings', { data: { document: f.document } })),
		expect: studentOnly(204)
	},
	{
		name: 'read a public mapping',
		method: 'GET',
		path: (f) => `/api/mappings/${f.publicMapping}`,
		expect: signedInApi()
	},
	{
		name: 'save a version of a public mapping without a base version',
		method: 'PUT',
		path: (f) => `/api/mappings/${f.publicMapping}`,
		body: (f) => ({ json: { document: f.document } }),
		expect: signedInApi(400)
	},
	{
		name: 'change the visibility of a public mapping',
		method: 'PATCH',
		path: (f) => `/api/mappings/${f.publicMapping}`,
		body: () => ({ json: { visibility: 'public' } }),
		expect: teacherOwns(200)
	},
	{
		name: 'delete a public mapping',
		method: 'DELETE',
		path: (_f, fresh) => `/api/mappings/${fresh}`,
		fresh: async (f) =>
			createdId(await as.teacher.post('/api/mappings', { data: { document: f.document, visibility: 'public' } })),
		expect: teacherOwns(204)
	},
	{ name: 'list sessions', method: 'GET', path: () => '/api/sessions', expect: signedInApi() },
	{
		name: 'start a recording of a public mapping',
		method: 'POST',
		path: () => '/api/sessions',
		body: (f) => ({ json: { mappingId: f.publicMapping, tempo: 120 } }),
		expect: signedInApi(201)
	},
	{
		name: 'start a recording of a private mapping',
		method: 'POST',
		path: () => '/api/sessions',
		body: (f) => ({ json: { mappingId: f.privateMapping, tempo: 120 } }),
		expect: studentOnly(201)
	},
	{
		name: 'import a session document for a private mapping',
		method: 'POST',
		path: () => '/api/sessions',
		body: (f) => ({
			json: {
				mappingId: f.privateMapping,
				session: { version: 1, tempo: 120, startedAt: '2026-12-01T20:00:00Z', events: [] }
			}
		}),
		expect: studentOnly(201)
	},
	{ name: 'read a session', method: 'GET', path: (f) => `/api/sessions/${f.session}`, expect: studentOnly(200) },
	{
		name: 'download a session',
		method: 'GET',
		path: (f) => `/api/sessions/${f.session}?download`,
		expect: studentOnly(200)
	},
	{
		name: 'rename a session',
		method: 'PATCH',
		path: (f) => `/api/sessions/${f.session}`,
		body: () => ({ json: { name: 'Matrix take' } }),
		expect: studentOnly(200)
	},
	{
		name: 'finish a recording',
		method: 'PATCH',
		path: (_f, fresh) => `/api/sessions/${fresh}`,
		body: () => ({ json: { finish: true } }),
		fresh: async (f) =>
			createdId(await as.student.post('/api/sessions', { data: { mappingId: f.privateMapping, tempo: 120 } })),
		expect: studentOnly(200)
	},
	{
		name: 'delete a session',
		method: 'DELETE',
		path: (_f, fresh) => `/api/sessions/${fresh}`,
		fresh: async (f) =>
			createdId(await as.student.post('/api/sessions', { data: { mappingId: f.privateMapping, tempo: 120 } })),
		expect: studentOnly(204)
	},
	{
		name: 'send a chunk of a recording',
		method: 'POST',
		path: (f) => `/api/sessions/${f.recording}/chunks`,
		body: () => ({ json: { seq: 0, events: [{ t: 5, input: null }] } }),
		expect: studentOnly(200)
	},
	{
		name: 'upload the audio of a session',
		method: 'PUT',
		path: (f) => `/api/sessions/${f.session}/audio`,
		body: () => ({ bytes: SMALL_WEBM, type: 'audio/webm' }),
		expect: studentOnly(201)
	},
	{
		name: 'download the audio of a session',
		method: 'GET',
		path: (f) => `/api/sessions/${f.session}/audio`,
		expect: studentOnly(200)
	},
	// ======== studio ========
	{
		name: 'mapping editor of a private mapping',
		method: 'GET',
		path: (f) => `/mappings/${f.privateMapping}`,
		expect: studentOnly(200, 303)
	},
	{
		name: 'mapping editor of a public mapping',
		method: 'GET',
		path: (f) => `/mappings/${f.publicMapping}`,
		expect: signedInPage()
	},
	{
		name: 'printable sheet of a private mapping',
		method: 'GET',
		path: (f) => `/mappings/${f.privateMapping}/sheet`,
		expect: studentOnly(200, 303)
	},
	{
		name: 'printable sheet of a public mapping',
		method: 'GET',
		path: (f) => `/mappings/${f.publicMapping}/sheet`,
		expect: signedInPage()
	},
	{
		name: 'new mapping form',
		method: 'POST',
		path: () => '/mappings/new',
		body: () => ({
			form: { name: 'Matrix form mapping', controller: 'builtin:0', decks: '2', racks: '1', starter: 'empty' }
		}),
		expect: all(303) // visitors to sign in, everyone else to their new mapping
	},
	{
		name: 'save a version of a private mapping from the newest version',
		method: 'PUT',
		path: (_f, fresh) => `/api/mappings/${fresh}`,
		body: (f) => ({ json: { document: f.document, baseVersion: 1 } }),
		fresh: async (f) => createdId(await as.student.post('/api/mappings', { data: { document: f.document } })),
		expect: studentOnly(200)
	},
	{
		name: 'save a version of a private mapping from a stale version',
		method: 'PUT',
		path: (_f, fresh) => `/api/mappings/${fresh}`,
		body: (f) => ({ json: { document: f.document, baseVersion: 1 } }),
		fresh: async (f) => {
			const id = await createdId(await as.student.post('/api/mappings', { data: { document: f.document } }));
			const saved = await as.student.put(`/api/mappings/${id}`, { data: { document: f.document, baseVersion: 1 } });
			expect(saved.status()).toBe(200);
			return id;
		},
		expect: { ...studentOnly(409) } // the owner is told of the conflict; nothing is overwritten
	},
	{
		name: 'save a version of a public mapping from the newest version',
		method: 'PUT',
		path: (_f, fresh) => `/api/mappings/${fresh}`,
		body: (f) => ({ json: { document: f.document, baseVersion: 1 } }),
		fresh: async (f) =>
			createdId(await as.teacher.post('/api/mappings', { data: { document: f.document, visibility: 'public' } })),
		expect: teacherOwns(200)
	},
	{
		name: 'rename a private mapping',
		method: 'PATCH',
		path: (f) => `/api/mappings/${f.privateMapping}`,
		body: () => ({ json: { name: 'Matrix private' } }),
		expect: studentOnly(200)
	},
	{
		name: 'rename a public mapping',
		method: 'PATCH',
		path: (f) => `/api/mappings/${f.publicMapping}`,
		body: () => ({ json: { name: 'Two-deck pad set' } }),
		expect: teacherOwns(200)
	},
	{
		name: 'compare two versions of a private mapping',
		method: 'GET',
		path: (f) => `/api/mappings/${f.privateMapping}/diff?from=1&to=1`,
		expect: studentOnly(200)
	},
	{
		name: 'compare two versions of a public mapping',
		method: 'GET',
		path: (f) => `/api/mappings/${f.publicMapping}/diff?from=1&to=1`,
		expect: signedInApi()
	},
	{
		name: 'version list of a private mapping',
		method: 'GET',
		path: (f) => `/api/mappings/${f.privateMapping}/versions`,
		expect: studentOnly(200)
	},
	{
		name: 'version list of a public mapping',
		method: 'GET',
		path: (f) => `/api/mappings/${f.publicMapping}/versions`,
		expect: signedInApi()
	},
	{
		name: 'fork a public mapping',
		method: 'POST',
		path: (f) => `/api/mappings/${f.publicMapping}/fork`,
		body: () => ({ json: { name: 'Matrix fork' } }),
		expect: signedInApi(201)
	},
	{
		name: 'fork a private mapping',
		method: 'POST',
		path: (f) => `/api/mappings/${f.privateMapping}/fork`,
		body: () => ({ json: {} }),
		expect: studentOnly(201)
	},
	{ name: 'list learned controller layouts', method: 'GET', path: () => '/api/controllers', expect: signedInApi() },
	{
		name: 'save a learned controller layout',
		method: 'POST',
		path: () => '/api/controllers',
		body: (f) => ({ json: { profile: (f.document as { profile: unknown }).profile } }),
		expect: signedInApi(201)
	},
	{
		name: 'delete a learned controller layout',
		method: 'DELETE',
		path: (_f, fresh) => `/api/controllers/${fresh}`,
		fresh: async (f) =>
			createdId(
				await as.student.post('/api/controllers', {
					data: { profile: { ...(f.document as { profile: object }).profile, name: `Matrix pads ${Math.random()}` } }
				})
			),
		expect: studentOnly(204)
	},
	// ======== classes ========
	{ name: 'class page', method: 'GET', path: (f) => `/classes/${f.classId}`, expect: classOnly(200, 303) },
	{
		name: 'gradebook page',
		method: 'GET',
		path: (f) => `/classes/${f.classId}/gradebook`,
		expect: classTeacherPage(200)
	},
	{
		name: 'gradebook download (CSV)',
		method: 'GET',
		path: (f) => `/classes/${f.classId}/gradebook.csv`,
		// The member is told it is the teacher's (they know the class); others that it does not exist.
		expect: { ...all(404), anonymous: 401, student: 403, teacher: 200 }
	},
	{
		name: 'create a class (form)',
		method: 'POST',
		path: () => '/classes?/create',
		body: () => ({ form: { name: 'Matrix extra class' } }),
		expect: anyTeacher(303) // to the new class
	},
	{
		name: 'join a class with its code (form)',
		method: 'POST',
		path: () => '/classes?/join',
		body: (_f, fresh) => ({ form: { code: fresh } }),
		fresh: async () => (await newClass(as.teacher, 'Matrix code class')).code,
		expect: { ...all(303), teacher: 400 } // codes are for anyone signed in; the teacher already teaches it
	},
	{
		name: 'invite people to a class (form)',
		method: 'POST',
		path: (f) => `/classes/${f.classId}?/invite`,
		body: () => ({ form: { emails: 'matrix.invitee@example.com' } }),
		expect: classTeacherPage(200)
	},
	{
		name: 'remove a student from a class (form)',
		method: 'POST',
		path: (_f, fresh) => `/classes/${fresh}?/remove`,
		body: (f) => ({ form: { userId: f.otherStudentId } }),
		fresh: async () => {
			const c = await newClass(as.teacher, 'Matrix removal class');
			await joinClass(as.otherStudent, c.code);
			return c.id;
		},
		// The student being removed is a member of this class: still only its teacher removes.
		expect: { ...classTeacherPage(200) }
	},
	{
		name: 'share a mapping with a class (form)',
		method: 'POST',
		path: (f) => `/classes/${f.classId}?/share`,
		body: (f) => ({ form: { mappingId: f.publicMapping } }),
		expect: classTeacherPage(200)
	},
	{
		name: 'share the student’s private mapping with a class (form)',
		method: 'POST',
		path: (f) => `/classes/${f.classId}?/share`,
		body: (f) => ({ form: { mappingId: f.privateMapping } }),
		expect: classTeacherPage(404) // a teacher shares only their own or public mappings
	},
	{
		name: 'stop sharing a mapping with a class (form)',
		method: 'POST',
		path: (f) => `/classes/${f.classId}?/unshare`,
		body: (_f, fresh) => ({ form: { mappingId: fresh } }),
		fresh: async (f) => {
			const id = await createdId(await as.teacher.post('/api/mappings', { data: { document: f.document } }));
			expect((await postForm(as.teacher, `/classes/${f.classId}?/share`, { mappingId: id })).status).toBe(200);
			return id;
		},
		expect: classTeacherPage(200)
	},
	{
		name: 'give a drill to a class (form)',
		method: 'POST',
		path: (f) => `/classes/${f.classId}?/assign`,
		body: (f) => ({ form: { drillId: f.drill, due: '2099-07-01T18:00', tzOffset: '0' } }),
		expect: classTeacherPage(200)
	},
	{
		name: 'invitation page',
		method: 'GET',
		path: (f) => `/join/${f.inviteToken}`,
		expect: all(200) // the link itself is the secret; it shows the class and the invited address
	},
	{
		name: 'accept an invitation (sent to the other student)',
		method: 'POST',
		path: (_f, fresh) => `/join/${fresh}`,
		body: () => ({ form: {} }),
		fresh: async () => {
			const name = `Matrix invite class ${Math.random().toString(36).slice(2, 8)}`;
			const c = await newClass(as.teacher, name);
			await postForm(as.teacher, `/classes/${c.id}?/invite`, { emails: DEMO.student2 });
			const mail = await waitForMail(DEMO.student2, new RegExp(`invites you to the class “${name}”`));
			return mail.text!.match(/\/join\/([\w-]+)/)![1];
		},
		expect: { ...all(403), anonymous: 303, otherStudent: 303 } // only the invited address joins
	},
	// ======== drills ========
	{ name: 'drill editor', method: 'GET', path: (f) => `/drills/${f.drill}`, expect: classTeacherPage(200) },
	{
		name: 'import a drill file (form)',
		method: 'POST',
		path: () => '/drills?/import',
		body: (f) => ({ form: { mappingId: f.publicMapping, text: JSON.stringify({ ...DRILL, name: 'Matrix import' }) } }),
		expect: anyTeacher(303) // to the new drill
	},
	{
		name: 'create a drill (form)',
		method: 'POST',
		path: () => '/drills/new',
		body: (f) => ({ form: drillForm(f) }),
		expect: anyTeacher(303)
	},
	{
		name: 'save a drill (form)',
		method: 'POST',
		path: (f) => `/drills/${f.drill}?/save`,
		body: (f) => ({ form: drillForm(f, DRILL.name) }),
		expect: classTeacherPage(200)
	},
	{
		name: 'duplicate a drill (form)',
		method: 'POST',
		path: (f) => `/drills/${f.drill}?/duplicate`,
		body: () => ({ form: {} }),
		expect: classTeacherPage(303) // the author goes to the copy
	},
	{
		name: 'delete a drill (form)',
		method: 'POST',
		path: (_f, fresh) => `/drills/${fresh}?/delete`,
		body: () => ({ form: {} }),
		fresh: async (f) => newDrill(as.teacher, f.publicMapping, 'Matrix doomed drill'),
		expect: classTeacherPage(303) // the author goes back to the drill list
	},
	{ name: 'list drills', method: 'GET', path: () => '/api/drills', expect: anyTeacher(200, 401) },
	{
		name: 'create a drill',
		method: 'POST',
		path: () => '/api/drills',
		body: (f) => ({ json: { mappingId: f.publicMapping, document: { ...DRILL, name: 'Matrix API drill' } } }),
		expect: anyTeacher(201, 401)
	},
	{
		name: 'create a drill on the student’s private mapping',
		method: 'POST',
		path: () => '/api/drills',
		body: (f) => ({ json: { mappingId: f.privateMapping, document: { ...DRILL, name: 'Matrix stolen drill' } } }),
		expect: anyTeacher(404, 401)
	},
	{
		name: 'practise a drill in the rehearsal room',
		method: 'GET',
		path: (f) => `/rehearse/${f.publicMapping}?drill=${f.drill}&assignment=${f.assignment}`,
		expect: classOnly(200, 303) // the drill's author and the class it is given to
	},
	{ name: 'read a drill', method: 'GET', path: (f) => `/api/drills/${f.drill}`, expect: classOnly(200) },
	{
		name: 'download a drill',
		method: 'GET',
		path: (f) => `/api/drills/${f.drill}?download`,
		expect: classOnly(200)
	},
	{
		name: 'score one of your own sessions as a take of a drill',
		method: 'POST',
		path: () => '/api/drill-takes',
		body: (f, fresh) => ({ json: { rehearsalId: fresh, drillId: f.drill, zero: 0 } }),
		fresh: async (f, person) => (person === 'anonymous' ? 'none' : newSession(as[person], f.publicMapping, false)),
		expect: classOnly(201) // the drill's author and the class it is given to
	},
	{
		name: 'score the student’s session as a take',
		method: 'POST',
		path: () => '/api/drill-takes',
		body: (f) => ({ json: { rehearsalId: f.take, drillId: f.drill, zero: 0 } }),
		expect: studentOnly(201) // the teacher may not reach the student's session this way
	},
	// ======== assignments and submissions ========
	{ name: 'assignment page', method: 'GET', path: (f) => `/assignments/${f.assignment}`, expect: classOnly(200, 303) },
	{
		name: 'hand in a take with audio (form)',
		method: 'POST',
		path: (f) => `/assignments/${f.assignment}?/submit`,
		body: (f) => ({
			multipart: {
				rehearsalId: f.take,
				audio: { name: 'take.webm', mimeType: 'audio/webm', buffer: SMALL_WEBM }
			}
		}),
		// The student to the submission; the teacher hands nothing in; outsiders don't see it.
		expect: { ...classOnly(303, 303), teacher: 403 }
	},
	{
		name: 'delete an assignment (form)',
		method: 'POST',
		path: (_f, fresh) => `/assignments/${fresh}?/delete`,
		body: () => ({ form: { graded: '0' } }),
		fresh: async (f) => newAssignment(as.teacher, f.classId, f.drill),
		// The class teacher goes back to the class; its student may not; to anyone else it does not exist.
		expect: { ...all(404), anonymous: 303, student: 403, teacher: 303 }
	},
	{
		name: 'submission page',
		method: 'GET',
		path: (f) => `/submissions/${f.submission}`,
		expect: classOnly(200, 303)
	},
	{
		name: 'grade a submission (form)',
		method: 'POST',
		path: (_f, fresh) => `/submissions/${fresh}?/review`,
		body: () => ({ form: { grade: 'B+', comment: 'Steady; hold the last press longer.' } }),
		fresh: async (f) => {
			const assignment = await newAssignment(as.teacher, f.classId, f.drill);
			return submitTake(as.student, assignment, await newTake(as.student, f.publicMapping, f.drill));
		},
		expect: classTeacherPage(200)
	},
	{ name: 'read a submission', method: 'GET', path: (f) => `/api/submissions/${f.submission}`, expect: classOnly(200) },
	{
		name: 'download the audio of a submission',
		method: 'GET',
		path: (f) => `/api/submissions/${f.submission}/audio`,
		expect: classOnly(200)
	},
	// A teacher sees a student's session only through a submission to their class.
	{
		name: 'replay of a handed-in session, directly',
		method: 'GET',
		path: (f) => `/sessions/${f.take}`,
		expect: studentOnly(200, 303)
	},
	{
		name: 'replay of a handed-in session, through the submission',
		method: 'GET',
		path: (f) => `/sessions/${f.take}?submission=${f.submission}`,
		expect: classOnly(200, 303)
	},
	{
		name: 'replay of another session of the student, through the submission',
		method: 'GET',
		path: (f) => `/sessions/${f.session}?submission=${f.submission}`,
		expect: { ...all(404), anonymous: 303 }
	},
	{ name: 'read a handed-in session', method: 'GET', path: (f) => `/api/sessions/${f.take}`, expect: studentOnly(200) },
	{
		name: 'download the audio of a handed-in session',
		method: 'GET',
		path: (f) => `/api/sessions/${f.take}/audio`,
		expect: studentOnly(200)
	},
	// Mappings shared with a class are read by its members only, and only while their owner teaches it.
	{
		name: 'read a private mapping of the teacher shared with the class',
		method: 'GET',
		path: (f) => `/api/mappings/${f.sharedMapping}`,
		expect: classOnly(200)
	},
	{
		name: 'fork a private mapping of the teacher shared with the class',
		method: 'POST',
		path: (f) => `/api/mappings/${f.sharedMapping}/fork`,
		body: () => ({ json: {} }),
		expect: classOnly(201)
	},
	{
		// Members may read it, so they are told it is not theirs to change; to others it does not exist.
		name: 'save a version of a private mapping of the teacher shared with the class',
		method: 'PUT',
		path: (_f, fresh) => `/api/mappings/${fresh}`,
		body: (f) => ({ json: { document: f.document, baseVersion: 1 } }),
		fresh: async (f) => {
			const id = await createdId(await as.teacher.post('/api/mappings', { data: { document: f.document } }));
			expect((await postForm(as.teacher, `/classes/${f.classId}?/share`, { mappingId: id })).status).toBe(200);
			return id;
		},
		expect: { ...classOnly(200), student: 403 }
	},
	{
		name: 'read a mapping shared with the class that its owner made private later',
		method: 'GET',
		path: (f) => `/api/mappings/${f.revokedMapping}`,
		expect: { ...all(404), anonymous: 401, otherTeacher: 200 }
	},
	// ======== trash, account, password reset, help ========
	{
		name: 'restore a session from the trash (form)',
		method: 'POST',
		path: () => '/trash?/restore',
		body: (_f, fresh) => ({ form: { kind: 'session', id: fresh } }),
		fresh: async (f) => {
			const id = await newSession(as.student, f.privateMapping, false);
			expect((await as.student.delete(`/api/sessions/${id}`)).status()).toBe(204);
			return id;
		},
		expect: { ...all(404), anonymous: 303, student: 200 }
	},
	{
		name: 'restore a mapping from the trash (form)',
		method: 'POST',
		path: () => '/trash?/restore',
		body: (_f, fresh) => ({ form: { kind: 'mapping', id: fresh } }),
		fresh: async (f) => {
			const id = await createdId(await as.student.post('/api/mappings', { data: { document: f.document } }));
			expect((await as.student.delete(`/api/mappings/${id}`)).status()).toBe(204);
			return id;
		},
		expect: { ...all(404), anonymous: 303, student: 200 }
	},
	{
		name: 'delete one’s own account (form, wrong password)',
		method: 'POST',
		path: () => '/account?/delete',
		body: () => ({ form: { password: 'not-my-password-at-all', confirm: 'on' } }),
		expect: { ...all(400), anonymous: 303 }
	},
	{
		name: 'delete one’s own account (form, a new account of each kind)',
		method: 'POST',
		path: () => '/account?/delete',
		body: () => ({ form: { password: FRESH_PASSWORD, confirm: 'on' } }),
		actor: freshPerson,
		expect: all(303) // to the sign-in page, with the account gone
	},
	{
		name: 'create an API token (account form, a new account of each kind)',
		method: 'POST',
		path: () => '/account?/createToken',
		body: () => ({ form: { name: 'Matrix script', expires: '30' } }),
		actor: freshPerson,
		expect: { ...all(200), anonymous: 303 }
	},
	{
		name: 'revoke an API token (account form)',
		method: 'POST',
		path: () => '/account?/revokeToken',
		body: (_f, fresh) => ({ form: { id: fresh } }),
		fresh: () => newToken(as.student),
		// Someone else's token answers like a missing one.
		expect: { ...all(404), anonymous: 303, student: 200 }
	},
	{ name: 'help page', method: 'GET', path: () => '/help', expect: all(200) },
	{
		name: 'forgot-password page',
		method: 'GET',
		path: () => '/forgot-password',
		expect: { ...all(303), anonymous: 200 }
	},
	{
		name: 'ask for a reset link (form)',
		method: 'POST',
		path: () => '/forgot-password',
		body: () => ({ form: { email: 'nobody.here@example.com' } }),
		expect: { ...all(303), anonymous: 200 }
	},
	{
		name: 'reset-password page',
		method: 'GET',
		path: () => '/reset-password?token=not-a-real-token',
		expect: all(200)
	},
	{
		name: 'set a new password with a reset link (form, unknown link)',
		method: 'POST',
		path: () => '/reset-password',
		body: () => ({
			form: { token: 'not-a-real-token', password: 'a-new-password-77', confirm: 'a-new-password-77' }
		}),
		expect: all(400)
	},
	{
		name: 'sign in (form, wrong password)',
		method: 'POST',
		path: () => '/signin',
		body: () => ({ form: { email: DEMO.student2, password: 'not-the-password-1' } }),
		expect: { ...all(303), anonymous: 400 }
	},
	{
		name: 'sign up (form, passwords differ)',
		method: 'POST',
		path: () => '/signup',
		body: () => ({
			form: { name: 'Nobody', email: 'nobody.new@example.com', password: 'first-try-9911', confirm: 'second-try-9911' }
		}),
		expect: { ...all(303), anonymous: 400 }
	},
	{
		name: 'sign out (form)',
		method: 'POST',
		path: () => '/signout',
		body: () => ({ form: {} }),
		actor: newSignIn,
		expect: all(303)
	},
	// ======== admin forms on an account made for each cell ========
	{
		name: 'disable an account (admin form)',
		method: 'POST',
		path: () => '/admin?/disable',
		body: (_f, fresh) => ({ form: { userId: fresh } }),
		fresh: freshTarget,
		expect: adminForm(200)
	},
	{
		name: 'enable an account (admin form)',
		method: 'POST',
		path: () => '/admin?/enable',
		body: (_f, fresh) => ({ form: { userId: fresh } }),
		fresh: freshTarget,
		expect: adminForm(200)
	},
	{
		name: 'send a reset link (admin form)',
		method: 'POST',
		path: () => '/admin?/sendReset',
		body: (_f, fresh) => ({ form: { userId: fresh } }),
		fresh: freshTarget,
		expect: adminForm(200)
	},
	{
		name: 'delete an account (admin form)',
		method: 'POST',
		path: () => '/admin?/remove',
		body: (_f, fresh) => ({ form: { userId: fresh } }),
		fresh: freshTarget,
		expect: adminForm(200)
	},
	{ name: 'OpenAPI document', method: 'GET', path: () => '/api/openapi.json', expect: all(200) }
];

let as: Record<Person, APIRequestContext>;
let fixtures: Fixtures;

test.beforeAll(async () => {
	test.setTimeout(180_000);
	as = await everyone();
	const document = await demoDocument(as.student);
	const publicMapping = await demoId(as.student);
	const privateMapping = await createdId(
		await as.student.post('/api/mappings', { data: { document, name: 'Matrix private' } })
	);
	const session = await newSession(as.student, privateMapping);
	const recording = await createdId(
		await as.student.post('/api/sessions', { data: { mappingId: privateMapping, tempo: 120 } })
	);
	const admin = await apiAs(DEMO.admin);
	const adminPage = await admin.get('/admin?q=lena', { headers: { accept: 'text/html' } });
	const otherStudentId = (await adminPage.text()).match(/name="userId" value="([\w-]+)"/)?.[1] ?? 'unknown';
	await admin.dispose();

	// A class of the teacher with the student as its one member, a drill given to it, and the
	// student's scored take handed in with an audio file.
	const { id: classId, code } = await newClass(as.teacher, 'Matrix class');
	await joinClass(as.student, code);
	const drill = await newDrill(as.teacher, publicMapping);
	const assignment = await newAssignment(as.teacher, classId, drill);
	const take = await newTake(as.student, publicMapping, drill);
	const submission = await submitTake(as.student, assignment, take);
	const share = async (mappingId: string) =>
		expect((await postForm(as.teacher, `/classes/${classId}?/share`, { mappingId })).status).toBe(200);
	const sharedMapping = await createdId(
		await as.teacher.post('/api/mappings', { data: { document, name: 'Matrix shared' } })
	);
	await share(sharedMapping);
	const revokedMapping = await createdId(
		await as.otherTeacher.post('/api/mappings', { data: { document, name: 'Matrix revoked', visibility: 'public' } })
	);
	await share(revokedMapping);
	expect(
		(await as.otherTeacher.patch(`/api/mappings/${revokedMapping}`, { data: { visibility: 'private' } })).status()
	).toBe(200);
	const guest = `matrix.guest.${Date.now()}@example.com`;
	await postForm(as.teacher, `/classes/${classId}?/invite`, { emails: guest });
	const inviteToken = (await waitForMail(guest, /invites you to the class/)).text!.match(/\/join\/([\w-]+)/)![1];

	fixtures = {
		privateMapping,
		publicMapping,
		session,
		recording,
		document,
		otherStudentId,
		classId,
		drill,
		assignment,
		take,
		submission,
		sharedMapping,
		revokedMapping,
		inviteToken
	};
});

test.afterAll(async () => {
	for (const ctx of Object.values(as ?? {})) await ctx.dispose();
});

/**
 * An answer lets the person in: a 2xx, or a redirect anywhere but the sign-in and landing pages
 * (a form that worked sends people on into the app).
 */
const isAllow = (status: number, location: string) =>
	(status >= 200 && status < 300) ||
	(status >= 300 && status < 400 && !location.startsWith('/signin') && location !== '/');
/** The expected answer lets the person in (a visitor's redirect is to the sign-in page). */
const allowExpected = (person: Person, status: number) =>
	(status >= 200 && status < 300) || (status >= 300 && status < 400 && person !== 'anonymous');

for (const row of ROUTES) {
	test(`${row.method} ${row.name}`, async () => {
		test.setTimeout(120_000);
		const wrong: string[] = [];
		const allows: string[] = [];
		for (const person of PEOPLE) {
			const fresh = row.fresh ? await row.fresh(fixtures, person) : '';
			const body = row.body?.(fixtures, fresh);
			const actor = row.actor ? await row.actor(person) : as[person];
			const headers: Record<string, string> = {
				accept: body?.form || body?.multipart || row.method === 'GET' ? 'text/html' : 'application/json',
				// A fresh connection per cell: a kept-alive one may be closed by the server while a slow fixture is made.
				connection: 'close'
			};
			if (body?.type) headers['content-type'] = body.type;
			const response = await actor.fetch(row.path(fixtures, fresh), {
				method: row.method,
				headers,
				...(body?.json !== undefined ? { data: body.json } : {}),
				...(body?.form ? { form: body.form } : {}),
				...(body?.multipart ? { multipart: body.multipart } : {}),
				...(body?.bytes ? { data: body.bytes } : {})
			});
			if (row.actor) await actor.dispose();
			const status = response.status();
			const location = response.headers().location ?? '';
			const expected = row.expect[person];
			if (status !== expected)
				wrong.push(`${person}: ${status}${location ? ` → ${location}` : ''}, expected ${expected}`);
			if (isAllow(status, location) && !allowExpected(person, expected)) allows.push(person);
			if (person === 'anonymous' && status === 303 && isAllow(status, location))
				allows.push(`anonymous (sent on to ${location})`);
			if (status >= 500) wrong.push(`${person}: server error ${status}`);
		}
		expect(allows, 'unexpected allows').toEqual([]);
		expect(wrong).toEqual([]);
	});
}

test('the matrix covers every API route the server documents', async () => {
	const doc = (await (await as.anonymous.get('/api/openapi.json')).json()) as { paths: Record<string, object> };
	const covered = new Set(
		ROUTES.filter((r) => r.path(fixtures, 'x').startsWith('/api/')).map(
			(r) =>
				`${r.method} ${r
					.path(fixtures, 'x')
					.split('?')[0]
					.replace(/^\/api\/([\w-]+)\/[\w-]+/, '/api/$1/{id}')}`
		)
	);
	const documented = Object.entries(doc.paths).flatMap(([path, ops]) =>
		Object.keys(ops).map((method) => `${method.toUpperCase()} ${path}`)
	);
	expect(documented.filter((op) => !covered.has(op))).toEqual([]);
});

// ---- every page, form action and endpoint of src/routes has a row ----

const ROUTES_DIR = fileURLToPath(new URL('../src/routes', import.meta.url));

function routeFiles(dir = ROUTES_DIR): string[] {
	return readdirSync(dir, { withFileTypes: true }).flatMap((e) =>
		e.isDirectory() ? routeFiles(join(dir, e.name)) : [join(dir, e.name)]
	);
}

/** What the app answers, as `METHOD /route/[param]` (`?/action` for form actions). */
function appOperations(): string[] {
	const ops = new Set<string>();
	for (const file of routeFiles()) {
		const name = file.split('/').pop()!;
		const route =
			'/' +
			relative(ROUTES_DIR, file)
				.split('/')
				.slice(0, -1)
				.filter((part) => !/^\(.*\)$/.test(part))
				.join('/');
		const text = readFileSync(file, 'utf8');
		if (name === '+page.svelte' || name === '+page.server.ts') ops.add(`GET ${route}`);
		if (name === '+server.ts')
			for (const m of text.matchAll(/export const (GET|POST|PUT|PATCH|DELETE)\b/g)) ops.add(`${m[1]} ${route}`);
		if (name === '+page.server.ts' && text.includes('export const actions')) {
			const block = text.slice(text.indexOf('export const actions'));
			for (const m of block.matchAll(/^\t(\w+): async/gm)) ops.add(`POST ${route}?/${m[1]}`);
		}
	}
	return [...ops].sort();
}

/** The route a row's request reaches: the one whose pattern matches with the fewest parameters. */
function rowOperation(row: Row, routes: string[]): string | null {
	const [path, query = ''] = row.path(fixtures, 'x').split('?');
	const action =
		row.method === 'POST' && !path.startsWith('/api/') ? (query.match(/^\/(\w+)/)?.[1] ?? 'default') : null;
	const candidates = routes
		.map((op) => op.split(' '))
		.filter(([method, route]) => {
			const [pattern, act] = route.split('?/');
			if (action ? method !== 'POST' || act !== action : method !== row.method || act) return false;
			const re = new RegExp(`^${pattern.replace(/\[[^\]]+\]/g, '[^/]+').replace(/\./g, '\\.')}/?$`);
			return re.test(path);
		})
		.sort((a, b) => (a[1].match(/\[/g)?.length ?? 0) - (b[1].match(/\[/g)?.length ?? 0));
	return candidates.length ? candidates[0].join(' ') : null;
}

test('the matrix has a row for every page, form action, API route and download of the app', () => {
	const ops = appOperations();
	expect(ops.length).toBeGreaterThan(60);
	const covered = new Set(ROUTES.map((r) => rowOperation(r, ops)));
	expect(ops.filter((op) => !covered.has(op))).toEqual([]);
	expect(ROUTES.filter((r) => !rowOperation(r, ops)).map((r) => r.name)).toEqual([]);
	console.log(
		JSON.stringify({
			matrix: 'authorization',
			operations: ops.length,
			rows: ROUTES.length,
			cells: ROUTES.length * PEOPLE.length
		})
	);
});
