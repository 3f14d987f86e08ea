// The authorization matrix: every route (pages, form actions, API, file downloads) × every kind
// of person → the status the built app must answer. One table; a cell that answers anything else
// fails, and an answer of 2xx/3xx-into-the-app where a refusal is expected counts as an allow
// that must not happen.
//
// To add a route: add a row to ROUTES. `expect` gives the status for each person; the helpers
// below cover the usual shapes (everyone signed in, owner only, teachers, admins). `fresh`
// makes a new fixture for every cell (for DELETE and other one-time requests).
import { expect, test, type APIRequestContext } from '@playwright/test';
import { apiAs, createdId, demoDocument, demoId, everyone, PEOPLE, SMALL_WEBM, type Person } from './api-support';
import { DEMO } from './support';

type Expect = Record<Person, number>;
interface Fixtures {
	privateMapping: string; // the student's private mapping
	publicMapping: string; // the teacher's public demo mapping
	session: string; // the student's finished session, with audio
	recording: string; // the student's unfinished recording
	document: unknown;
	otherStudentId: string;
}
interface Row {
	name: string;
	method: 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';
	path: (f: Fixtures, fresh: string) => string;
	body?: (f: Fixtures) => { json?: unknown; form?: Record<string, string>; bytes?: Buffer; type?: string };
	/** Makes a new fixture for each cell; its id is passed to `path` as `fresh`. */
	fresh?: (f: Fixtures) => Promise<string>;
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
		name: 'save a version of a private mapping',
		method: 'PUT',
		path: (f) => `/api/mappings/${f.privateMapping}`,
		body: (f) => ({ json: { document: f.document } }),
		expect: studentOnly(200)
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
		name: 'save a version of a public mapping',
		method: 'PUT',
		path: (f) => `/api/mappings/${f.publicMapping}`,
		body: (f) => ({ json: { document: f.document } }),
		expect: teacherOwns(200)
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
	{ name: 'OpenAPI document', method: 'GET', path: () => '/api/openapi.json', expect: all(200) }
];

let as: Record<Person, APIRequestContext>;
let fixtures: Fixtures;

test.beforeAll(async () => {
	as = await everyone();
	const document = await demoDocument(as.student);
	const privateMapping = await createdId(
		await as.student.post('/api/mappings', { data: { document, name: 'Matrix private' } })
	);
	const session = await createdId(
		await as.student.post('/api/sessions', { data: { mappingId: privateMapping, tempo: 120 } })
	);
	await as.student.post(`/api/sessions/${session}/chunks`, { data: { seq: 0, events: [{ t: 1, input: null }] } });
	await as.student.patch(`/api/sessions/${session}`, { data: { finish: true } });
	const audio = await as.student.put(`/api/sessions/${session}/audio`, {
		data: SMALL_WEBM,
		headers: { 'content-type': 'audio/webm' }
	});
	expect(audio.status()).toBe(201);
	const recording = await createdId(
		await as.student.post('/api/sessions', { data: { mappingId: privateMapping, tempo: 120 } })
	);
	const admin = await apiAs(DEMO.admin);
	const adminPage = await admin.get('/admin?q=lena', { headers: { accept: 'text/html' } });
	const otherStudentId = (await adminPage.text()).match(/name="userId" value="([\w-]+)"/)?.[1] ?? 'unknown';
	await admin.dispose();
	fixtures = {
		privateMapping,
		publicMapping: await demoId(as.student),
		session,
		recording,
		document,
		otherStudentId
	};
});

test.afterAll(async () => {
	for (const ctx of Object.values(as ?? {})) await ctx.dispose();
});

const isAllow = (status: number) => status >= 200 && status < 300;

for (const row of ROUTES) {
	test(`${row.method} ${row.name}`, async () => {
		const wrong: string[] = [];
		const allows: string[] = [];
		for (const person of PEOPLE) {
			const fresh = row.fresh ? await row.fresh(fixtures) : '';
			const body = row.body?.(fixtures);
			const headers: Record<string, string> = {
				accept: body?.form || row.method === 'GET' ? 'text/html' : 'application/json'
			};
			if (body?.type) headers['content-type'] = body.type;
			const response = await as[person].fetch(row.path(fixtures, fresh), {
				method: row.method,
				headers,
				...(body?.json !== undefined ? { data: body.json } : {}),
				...(body?.form ? { form: body.form } : {}),
				...(body?.bytes ? { data: body.bytes } : {})
			});
			const status = response.status();
			const expected = row.expect[person];
			if (status !== expected) wrong.push(`${person}: ${status}, expected ${expected}`);
			if (isAllow(status) && !isAllow(expected)) allows.push(person);
		}
		expect(allows, 'unexpected allows').toEqual([]);
		expect(wrong).toEqual([]);
	});
}

test('the matrix covers every API route the server has', async () => {
	const doc = (await (await as.anonymous.get('/api/openapi.json')).json()) as { paths: Record<string, object> };
	const covered = new Set(
		ROUTES.filter((r) => r.path({ ...fixtures }, 'x').startsWith('/api/')).map(
			(r) =>
				`${r.method} ${r
					.path(fixtures, 'x')
					.split('?')[0]
					.replace(/\/api\/(mappings|sessions)\/[\w-]+/, '/api/$1/{id}')}`
		)
	);
	const documented = Object.entries(doc.paths).flatMap(([path, ops]) =>
		Object.keys(ops).map((method) => `${method.toUpperCase()} ${path}`)
	);
	expect(documented.filter((op) => !covered.has(op))).toEqual([]);
});
