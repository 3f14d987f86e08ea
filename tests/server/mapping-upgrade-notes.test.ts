// A version 1 mapping document that the upgrade may not keep exactly (a rack in focus mode on some
// pads and playing its second effect on others) tells the person so wherever it is read: the
// mapping endpoints answer its notes, and the start-up upgrade of stored documents logs them.
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { eq } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';

const dir = mkdtempSync(join(tmpdir(), 'padproof-upgrade-notes-'));
process.env.PADPROOF_DATA_DIR = dir;
process.env.DATABASE_URL = `file:${join(dir, 'padproof.db')}`;
process.env.UPLOADS_DIR = join(dir, 'uploads');

const { client, db, prepareDatabase } = await import('$lib/server/db');
const { seedDemo } = await import('$lib/server/db/seed');
const { mappingVersion } = await import('$lib/server/db/schema');
const { upgradeStoredMappings } = await import('$lib/server/db/upgrade-documents');
const { getMapping } = await import('$lib/server/mappings');
const { listUsers } = await import('$lib/server/users');
const collection = await import('../../src/routes/api/mappings/+server');
const one = await import('../../src/routes/api/mappings/[id]/+server');

const mixed = JSON.parse(
	readFileSync(new URL('../fixtures/v1-focus-and-slot-2.mapping.json', import.meta.url), 'utf8')
) as { version: 1; name: string };
const clean = JSON.parse(readFileSync(new URL('../engine/fixtures/v1-demos.json', import.meta.url), 'utf8'))[
	'two-deck'
];
const NOTE = /^Rack 1 played only its first effect on some pads .* try rack 1's pads before you play live\.$/;

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

type Handler = (event: never) => Response | Promise<Response>;
const call = (handler: Handler, method: string, body: unknown, id = '') => {
	const request = new Request('http://localhost/api/mappings', {
		method,
		headers: { 'content-type': 'application/json' },
		body: JSON.stringify(body)
	});
	return handler({ locals: { user: { id: kai } }, params: { id }, request, url: new URL(request.url) } as never);
};

describe('the mapping endpoints answer upgrade notes', () => {
	it('POST answers the notes of a version 1 document and saves it as version 2', async () => {
		const res = await call(collection.POST, 'POST', { document: mixed });
		expect(res.status).toBe(201);
		const body = await res.json();
		expect(body.notes).toEqual([expect.stringMatching(NOTE)]);
		expect((await getMapping(db, kai, body.id)).document.version).toBe(2);
	});

	it('POST answers an empty list for a version 2 document and for a version 1 document inside the contract', async () => {
		const old = await (await call(collection.POST, 'POST', { document: clean })).json();
		expect(old.notes).toEqual([]);
		const v2 = (await getMapping(db, kai, old.id)).document;
		expect((await (await call(collection.POST, 'POST', { document: v2, name: 'Copy' })).json()).notes).toEqual([]);
	});

	it('PUT answers the notes when a version 1 document becomes the next version', async () => {
		const { id } = await (await call(collection.POST, 'POST', { document: clean })).json();
		const res = await call(one.PUT, 'PUT', { document: mixed, baseVersion: 1 }, id);
		expect(res.status).toBe(200);
		expect(await res.json()).toEqual({ version: 2, notes: [expect.stringMatching(NOTE)] });
	});

	it('a refused document still answers the refusal, not notes', async () => {
		const res = await call(collection.POST, 'POST', { document: { ...mixed, decks: 3 } });
		expect(res.status).toBe(400);
		expect(await res.json()).not.toHaveProperty('notes');
	});
});

describe('the start-up upgrade of stored documents', () => {
	it('logs one line per mapping with notes, naming it and its versions', async () => {
		const { id } = await (await call(collection.POST, 'POST', { document: clean, name: 'Kept since v1' })).json();
		await call(one.PUT, 'PUT', { document: { ...clean, name: 'Kept since v1' }, baseVersion: 1 }, id);
		// Both versions back as an older release stored them: the focus rack mixed with slot 2.
		await db.update(mappingVersion).set({ document: mixed }).where(eq(mappingVersion.mappingId, id));
		const { id: plain } = await (await call(collection.POST, 'POST', { document: clean, name: 'Plain' })).json();
		await db.update(mappingVersion).set({ document: clean }).where(eq(mappingVersion.mappingId, plain));

		const log = vi.fn();
		expect(await upgradeStoredMappings(db, log)).toBe(3);
		expect(log).toHaveBeenCalledTimes(1);
		const [line] = log.mock.calls[0];
		expect(line).toMatch(
			new RegExp(
				`^Mapping "Kept since v1" \\(${id}\\), versions 1, 2, upgraded from document version 1 to 2: Rack 1 played`
			)
		);
		expect(line.split('Rack 1 played').length).toBe(2);
		expect(await upgradeStoredMappings(db, log)).toBe(0);
		expect(log).toHaveBeenCalledTimes(1);
	});
});
