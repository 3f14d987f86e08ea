// Request-level helpers for the authorization matrix and the bad-input tests: a signed-in API
// client per person, fixtures made through the real API, and checksums of the database and the
// upload folder of the server under test.
import { createClient } from '@libsql/client';
import { request, type APIRequestContext } from '@playwright/test';
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

/** Every person of the matrix with a signed-in context (anonymous has none). */
export async function everyone(): Promise<Record<Person, APIRequestContext>> {
	const otherTeacher = 'rhea.teacher@mixlab.example';
	await newTeacher(otherTeacher);
	return {
		anonymous: await apiAs(null),
		student: await apiAs(DEMO.student),
		otherStudent: await apiAs(DEMO.student2),
		teacher: await apiAs(DEMO.teacher),
		otherTeacher: await apiAs(otherTeacher, 'another-teacher-1234'),
		admin: await apiAs(DEMO.admin)
	};
}

/** A document to create mappings with: the demo two-deck mapping as the API returns it. */
export async function demoDocument(ctx: APIRequestContext): Promise<unknown> {
	const { mappings } = (await (await ctx.get('/api/mappings')).json()) as { mappings: { id: string; name: string }[] };
	const demo = mappings.find((m) => m.name === 'Two-deck pad set')!;
	return (await ctx.get(`/api/mappings/${demo.id}?download`)).json();
}

export async function demoId(ctx: APIRequestContext, name = 'Two-deck pad set'): Promise<string> {
	const { mappings } = (await (await ctx.get('/api/mappings')).json()) as { mappings: { id: string; name: string }[] };
	return mappings.find((m) => m.name === name)!.id;
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
