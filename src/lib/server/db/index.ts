import { createClient, type Client, type Transaction } from '@libsql/client';
import { drizzle } from 'drizzle-orm/libsql';
import { migrate } from 'drizzle-orm/libsql/migrator';
import { mkdirSync } from 'node:fs';
import { dirname } from 'node:path';
import { databaseSync, databaseUrl } from '../config';
import * as schema from './schema';
import { upgradeStoredMappings } from './upgrade-documents';

/** Connections the client keeps to a local file (@libsql/client's default, stated here because prepareDatabase sets each up). */
const CONNECTIONS = 20;

export function openDatabase(url = databaseUrl()) {
	if (url.startsWith('file:')) mkdirSync(dirname(url.slice('file:'.length)), { recursive: true });
	// `timeout` is the busy timeout of every pooled connection to a local file (transactions get their own).
	const client = createClient({
		url,
		authToken: process.env.DATABASE_AUTH_TOKEN,
		timeout: 5000,
		concurrency: CONNECTIONS
	});
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

/** A transaction handle as the work of `db.transaction` receives it. */
export type Tx = Parameters<Parameters<Database['transaction']>[0]>[0];

const busy = (e: unknown) => /SQLITE_BUSY|database is locked/i.test(String((e as Error)?.message ?? e));

/**
 * A write transaction that takes the write lock first (`begin immediate`), so what it reads cannot
 * change before it writes. Within this process writes queue (`serialWrite`); another process
 * holding the lock makes it wait and try again, for up to 5 s (a transaction's own connection has
 * no busy timeout). The work must use `tx` only: the queue is held until it ends.
 */
export async function writeTransaction<T>(db: Database, work: (tx: Tx) => Promise<T>): Promise<T> {
	const deadline = Date.now() + 5000;
	for (;;) {
		try {
			return await serialWrite(() => db.transaction(work, { behavior: 'immediate' }));
		} catch (e) {
			if (!busy(e) || Date.now() > deadline) throw e;
			await new Promise((r) => setTimeout(r, 10 + Math.random() * 40));
		}
	}
}

/**
 * Sets the per-connection settings on every connection of a local file's pool: foreign keys, and
 * how commits wait for the disk (config.ts `databaseSync`). Waiting for the disk on every commit
 * (`synchronous = FULL`) made a chunk append wait for an fsync of several milliseconds, on the
 * event loop, since the driver is synchronous (see tests/bench/api-recorders.bench.ts).
 *
 * The pool opens connections lazily and has no hook for new ones, so each is opened here: a
 * transaction holds a connection, `ROLLBACK` in the same script ends it (a safety level cannot be
 * changed inside a transaction) and the pragmas follow on that connection. A connection the pool
 * opens later (after dropping a broken one) keeps SQLite's default, FULL: only slower, never less safe.
 * Its foreign-key setting is the library's default, and a remote libSQL database gets no pragma
 * at all: no delete depends on foreign keys or their cascades (server/cleanup.ts).
 */
async function setUpConnections(client: Client) {
	const sync = databaseSync();
	const held: Transaction[] = [];
	try {
		for (let i = 0; i < CONNECTIONS; i++) {
			// An in-memory database has one connection: the second transaction is refused at once.
			const tx = await client.transaction('deferred').catch(() => null);
			if (!tx) break;
			held.push(tx);
			await tx.executeMultiple(`ROLLBACK; PRAGMA synchronous = ${sync}; PRAGMA foreign_keys = ON;`);
		}
	} finally {
		for (const tx of held) tx.close();
	}
}

/** Brings a database up to the newest schema and documents; a local file also gets WAL and a busy timeout. */
export async function prepareDatabase(client: Client, db: Database, migrationsFolder = 'drizzle') {
	if (client.protocol === 'file') {
		await client.execute('PRAGMA journal_mode = WAL');
		await client.execute('PRAGMA busy_timeout = 5000');
		await setUpConnections(client);
	}
	await migrate(db, { migrationsFolder });
	await upgradeStoredMappings(db);
	// Versions saved before lint counts were kept get theirs once, here, not on every listing.
	const { backfillLintCounts } = await import('../mappings');
	await backfillLintCounts(db);
}

export const { client, db } = openDatabase();
