// sessions.chunks_per_s: appends of 20-event chunks to a local SQLite file through the same
// server module the chunk endpoint uses.
import { openDatabase, prepareDatabase } from '$lib/server/db';
import { seedDemo } from '$lib/server/db/seed';
import { listMappings } from '$lib/server/mappings';
import { appendChunk, createRehearsal } from '$lib/server/rehearsals';
import { listUsers } from '$lib/server/users';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Figure } from './run';

export default async function (report: (f: Figure) => void) {
	const dir = mkdtempSync(join(tmpdir(), 'padproof-bench-'));
	const { client, db } = openDatabase(`file:${join(dir, 'bench.db')}`);
	try {
		await prepareDatabase(client, db);
		await seedDemo(db);
		const kai = (await listUsers(db, 'kai@'))[0].id;
		const mappingId = (await listMappings(db, kai))[0].id;
		const { id } = await createRehearsal(db, kai, { mappingId, tempo: 120 });
		const chunk = (seq: number) => ({
			seq,
			events: Array.from({ length: 20 }, (_, i) => ({
				t: seq * 2000 + i * 100,
				midi: [i % 2 ? 0x80 : 0x90, 36 + (i % 16), i % 2 ? 0 : 100],
				input: { input: `pad-${1 + (i % 16)}`, type: i % 2 ? ('release' as const) : ('press' as const) }
			}))
		});
		for (let s = 0; s < 20; s++) await appendChunk(db, kai, id, chunk(s)); // warm up
		const count = 500;
		const started = performance.now();
		for (let s = 20; s < 20 + count; s++) await appendChunk(db, kai, id, chunk(s));
		const seconds = (performance.now() - started) / 1000;
		report({ name: 'sessions.chunks_per_s', value: Math.round(count / seconds), unit: 'chunks/s' });
	} finally {
		client.close();
		rmSync(dir, { recursive: true, force: true });
	}
}
