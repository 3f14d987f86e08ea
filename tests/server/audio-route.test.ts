// The session audio endpoint under concurrency, called as SvelteKit calls it: two uploads to one
// session at once, an upload racing the session's deletion, and deleting without foreign keys.
import { readdirSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import wavefile from 'wavefile';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';

const dir = mkdtempSync(join(tmpdir(), 'padproof-audio-route-'));
process.env.PADPROOF_DATA_DIR = dir;
process.env.DATABASE_URL = `file:${join(dir, 'padproof.db')}`;
process.env.UPLOADS_DIR = join(dir, 'uploads');
delete process.env.S3_BUCKET;

const { client, db, prepareDatabase } = await import('$lib/server/db');
const { seedDemo } = await import('$lib/server/db/seed');
const { appendChunk, createRehearsal } = await import('$lib/server/rehearsals');
const { listMappings } = await import('$lib/server/mappings');
const { listUsers } = await import('$lib/server/users');
const { emptyExpiredTrash } = await import('$lib/server/trash-purge');

/** A day past the trash's 30 days. */
const later = () => new Date(Date.now() + 31 * 24 * 3600_000);
const audio = await import('../../src/routes/api/sessions/[id]/audio/+server');
const session = await import('../../src/routes/api/sessions/[id]/+server');

let kai: string;
let mappingId: string;
beforeAll(async () => {
	await prepareDatabase(client, db);
	await seedDemo(db);
	kai = (await listUsers(db, 'kai@')).at(0)!.id;
	mappingId = (await listMappings(db, kai)).find((m) => m.name === 'Two-deck pad set')!.id;
}, 60_000);
afterAll(() => {
	client.close();
	rmSync(dir, { recursive: true, force: true });
});

/** A mono 16-bit WAV of `seconds` whose samples all equal `level`, so its bytes tell it apart. */
function wav(seconds: number, level: number): Uint8Array {
	const file = new wavefile.WaveFile();
	file.fromScratch(1, 22_050, '16', new Int16Array(seconds * 22_050).fill(level));
	return file.toBuffer();
}

/** A request whose body arrives in 64 KiB pieces with pauses, calling `onPiece` after each. */
function slowPut(bytes: Uint8Array, onPiece: (index: number) => Promise<void> | void = () => {}) {
	let index = 0;
	const body = new ReadableStream<Uint8Array>({
		async pull(controller) {
			const piece = bytes.subarray(index * 65_536, (index + 1) * 65_536);
			if (!piece.length) return controller.close();
			await new Promise((r) => setTimeout(r, 2));
			controller.enqueue(piece.slice());
			await onPiece(index++);
		}
	});
	return new Request('http://localhost/api/sessions/x/audio', {
		method: 'PUT',
		headers: { 'content-type': 'audio/wav' },
		body,
		duplex: 'half'
	} as RequestInit);
}

type Handler = (event: never) => Response | Promise<Response>;
const call = async (handler: Handler, id: string, request = new Request('http://localhost/')) =>
	handler({ locals: { user: { id: kai } }, params: { id }, request, url: new URL(request.url) } as never);

const stored = () => readdirSync(join(dir, 'uploads')).filter((name) => !name.startsWith('.'));
const incoming = () => {
	try {
		return readdirSync(join(dir, 'uploads', '.incoming'));
	} catch {
		return [];
	}
};

describe('PUT /api/sessions/[id]/audio', () => {
	it('keeps one whole file when two uploads to one session run at once', async () => {
		const { id } = await createRehearsal(db, kai, { mappingId, tempo: 120 });
		const first = wav(10, 1111);
		const second = wav(12, 2222);
		const answers = await Promise.all([call(audio.PUT, id, slowPut(first)), call(audio.PUT, id, slowPut(second))]);
		expect(answers.map((a) => a.status)).toEqual([201, 201]);
		const served = new Uint8Array(await (await call(audio.GET, id)).arrayBuffer());
		const same = (a: Uint8Array, b: Uint8Array) => a.length === b.length && a.every((x, i) => x === b[i]);
		expect(same(served, first) || same(served, second)).toBe(true);
		expect(stored().filter((name) => name.startsWith(id))).toHaveLength(1);
		expect(incoming()).toEqual([]);
	});

	it('leaves no file behind when the session is deleted while its audio uploads', async () => {
		const { id } = await createRehearsal(db, kai, { mappingId, tempo: 120 });
		let deleted: Promise<Response> | null = null;
		const upload = call(
			audio.PUT,
			id,
			slowPut(wav(6, 3333), async (index) => {
				if (index === 2) deleted = call(session.DELETE, id);
				if (deleted) await deleted;
			})
		);
		const answer = await upload;
		expect((await deleted!)?.status).toBe(204);
		expect(answer.status).toBe(404);
		expect(stored().filter((name) => name.startsWith(id))).toEqual([]);
		expect(incoming()).toEqual([]);
	});

	it('keeps the audio of a session in the trash, and removes it when the trash is emptied', async () => {
		const { id } = await createRehearsal(db, kai, { mappingId, tempo: 120 });
		expect((await call(audio.PUT, id, slowPut(wav(2, 4444)))).status).toBe(201);
		expect(stored().filter((name) => name.startsWith(id))).toHaveLength(1);
		expect((await call(session.DELETE, id)).status).toBe(204);
		expect(stored().filter((name) => name.startsWith(id))).toHaveLength(1);
		await emptyExpiredTrash(db, later());
		expect(stored().filter((name) => name.startsWith(id))).toEqual([]);
	});
});

describe('DELETE /api/sessions/[id], then emptying the trash', () => {
	it('deletes the chunks explicitly, also on a connection without foreign keys', async () => {
		const { id } = await createRehearsal(db, kai, { mappingId, tempo: 120 });
		await appendChunk(db, kai, id, { seq: 0, events: [] });
		await client.execute('PRAGMA foreign_keys = OFF');
		try {
			expect((await call(session.DELETE, id)).status).toBe(204);
			await emptyExpiredTrash(db, later());
		} finally {
			await client.execute('PRAGMA foreign_keys = ON');
		}
		const left = await client.execute({
			sql: 'select count(*) as n from rehearsal_chunk where rehearsal_id = ?',
			args: [id]
		});
		expect(Number(left.rows[0].n)).toBe(0);
	});
});
