// A session's audio in either store: kept under a fresh name, replaced atomically, removed when
// the session is purged from the trash, never left behind by a refused or raced upload.
import { listMappings } from '$lib/server/mappings';
import { removeFiles } from '$lib/server/cleanup';
import { createRehearsal, deleteRehearsal } from '$lib/server/rehearsals';
import { openSessionAudio, storeSessionAudio } from '$lib/server/session-audio';
import { purgeTrash } from '$lib/server/trash';
import { diskStore, s3Store, type UploadStore } from '$lib/server/storage';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoDatabase } from './factories';
import { startS3Fake } from './s3-fake';

let t: Awaited<ReturnType<typeof demoDatabase>>;
let fake: Awaited<ReturnType<typeof startS3Fake>>;
const stores: Record<string, UploadStore> = {};
let mappingId: string;

beforeAll(async () => {
	t = await demoDatabase();
	process.env.UPLOADS_DIR = join(t.file, '..', 'uploads');
	fake = await startS3Fake();
	stores.disk = diskStore(process.env.UPLOADS_DIR);
	stores.s3 = s3Store(fake.settings);
	mappingId = (await listMappings(t.db, t.kai)).find((m) => m.name === 'Two-deck pad set')!.id;
}, 60_000);
afterAll(async () => {
	delete process.env.UPLOADS_DIR;
	await fake.close();
	t.close();
});

const webm = readFileSync('tests/fixtures/take.webm'); // 1.5 s recorded by Chromium's MediaRecorder
const put = (bytes: Uint8Array, type = 'audio/webm') =>
	new Request('http://localhost/', { method: 'PUT', headers: { 'content-type': type }, body: bytes.slice() });

describe.each(['disk', 's3'])('session audio in the %s store', (kind) => {
	it('stores a take, serves it back byte for byte, and a new take replaces it', async () => {
		const store = stores[kind];
		const { id } = await createRehearsal(t.db, t.kai, { mappingId, tempo: 120 });
		expect(await storeSessionAudio(t.db, t.kai, id, put(webm, 'application/octet-stream'), store)).toEqual({
			bytes: webm.length,
			type: 'audio/webm'
		});
		const file = await openSessionAudio(t.db, t.kai, id, store);
		expect(file?.type).toBe('audio/webm');
		expect(Buffer.from(await new Response(file!.stream).arrayBuffer()).equals(webm)).toBe(true);
		const first = (await store.list()).filter((n) => n.startsWith(id));
		expect(first).toHaveLength(1);

		const shorter = webm.subarray(0, 8000);
		await storeSessionAudio(t.db, t.kai, id, put(shorter), store);
		const second = (await store.list()).filter((n) => n.startsWith(id));
		expect(second).toHaveLength(1);
		expect(second[0]).not.toBe(first[0]);
		expect((await openSessionAudio(t.db, t.kai, id, store))?.size).toBe(8000);

		// Deleted, the session keeps its file in the trash; the purge after 30 days removes it.
		await deleteRehearsal(t.db, t.kai, id);
		expect((await store.list()).filter((n) => n.startsWith(id))).toEqual(second);
		const purged = await purgeTrash(t.db, new Date(Date.now() + 31 * 24 * 3600_000));
		expect(purged.audioFiles).toEqual(second);
		await removeFiles(purged.audioFiles, store);
		expect((await store.list()).filter((n) => n.startsWith(id))).toEqual([]);
	});

	it('keeps one file when several takes upload at once', async () => {
		const store = stores[kind];
		const { id } = await createRehearsal(t.db, t.kai, { mappingId, tempo: 120 });
		const sizes = [6000, 9000, 12000, 15000];
		await Promise.all(sizes.map((n) => storeSessionAudio(t.db, t.kai, id, put(webm.subarray(0, n)), store)));
		const left = (await store.list()).filter((n) => n.startsWith(id));
		expect(left).toHaveLength(1);
		const file = await openSessionAudio(t.db, t.kai, id, store);
		const bytes = Buffer.from(await new Response(file!.stream).arrayBuffer());
		expect(sizes).toContain(bytes.length);
		expect(bytes.equals(webm.subarray(0, bytes.length))).toBe(true);
	});

	it("refuses another user's session and a non-audio file, keeping nothing", async () => {
		const store = stores[kind];
		const { id } = await createRehearsal(t.db, t.kai, { mappingId, tempo: 120 });
		const before = await store.list();
		await expect(storeSessionAudio(t.db, t.lena, id, put(webm), store)).rejects.toMatchObject({ status: 404 });
		await expect(
			storeSessionAudio(t.db, t.kai, id, put(Buffer.from('hello, not audio'.repeat(400))), store)
		).rejects.toMatchObject({
			status: 415
		});
		expect(await store.list()).toEqual(before);
	});
});
