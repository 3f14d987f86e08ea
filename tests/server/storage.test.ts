import { diskStore, s3Store, type UploadStore } from '$lib/server/storage';
import { mkdtempSync, rmSync, writeFileSync, existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startS3Fake } from './s3-fake';

let dir: string;
let fake: Awaited<ReturnType<typeof startS3Fake>>;
const stores: Record<string, () => UploadStore> = {};

beforeAll(async () => {
	dir = mkdtempSync(join(tmpdir(), 'padproof-store-'));
	fake = await startS3Fake();
	stores.disk = () => diskStore(join(dir, 'uploads'));
	stores.s3 = () => s3Store(fake.settings);
});
afterAll(async () => {
	await fake.close();
	rmSync(dir, { recursive: true, force: true });
});

const text = async (stream: ReadableStream<Uint8Array>) => Buffer.from(await new Response(stream).arrayBuffer());

function tempFile(bytes: Buffer) {
	const path = join(dir, `temp-${Math.random().toString(36).slice(2)}.part`);
	writeFileSync(path, bytes);
	return path;
}

describe.each(['disk', 's3'])('the %s store', (kind) => {
	it('keeps a file under its name and gives it back whole', async () => {
		const store = stores[kind]();
		expect(store.kind).toBe(kind);
		const bytes = Buffer.from(Uint8Array.from({ length: 300_000 }, (_, i) => (i * 7) % 251));
		const temp = tempFile(bytes);
		await store.put(temp, `take-${kind}.wav`, 'audio/wav');
		expect(existsSync(temp)).toBe(false);
		const file = await store.get(`take-${kind}.wav`);
		expect(file?.size).toBe(bytes.length);
		expect((await text(file!.stream)).equals(bytes)).toBe(true);
		expect(await store.list()).toContain(`take-${kind}.wav`);
	});

	it('answers null for a missing or unsafe name and removes files', async () => {
		const store = stores[kind]();
		expect(await store.get('nothing-here.webm')).toBeNull();
		expect(await store.get('../etc/passwd')).toBeNull();
		await store.put(tempFile(Buffer.from('x')), `gone-${kind}.ogg`, 'audio/ogg');
		await store.remove(`gone-${kind}.ogg`);
		expect(await store.get(`gone-${kind}.ogg`)).toBeNull();
		expect(await store.list()).not.toContain(`gone-${kind}.ogg`);
		await expect(store.put(tempFile(Buffer.from('x')), '../escape.ogg', 'audio/ogg')).rejects.toThrow(/storage name/);
	});
});

describe('the disk store', () => {
	// Uploads always get fresh names; this holds for a name written twice all the same (rename(2)).
	it('replaces a file whole: a reader sees the old or the new bytes, never a mix', async () => {
		const store = stores.disk();
		const name = 'replace.webm';
		await store.put(tempFile(Buffer.alloc(200_000, 1)), name, 'audio/webm');
		const reads = Array.from({ length: 4 }, async () => text((await store.get(name))!.stream));
		await store.put(tempFile(Buffer.alloc(250_000, 2)), name, 'audio/webm');
		for (const bytes of [...(await Promise.all(reads)), await text((await store.get(name))!.stream)]) {
			const first = bytes[0];
			expect(bytes.length).toBe(first === 1 ? 200_000 : 250_000);
			expect(bytes.every((b) => b === first)).toBe(true);
		}
	});
});
