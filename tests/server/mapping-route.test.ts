// PUT /api/mappings/[id] called as SvelteKit calls it: a save must name the version it started
// from, so no request can replace a newer version without knowing it.
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';

const dir = mkdtempSync(join(tmpdir(), 'padproof-mapping-route-'));
process.env.PADPROOF_DATA_DIR = dir;
process.env.DATABASE_URL = `file:${join(dir, 'padproof.db')}`;
process.env.UPLOADS_DIR = join(dir, 'uploads');
delete process.env.S3_BUCKET;

const { client, db, prepareDatabase } = await import('$lib/server/db');
const { seedDemo } = await import('$lib/server/db/seed');
const { createMapping, getMapping } = await import('$lib/server/mappings');
const { listUsers } = await import('$lib/server/users');
const { demoMapping } = await import('$lib/engine');
const route = await import('../../src/routes/api/mappings/[id]/+server');

let kai: string;
beforeAll(async () => {
	await prepareDatabase(client, db);
	await seedDemo(db);
	kai = (await listUsers(db, 'kai@')).at(0)!.id;
}, 60_000);
afterAll(() => {
	client.close();
	rmSync(dir, { recursive: true, force: true });
});

const put = (id: string, body: unknown) => {
	const request = new Request(`http://localhost/api/mappings/${id}`, {
		method: 'PUT',
		headers: { 'content-type': 'application/json' },
		body: JSON.stringify(body)
	});
	return route.PUT({ locals: { user: { id: kai } }, params: { id }, request, url: new URL(request.url) } as never);
};

describe('PUT /api/mappings/[id]', () => {
	it('refuses a save without baseVersion with 400, says what to send, and saves nothing', async () => {
		const id = await createMapping(db, kai, { document: demoMapping('two-deck'), name: 'Kai route set' });
		const changed = { ...demoMapping('two-deck'), name: 'Kai route set', tempo: 131 };
		const answer = await put(id, { document: changed });
		expect(answer.status).toBe(400);
		const body = await answer.json();
		expect(body).toEqual({ error: expect.stringMatching(/Send baseVersion/), problems: expect.any(Array) });
		expect(body.problems[0]).toMatchObject({ path: 'baseVersion' });
		const now = await getMapping(db, kai, id);
		expect(now.version).toBe(1);
		expect(now.versions).toHaveLength(1);
		expect(now.document.tempo).toBe(demoMapping('two-deck').tempo);
	});

	it('refuses a base version that is not a version number', async () => {
		const id = await createMapping(db, kai, { document: demoMapping('two-deck'), name: 'Kai route set 2' });
		const answer = await put(id, { document: demoMapping('two-deck'), baseVersion: 0.5 });
		expect(answer.status).toBe(400);
		expect((await answer.json()).error).toMatch(/baseVersion must be a version number/);
		expect((await getMapping(db, kai, id)).versions).toHaveLength(1);
	});

	it('saves from the newest version and answers 409 with the newest from an older one', async () => {
		const id = await createMapping(db, kai, { document: demoMapping('two-deck'), name: 'Kai route set 3' });
		const first = { ...demoMapping('two-deck'), name: 'Kai route set 3', tempo: 127 };
		const saved = await put(id, { document: first, baseVersion: 1 });
		expect(saved.status).toBe(200);
		expect(await saved.json()).toEqual({ version: 2, notes: [] }); // a version 2 document brings no upgrade notes;
		const late = await put(id, { document: { ...first, tempo: 90 }, baseVersion: 1 });
		expect(late.status).toBe(409);
		const body = await late.json();
		expect(body.newest.version).toBe(2);
		expect(body.newest.document.tempo).toBe(127);
		expect((await getMapping(db, kai, id)).document.tempo).toBe(127);
	});
});
