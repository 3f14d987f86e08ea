import { openDatabase, prepareDatabase, type Database } from '$lib/server/db';
import * as schema from '$lib/server/db/schema';
import { createClient } from '@libsql/client';
import { drizzle } from 'drizzle-orm/libsql';
import { seedDemo } from '$lib/server/db/seed';
import { listUsers } from '$lib/server/users';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

/** A migrated, seeded database in a temporary folder; `close()` removes it. */
export async function demoDatabase() {
	const dir = mkdtempSync(join(tmpdir(), 'padproof-test-'));
	const file = join(dir, 'test.db');
	const handle = openDatabase(`file:${file}`);
	await prepareDatabase(handle.client, handle.db);
	await seedDemo(handle.db);
	const people = await listUsers(handle.db);
	const id = (email: string) => people.find((p) => p.email === email)!.id;
	return {
		...handle,
		file,
		teacher: id('tomas@mixlab.example'),
		kai: id('kai@mixlab.example'),
		lena: id('lena@mixlab.example'),
		close() {
			handle.client.close();
			rmSync(dir, { recursive: true, force: true });
		}
	};
}

/**
 * The database file through one connection with foreign keys off, as a remote libSQL database or
 * a connection opened outside prepareDatabase may be: nothing cascades, nothing is refused. One
 * connection, so transactions run with the setting too. `orphans()` lists the rows whose parent
 * is gone (SQLite's own check).
 */
export async function withoutForeignKeys(file: string) {
	const client = createClient({ url: `file:${file}`, concurrency: 1, timeout: 5000 });
	await client.execute('PRAGMA foreign_keys = OFF');
	const [state] = (await client.execute('PRAGMA foreign_keys')).rows;
	if (Number(state.foreign_keys) !== 0) throw new Error('foreign keys are still on');
	const db: Database = drizzle(client, { schema, casing: 'snake_case' });
	return {
		client,
		db,
		async orphans() {
			const rows = (await client.execute('PRAGMA foreign_key_check')).rows;
			return rows.map((r) => `${r.table} → ${r.parent}`);
		}
	};
}
