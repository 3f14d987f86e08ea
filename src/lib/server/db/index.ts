import { createClient, type Client } from '@libsql/client';
import { drizzle } from 'drizzle-orm/libsql';
import { migrate } from 'drizzle-orm/libsql/migrator';
import { mkdirSync } from 'node:fs';
import { dirname } from 'node:path';
import { databaseUrl } from '../config';
import * as schema from './schema';
import { upgradeStoredMappings } from './upgrade-documents';

export function openDatabase(url = databaseUrl()) {
	if (url.startsWith('file:')) mkdirSync(dirname(url.slice('file:'.length)), { recursive: true });
	// `timeout` is the busy timeout of every pooled connection to a local file (transactions get their own).
	const client = createClient({ url, authToken: process.env.DATABASE_AUTH_TOKEN, timeout: 5000 });
	return { client, db: drizzle(client, { schema, casing: 'snake_case' }) };
}

export type Database = ReturnType<typeof openDatabase>['db'];

let writes: Promise<unknown> = Promise.resolve();

/**
 * Runs write transactions of this process one after another. SQLite allows one writer at a time;
 * pooled connections that collide wait in SQLite's busy handler, which sleeps in steps of up to
 * 100 ms — queueing them here instead keeps a burst of chunk appends fast.
 */
export function serialWrite<T>(work: () => Promise<T>): Promise<T> {
	const run = writes.then(work, work);
	writes = run.catch(() => undefined);
	return run;
}

/** Brings a database up to the newest schema and documents; a local file also gets WAL and a busy timeout. */
export async function prepareDatabase(client: Client, db: Database, migrationsFolder = 'drizzle') {
	if (client.protocol === 'file') {
		await client.execute('PRAGMA journal_mode = WAL');
		await client.execute('PRAGMA busy_timeout = 5000');
		await client.execute('PRAGMA foreign_keys = ON');
	}
	await migrate(db, { migrationsFolder });
	await upgradeStoredMappings(db);
}

export const { client, db } = openDatabase();
