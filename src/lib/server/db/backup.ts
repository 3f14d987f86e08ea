// Backups of a local SQLite database: `VACUUM INTO` writes a consistent copy while the app runs
// (SQLite docs, "VACUUM INTO": the copy is a snapshot of one read transaction). Restoring puts a
// copy back in place of the database file while the app is stopped.
import { createClient } from '@libsql/client';
import { copyFileSync, existsSync, mkdirSync, renameSync, rmSync } from 'node:fs';
import { basename, join } from 'node:path';
import { backupsDir, ConfigError, databaseUrl } from '../config';

function localFile(url: string): string {
	if (!url.startsWith('file:'))
		throw new ConfigError(
			`Backups here work on a local SQLite file; DATABASE_URL is ${url.split('?')[0]}. ` +
				'Back up a libSQL server with its own tools.'
		);
	return url.slice('file:'.length);
}

const stamp = (at = new Date()) => at.toISOString().replace(/[:.]/g, '-');

/** Writes a timestamped copy of the database into `dir`; answers its path. */
export async function backupDatabase(url = databaseUrl(), dir = backupsDir()): Promise<string> {
	const source = localFile(url);
	if (!existsSync(source)) throw new ConfigError(`There is no database at ${source} to back up.`);
	mkdirSync(dir, { recursive: true });
	const target = join(dir, `${basename(source, '.db')}-${stamp()}.db`);
	const client = createClient({ url, timeout: 5000 });
	try {
		await client.execute({ sql: 'VACUUM INTO ?', args: [target] });
	} finally {
		client.close();
	}
	return target;
}

/** Checks that a file is an intact Padproof database (SQLite integrity check, migrations table). */
export async function checkBackup(file: string): Promise<void> {
	if (!existsSync(file)) throw new ConfigError(`There is no backup at ${file}.`);
	const client = createClient({ url: `file:${file}` });
	try {
		const integrity = await client.execute('PRAGMA integrity_check');
		if (String(integrity.rows[0]?.[0]) !== 'ok') throw new ConfigError(`${file} is damaged: ${integrity.rows[0]?.[0]}`);
		const tables = await client.execute("select name from sqlite_master where name = '__drizzle_migrations'");
		if (!tables.rows.length) throw new ConfigError(`${file} is not a Padproof database.`);
	} catch (e) {
		if (e instanceof ConfigError) throw e;
		throw new ConfigError(`${file} is not a readable SQLite database (${(e as Error).message}).`);
	} finally {
		client.close();
	}
}

/**
 * Puts a backup in place of the database (stop the app first). The current file is kept beside
 * it as `<name>.before-restore-<time>`; its write-ahead log is set aside with it, so it is not
 * replayed onto the restored copy.
 */
export async function restoreDatabase(backup: string, url = databaseUrl()): Promise<{ kept: string | null }> {
	const target = localFile(url);
	await checkBackup(backup);
	let kept: string | null = null;
	if (existsSync(target)) {
		kept = `${target}.before-restore-${stamp()}`;
		renameSync(target, kept);
		for (const suffix of ['-wal', '-shm']) if (existsSync(target + suffix)) renameSync(target + suffix, kept + suffix);
	}
	const partial = `${target}.restoring`;
	copyFileSync(backup, partial);
	renameSync(partial, target);
	rmSync(`${target}-wal`, { force: true });
	rmSync(`${target}-shm`, { force: true });
	return { kept };
}
