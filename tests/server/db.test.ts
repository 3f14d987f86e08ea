import { openDatabase, prepareDatabase } from '$lib/server/db';
import { user } from '$lib/server/db/schema';
import { DEMO_CLASS, DEMO_USERS, seedDemo } from '$lib/server/db/seed';
import { assignmentFor, assignmentsOf } from '$lib/server/assignments';
import { joinedClasses, roster, taughtClasses } from '$lib/server/classes';
import { checkDrill, drillFor } from '$lib/server/drills';
import { getMapping } from '$lib/server/mappings';
import { changeRole, listUsers, RoleChangeError } from '$lib/server/users';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';

let dir: string;
let handle: ReturnType<typeof openDatabase>;

beforeEach(async () => {
	dir = mkdtempSync(join(tmpdir(), 'padproof-db-'));
	handle = openDatabase(`file:${join(dir, 'nested', 'test.db')}`);
	await prepareDatabase(handle.client, handle.db);
});

afterEach(() => {
	handle.client.close();
	rmSync(dir, { recursive: true, force: true });
});

describe('database module', () => {
	it('creates the file in a missing folder and applies every migration', async () => {
		const tables = await handle.client.execute("select name from sqlite_master where type = 'table' order by name");
		const names = tables.rows.map((r) => r.name);
		expect(names).toEqual(
			expect.arrayContaining(['user', 'session', 'account', 'verification', '__drizzle_migrations'])
		);
	});

	it('puts a local file in WAL mode with a busy timeout', async () => {
		const mode = await handle.client.execute('PRAGMA journal_mode');
		const timeout = await handle.client.execute('PRAGMA busy_timeout');
		expect(String(mode.rows[0][0]).toLowerCase()).toBe('wal');
		expect(Number(timeout.rows[0][0])).toBe(5000);
	});

	it('sets up every pooled connection: commits without waiting for the disk, foreign keys on', async () => {
		// Twenty open transactions hold the pool's twenty connections at once.
		const held = await Promise.all(Array.from({ length: 20 }, () => handle.client.transaction('read')));
		try {
			for (const tx of held) {
				expect(Number((await tx.execute('PRAGMA synchronous')).rows[0][0])).toBe(1); // NORMAL
				expect(Number((await tx.execute('PRAGMA foreign_keys')).rows[0][0])).toBe(1);
			}
		} finally {
			for (const tx of held) tx.close();
		}
	});

	it('waits for the disk on every commit with PADPROOF_DB_SYNC=full', async () => {
		process.env.PADPROOF_DB_SYNC = 'full';
		const other = openDatabase(`file:${join(dir, 'full.db')}`);
		try {
			await prepareDatabase(other.client, other.db);
			expect(Number((await other.client.execute('PRAGMA synchronous')).rows[0][0])).toBe(2); // FULL
		} finally {
			delete process.env.PADPROOF_DB_SYNC;
			other.client.close();
		}
	});

	it('applies migrations once: preparing twice keeps the data', async () => {
		await handle.db.insert(user).values({ id: 'x', name: 'X', email: 'x@example.com' });
		await prepareDatabase(handle.client, handle.db);
		expect(await handle.db.select().from(user)).toHaveLength(1);
	});

	it('gives a new account the student role by default', async () => {
		await handle.db.insert(user).values({ id: 'y', name: 'Y', email: 'y@example.com' });
		const [row] = await handle.db.select().from(user);
		expect(row.role).toBe('student');
	});
});

// Seeding hashes five passwords (scrypt): seconds on a busy machine.
describe('demo school', { timeout: 30_000 }, () => {
	it('seeds one admin, one teacher and three students, once', async () => {
		expect(await seedDemo(handle.db)).toBe(DEMO_USERS.length);
		expect(await seedDemo(handle.db)).toBe(0);
		const roles = (await listUsers(handle.db)).map((u) => u.role).sort();
		expect(roles).toEqual(['admin', 'student', 'student', 'student', 'teacher']);
	});

	it('gives the teacher one class of two students with a valid drill due in a week, once', async () => {
		await seedDemo(handle.db);
		await seedDemo(handle.db);
		const id = async (part: string) => (await listUsers(handle.db, part))[0].id;
		const [tomas, kai, lena] = [await id('tomas@'), await id('kai@'), await id('lena@')];
		const taught = await taughtClasses(handle.db, tomas);
		expect(taught.map((c) => c.name)).toEqual([DEMO_CLASS.name]);
		expect((await roster(handle.db, DEMO_CLASS.id)).map((r) => r.email).sort()).toEqual([
			'lena@mixlab.example',
			'omar@mixlab.example'
		]);
		expect(await joinedClasses(handle.db, kai)).toEqual([]);
		const due = await assignmentsOf(handle.db, lena);
		expect(due).toHaveLength(1);
		const week = 7 * 24 * 3600 * 1000;
		expect(Math.abs(due[0].dueAt.getTime() - (Date.now() + week))).toBeLessThan(60_000);
		expect(due[0].className).toBe(DEMO_CLASS.name);
		// The student reaches the drill through the assignment, and it fits the mapping it names.
		const given = await assignmentFor(handle.db, lena, due[0].id);
		const d = await drillFor(handle.db, lena, given.drillId);
		const m = await getMapping(handle.db, lena, d.row.mappingId);
		expect(checkDrill(d.document, m.document).targets).toHaveLength(5);
	});
});

describe('changeRole', { timeout: 30_000 }, () => {
	it('promotes a student to teacher', async () => {
		await seedDemo(handle.db);
		const kai = (await listUsers(handle.db, 'kai@')).at(0)!;
		expect((await changeRole(handle.db, kai.id, 'teacher')).role).toBe('teacher');
		expect((await listUsers(handle.db, 'kai@'))[0].role).toBe('teacher');
	});

	it('refuses to demote the last admin', async () => {
		await seedDemo(handle.db);
		const ines = (await listUsers(handle.db, 'ines@'))[0];
		await expect(changeRole(handle.db, ines.id, 'student')).rejects.toBeInstanceOf(RoleChangeError);
	});

	it('searches by name or email, treating % as a plain character', async () => {
		await seedDemo(handle.db);
		expect((await listUsers(handle.db, 'Osei')).map((u) => u.email)).toEqual(['lena@mixlab.example']);
		expect(await listUsers(handle.db, '%')).toEqual([]);
		await handle.db.insert(user).values({ id: 'p', name: '100% Vinyl', email: 'pct@example.com' });
		expect((await listUsers(handle.db, '0%')).map((u) => u.name)).toEqual(['100% Vinyl']);
	});
});
