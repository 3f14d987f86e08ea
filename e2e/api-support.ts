// Request-level helpers for the authorization matrix and the bad-input tests: a signed-in API
// client per person, fixtures made through the real API, and checksums of the database and the
// upload folder of the server under test.
import { createClient } from '@libsql/client';
import { request, type APIRequestContext } from '@playwright/test';
import { parse } from 'devalue';
import { createHash } from 'node:crypto';
import { existsSync, readdirSync, readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { DEMO, DEMO_PASSWORD } from './support';

export const port = Number(process.env.E2E_PORT ?? 4173);
export const origin = `http://localhost:${port}`;
export const dataDir = resolve(`e2e/.data/${port}`);
export const databaseFile = join(dataDir, 'padproof.db');
export const uploadsDir = join(dataDir, 'uploads');

export const PEOPLE = ['anonymous', 'student', 'otherStudent', 'teacher', 'otherTeacher', 'admin'] as const;
export type Person = (typeof PEOPLE)[number];

/** A request context for one person: cookies kept, redirects not followed, the app's origin sent. */
export async function apiAs(email: string | null, password = DEMO_PASSWORD): Promise<APIRequestContext> {
	const ctx = await request.newContext({
		baseURL: origin,
		extraHTTPHeaders: { origin },
		maxRedirects: 0
	});
	if (email) {
		const r = await ctx.post('/api/auth/sign-in/email', { data: { email, password } });
		if (!r.ok()) throw new Error(`sign-in as ${email} failed: ${r.status()} ${await r.text()}`);
	}
	return ctx;
}

/** Signs up a new account and makes it a teacher (a direct write: the test's own setup). */
export async function newTeacher(email: string): Promise<void> {
	const ctx = await apiAs(null);
	const r = await ctx.post('/api/auth/sign-up/email', {
		data: { email, password: 'another-teacher-1234', name: 'Second Teacher' }
	});
	if (!r.ok() && r.status() !== 422) throw new Error(`sign-up failed: ${r.status()} ${await r.text()}`);
	await ctx.dispose();
	const db = createClient({ url: `file:${databaseFile}` });
	await db.execute({ sql: "update user set role = 'teacher' where email = ?", args: [email] });
	db.close();
}

/** The second teacher of the matrix, made by `everyone()`. */
export const OTHER_TEACHER = { email: 'rhea.teacher@mixlab.example', password: 'another-teacher-1234' };

/** Every person of the matrix with a signed-in context (anonymous has none). */
export async function everyone(): Promise<Record<Person, APIRequestContext>> {
	const otherTeacher = OTHER_TEACHER.email;
	await newTeacher(otherTeacher);
	return {
		anonymous: await apiAs(null),
		student: await apiAs(DEMO.student),
		otherStudent: await apiAs(DEMO.student2),
		teacher: await apiAs(DEMO.teacher),
		otherTeacher: await apiAs(otherTeacher, OTHER_TEACHER.password),
		admin: await apiAs(DEMO.admin)
	};
}

/** A document to create mappings with: the demo two-deck mapping as the API returns it. */
export async function demoDocument(ctx: APIRequestContext): Promise<unknown> {
	return (await ctx.get(`/api/mappings/${await demoId(ctx)}?download`)).json();
}

/** The demo mapping of that name (copies made by tests carry the same name, but are no demo). */
export async function demoId(ctx: APIRequestContext, name = 'Two-deck pad set'): Promise<string> {
	const { mappings } = (await (await ctx.get('/api/mappings')).json()) as {
		mappings: { id: string; name: string; demo: boolean }[];
	};
	return mappings.find((m) => m.demo && m.name === name)!.id;
}

export async function createdId(response: Awaited<ReturnType<APIRequestContext['post']>>): Promise<string> {
	if (response.status() !== 201) throw new Error(`fixture not created: ${response.status()} ${await response.text()}`);
	return ((await response.json()) as { id: string }).id;
}

// A WebM file opens with the EBML magic 1A 45 DF A3 (Matroska/WebM container spec).
/** A real 1.5 s WebM/Opus take recorded in Chromium: the server reads an upload's kind from its bytes. */
export const SMALL_WEBM = readFileSync(fileURLToPath(new URL('../tests/fixtures/take.webm', import.meta.url)));

/** A checksum of every row of every table of the server's database. */
export async function databaseChecksum(): Promise<string> {
	const db = createClient({ url: `file:${databaseFile}` });
	const hash = createHash('sha256');
	try {
		const { rows } = await db.execute(
			"select name from sqlite_master where type = 'table' and name not like 'sqlite_%' order by name"
		);
		for (const { name } of rows) {
			const table = String(name);
			const data = await db.execute(`select * from "${table}" order by rowid`);
			hash.update(table);
			hash.update(JSON.stringify(data.rows, (_k, v) => (typeof v === 'bigint' ? String(v) : v)));
		}
	} finally {
		db.close();
	}
	return hash.digest('hex');
}

/** A checksum of the upload folder: every file's path and content, through its subfolders. */
export function uploadsChecksum(): string {
	const hash = createHash('sha256');
	if (!existsSync(uploadsDir)) return hash.digest('hex');
	const walk = (dir: string, prefix: string) => {
		for (const entry of readdirSync(dir, { withFileTypes: true }).sort((a, b) => a.name.localeCompare(b.name))) {
			const path = join(dir, entry.name);
			hash.update(prefix + entry.name);
			if (entry.isDirectory()) walk(path, `${prefix}${entry.name}/`);
			else hash.update(readFileSync(path));
		}
	};
	walk(uploadsDir, '');
	return hash.digest('hex');
}

// ---- Teaching fixtures, made through the app's own forms and API ----

type Response = Awaited<ReturnType<APIRequestContext['post']>>;

/** Posts a form as a browser does (HTML accepted) and answers the status and redirect target. */
export async function postForm(ctx: APIRequestContext, path: string, form: Record<string, string>) {
	const r = await ctx.post(path, { form, headers: { accept: 'text/html' } });
	return { status: r.status(), location: r.headers().location ?? '', response: r };
}

function idFromRedirect(r: { status: number; location: string }, prefix: string): string {
	const id = r.location.match(new RegExp(`^${prefix}/([\\w-]+)`))?.[1];
	if (r.status !== 303 || !id) throw new Error(`expected a redirect to ${prefix}/…, got ${r.status} ${r.location}`);
	return id;
}

/** A class taught by `teacher` (the "Create class" form), with its join code read from its page. */
export async function newClass(teacher: APIRequestContext, name: string): Promise<{ id: string; code: string }> {
	const id = idFromRedirect(await postForm(teacher, '/classes?/create', { name }), '/classes');
	const html = await (await teacher.get(`/classes/${id}`, { headers: { accept: 'text/html' } })).text();
	const code = html.match(/data-testid="join-code"[^>]*>([A-Z0-9]{4}-[A-Z0-9]{4})</)?.[1];
	if (!code) throw new Error('no join code on the class page');
	return { id, code };
}

/** Joins a class with its code (the "Join a class" form). */
export async function joinClass(student: APIRequestContext, code: string): Promise<void> {
	const r = await postForm(student, '/classes?/join', { code });
	if (r.status !== 303) throw new Error(`join failed: ${r.status} ${await r.response.text()}`);
}

/** A drill document (our version 1 format): pad-1 on every beat of one bar at 100 BPM. */
export const DRILL = {
	version: 1,
	name: 'Matrix steady pad',
	tempo: 100,
	countInBars: 0,
	lengthBars: 1,
	windowMs: 40,
	targets: [0, 1, 2, 3].map((beat) => ({ input: 'pad-1', beat, beats: 1 }))
};

export async function newDrill(teacher: APIRequestContext, mappingId: string, name = DRILL.name): Promise<string> {
	return createdId(await teacher.post('/api/drills', { data: { mappingId, document: { ...DRILL, name } } }));
}

/** Gives a drill to a class (the "Give to class" form); answers the new assignment's id. */
export async function newAssignment(teacher: APIRequestContext, classId: string, drillId: string): Promise<string> {
	const links = async () => {
		const html = await (await teacher.get(`/classes/${classId}`, { headers: { accept: 'text/html' } })).text();
		return new Set([...html.matchAll(/href="\/assignments\/([\w-]+)"/g)].map((m) => m[1]));
	};
	const before = await links();
	const r = await postForm(teacher, `/classes/${classId}?/assign`, { drillId, due: '2099-06-01T18:00', tzOffset: '0' });
	if (r.status !== 200) throw new Error(`assign failed: ${r.status}`);
	const added = [...(await links())].filter((id) => !before.has(id));
	if (added.length !== 1) throw new Error(`expected one new assignment, found ${added.length}`);
	return added[0];
}

/** A finished session of `ctx` on a mapping, with its audio. */
export async function newSession(ctx: APIRequestContext, mappingId: string, audio = true): Promise<string> {
	const id = await createdId(await ctx.post('/api/sessions', { data: { mappingId, tempo: 100 } }));
	await ctx.post(`/api/sessions/${id}/chunks`, { data: { seq: 0, events: [{ t: 1, input: null }] } });
	const done = await ctx.patch(`/api/sessions/${id}`, { data: { finish: true } });
	if (!done.ok()) throw new Error(`finish failed: ${done.status()}`);
	if (audio) {
		const put = await ctx.put(`/api/sessions/${id}/audio`, {
			data: SMALL_WEBM,
			headers: { 'content-type': 'audio/webm' }
		});
		if (put.status() !== 201) throw new Error(`audio upload failed: ${put.status()}`);
	}
	return id;
}

/** A session of the student scored as a take of the drill (POST /api/drill-takes). */
export async function newTake(student: APIRequestContext, mappingId: string, drillId: string): Promise<string> {
	const session = await newSession(student, mappingId);
	const r: Response = await student.post('/api/drill-takes', { data: { rehearsalId: session, drillId, zero: 0 } });
	if (r.status() !== 201) throw new Error(`take not scored: ${r.status()} ${await r.text()}`);
	return session;
}

/** Hands in a take with an audio file (the assignment page's multipart form); answers the submission id. */
export async function submitTake(student: APIRequestContext, assignmentId: string, rehearsalId: string) {
	const r = await student.post(`/assignments/${assignmentId}?/submit`, {
		multipart: { rehearsalId, audio: { name: 'take.webm', mimeType: 'audio/webm', buffer: SMALL_WEBM } },
		headers: { accept: 'text/html' }
	});
	return idFromRedirect({ status: r.status(), location: r.headers().location ?? '' }, '/submissions');
}

export const FRESH_PASSWORD = 'fresh-account-4821';

/** Signs up a new account, gives it a role (a direct write: the test's own setup) and signs it in. */
export async function freshAccount(role: 'student' | 'teacher' | 'admin', tag: string) {
	const email = `${tag}.${role}.${Date.now()}.${Math.random().toString(36).slice(2, 8)}@example.com`;
	const password = FRESH_PASSWORD;
	const anon = await apiAs(null);
	const r = await anon.post('/api/auth/sign-up/email', { data: { email, password, name: 'Fresh Person' } });
	await anon.dispose();
	if (!r.ok()) throw new Error(`sign-up failed: ${r.status()} ${await r.text()}`);
	if (role !== 'student') {
		const db = createClient({ url: `file:${databaseFile}` });
		await db.execute({ sql: 'update user set role = ? where email = ?', args: [role, email] });
		db.close();
	}
	return { email, password, ctx: await apiAs(email, password) };
}

/** The id of an account (read from the database: the test's own setup). */
export async function userIdOf(email: string): Promise<string> {
	const db = createClient({ url: `file:${databaseFile}` });
	try {
		const { rows } = await db.execute({ sql: 'select id from user where email = ?', args: [email] });
		if (!rows.length) throw new Error(`no account ${email}`);
		return String(rows[0].id);
	} finally {
		db.close();
	}
}

/**
 * An API token of `ctx`'s person, made through the account page's form as the browser's
 * enhanced form does (the action answers JSON whose data SvelteKit encodes with devalue).
 */
export async function newToken(ctx: APIRequestContext, name = `Matrix token ${Math.random()}`): Promise<string> {
	const r = await ctx.post('/account?/createToken', {
		form: { name, expires: '30' },
		headers: { accept: 'application/json', 'x-sveltekit-action': 'true' }
	});
	const body = (await r.json()) as { type: string; data?: string };
	if (body.type !== 'success' || !body.data) throw new Error(`token not made: ${JSON.stringify(body)}`);
	const data = parse(body.data) as { created?: { id: string } };
	if (!data.created?.id) throw new Error('the account form answered no token id');
	return data.created.id;
}
