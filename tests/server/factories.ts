import { openDatabase, prepareDatabase } from '$lib/server/db';
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
