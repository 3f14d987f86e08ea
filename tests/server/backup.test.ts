// `npm run db:backup` and the restore steps: back up while the database is open, change data,
// restore, and the old data is back.
import { openDatabase, prepareDatabase } from '$lib/server/db';
import { backupDatabase, checkBackup, restoreDatabase } from '$lib/server/db/backup';
import { user } from '$lib/server/db/schema';
import { seedDemo } from '$lib/server/db/seed';
import { eq } from 'drizzle-orm';
import { existsSync, mkdtempSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { basename, join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';

let dir: string;
let url: string;
beforeEach(() => {
	dir = mkdtempSync(join(tmpdir(), 'padproof-backup-'));
	url = `file:${join(dir, 'padproof.db')}`;
});
afterEach(() => rmSync(dir, { recursive: true, force: true }));

const names = async (db: ReturnType<typeof openDatabase>['db']) =>
	(await db.select({ name: user.name }).from(user).orderBy(user.name)).map((r) => r.name);

describe('database backup and restore', () => {
	it('backs up while the app has the database open, and a restore brings the old data back', async () => {
		const app = openDatabase(url);
		await prepareDatabase(app.client, app.db);
		await seedDemo(app.db);
		const before = await names(app.db);

		const file = await backupDatabase(url, join(dir, 'backups'));
		expect(basename(file)).toMatch(/^padproof-\d{4}-\d\d-\d\dT\d\d-\d\d-\d\d-\d{3}Z\.db$/);
		await checkBackup(file);

		// Changes after the backup, some still in the write-ahead log when the app stops.
		await app.db.update(user).set({ name: 'Renamed After Backup' }).where(eq(user.email, 'kai@mixlab.example'));
		await app.db.delete(user).where(eq(user.email, 'omar@mixlab.example'));
		expect(await names(app.db)).toContain('Renamed After Backup');
		app.client.close();

		const { kept } = await restoreDatabase(file, url);
		expect(kept && existsSync(kept)).toBe(true);

		const again = openDatabase(url);
		await prepareDatabase(again.client, again.db);
		expect(await names(again.db)).toEqual(before);
		again.client.close();

		// The replaced database is kept and still holds the later changes.
		const old = openDatabase(`file:${kept}`);
		expect(await names(old.db)).toContain('Renamed After Backup');
		old.client.close();
	}, 60_000);

	it('names each backup by its time, so two backups never overwrite each other', async () => {
		const app = openDatabase(url);
		await prepareDatabase(app.client, app.db);
		const first = await backupDatabase(url, join(dir, 'backups'));
		await new Promise((r) => setTimeout(r, 5));
		const second = await backupDatabase(url, join(dir, 'backups'));
		app.client.close();
		expect(first).not.toBe(second);
		expect(readdirSync(join(dir, 'backups'))).toHaveLength(2);
	});

	it('refuses to restore a file that is not a Padproof database, keeping the current one', async () => {
		const app = openDatabase(url);
		await prepareDatabase(app.client, app.db);
		app.client.close();
		const junk = join(dir, 'junk.db');
		writeFileSync(junk, 'not a database at all');
		await expect(restoreDatabase(junk, url)).rejects.toThrow(/not a readable SQLite database|damaged/);
		await expect(restoreDatabase(join(dir, 'missing.db'), url)).rejects.toThrow(/no backup/);
		expect(readdirSync(dir).filter((n) => n.includes('before-restore'))).toEqual([]);
	});

	it('explains that a libSQL server is backed up with its own tools', async () => {
		await expect(backupDatabase('libsql://db.example.org', dir)).rejects.toThrow(/libSQL server with its own tools/);
	});
});
