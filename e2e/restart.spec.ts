// Integration: a recording survives a server restart. Starts its own `node build` on a spare
// port and database, records half a session, stops and starts the server, records the rest.
import { expect, request, test, type APIRequestContext } from '@playwright/test';
import { spawn, type ChildProcess } from 'node:child_process';
import { mkdirSync, rmSync } from 'node:fs';
import { resolve } from 'node:path';
import { DEMO, DEMO_PASSWORD } from './support';

const port = Number(process.env.E2E_PORT ?? 4173) + 50;
const origin = `http://localhost:${port}`;
const dataDir = resolve(`e2e/.data/restart-${port}`);

async function startServer(): Promise<ChildProcess> {
	const server = spawn('node', ['build'], {
		cwd: resolve('.'),
		env: {
			...process.env,
			PORT: String(port),
			ORIGIN: origin,
			BETTER_AUTH_URL: origin,
			BETTER_AUTH_SECRET: 'restart-secret-restart-secret-0123456',
			PADPROOF_DATA_DIR: dataDir,
			DATABASE_URL: `file:${dataDir}/padproof.db`,
			PADPROOF_DEMO: '1',
			PADPROOF_RATE_LIMIT: 'off'
		},
		stdio: 'ignore'
	});
	for (let i = 0; i < 100; i++) {
		try {
			if ((await fetch(origin)).ok) return server;
		} catch {
			/* not listening yet */
		}
		await new Promise((r) => setTimeout(r, 200));
	}
	server.kill();
	throw new Error('the test server did not start');
}

const stop = (server: ChildProcess) =>
	new Promise<void>((done) => (server.once('exit', () => done()), server.kill('SIGTERM')));

async function signedIn(): Promise<APIRequestContext> {
	const api = await request.newContext({ baseURL: origin, extraHTTPHeaders: { origin } });
	const r = await api.post('/api/auth/sign-in/email', { data: { email: DEMO.student, password: DEMO_PASSWORD } });
	expect(r.ok()).toBe(true);
	return api;
}

const chunk = (seq: number) => ({
	seq,
	events: [
		{ t: seq * 1000 + 10, midi: [0x90, 36, 100], input: { input: 'pad-1', type: 'press' } },
		{ t: seq * 1000 + 500, midi: [0x80, 36, 0], input: { input: 'pad-1', type: 'release' } }
	]
});

test('a session keeps every event exactly once across a server restart', async () => {
	rmSync(dataDir, { recursive: true, force: true });
	mkdirSync(dataDir, { recursive: true });
	let server = await startServer();
	try {
		let api = await signedIn();
		const { mappings } = await (await api.get('/api/mappings')).json();
		const mappingId = mappings.find((m: { name: string }) => m.name === 'Two-deck pad set').id;
		const { id } = await (await api.post('/api/sessions', { data: { mappingId, tempo: 120 } })).json();
		for (const seq of [0, 1, 2])
			expect((await api.post(`/api/sessions/${id}/chunks`, { data: chunk(seq) })).ok()).toBe(true);

		await stop(server);
		server = await startServer();

		api = await signedIn();
		// The browser resends chunk 2 (its answer was lost in the restart) and carries on.
		const again = await (await api.post(`/api/sessions/${id}/chunks`, { data: chunk(2) })).json();
		expect(again).toMatchObject({ duplicate: true, eventCount: 6 });
		for (const seq of [3, 4]) await api.post(`/api/sessions/${id}/chunks`, { data: chunk(seq) });
		const session = await (await api.get(`/api/sessions/${id}`)).json();
		expect(session.events.map((e: { t: number }) => e.t)).toEqual([
			10, 500, 1010, 1500, 2010, 2500, 3010, 3500, 4010, 4500
		]);
	} finally {
		await stop(server);
	}
});
