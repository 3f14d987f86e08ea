// The built server as a school runs it: multi-megabyte uploads through `node build`, the body
// limits and security headers of every answer, and the production start (`npm run serve`): its
// refusals of unsafe settings, no published demo password, rate limits on, HSTS behind https.
import { expect, request, test, type APIRequestContext } from '@playwright/test';
import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync, rmSync } from 'node:fs';
import http from 'node:http';
import { resolve } from 'node:path';
import wavefile from 'wavefile';
import { DEMO, DEMO_PASSWORD } from './support';

const SECRET = 'serve-secret-serve-secret-serve-secret-01';

/** A 3-minute mono 44.1 kHz 16-bit WAV of a quiet 220 Hz tone: 15.9 MB, like a long take. */
function threeMinuteWav(): Buffer {
	const rate = 44_100;
	const samples = new Int16Array(180 * rate);
	for (let i = 0; i < samples.length; i++) samples[i] = Math.round(3000 * Math.sin((2 * Math.PI * 220 * i) / rate));
	const file = new wavefile.WaveFile();
	file.fromScratch(1, rate, '16', samples);
	return Buffer.from(file.toBuffer());
}

async function signedIn(origin: string, email: string, password: string): Promise<APIRequestContext> {
	const api = await request.newContext({ baseURL: origin, extraHTTPHeaders: { origin } });
	const r = await api.post('/api/auth/sign-in/email', { data: { email, password } });
	expect(r.status(), await r.text()).toBe(200);
	return api;
}

async function uploadTake(api: APIRequestContext, wav: Buffer) {
	const { data: mappings } = { data: await (await api.get('/api/mappings')).json() };
	const mappingId = mappings.mappings[0].id;
	const created = await api.post('/api/sessions', { data: { mappingId, tempo: 120 } });
	expect(created.status()).toBe(201);
	const { id } = await created.json();
	const started = performance.now();
	const put = await api.put(`/api/sessions/${id}/audio`, { data: wav, headers: { 'content-type': 'audio/wav' } });
	const ms = Math.round(performance.now() - started);
	expect(put.status(), await put.text()).toBe(201);
	expect(await put.json()).toEqual({ bytes: wav.length, type: 'audio/wav' });
	const back = await api.get(`/api/sessions/${id}/audio`);
	expect(back.headers()['content-type']).toBe('audio/wav');
	expect(Buffer.from(await back.body()).equals(wav)).toBe(true);
	return { id, ms };
}

test.describe('node build', () => {
	test('takes a 3-minute WAV (15.9 MB) and gives it back byte for byte', async ({ baseURL }) => {
		const api = await signedIn(baseURL!, DEMO.student, DEMO_PASSWORD);
		const wav = threeMinuteWav();
		const { ms } = await uploadTake(api, wav);
		test.info().annotations.push({ type: 'upload', description: `${(wav.length / 1e6).toFixed(1)} MB in ${ms} ms` });
		console.log(`upload: ${wav.length} bytes in ${ms} ms`);
	});

	test('refuses a picture sent as audio (415) and an oversized declared upload before reading it (413)', async ({
		baseURL
	}) => {
		const api = await signedIn(baseURL!, DEMO.student, DEMO_PASSWORD);
		const { mappings } = await (await api.get('/api/mappings')).json();
		const { id } = await (await api.post('/api/sessions', { data: { mappingId: mappings[0].id, tempo: 120 } })).json();
		const png = Buffer.concat([Buffer.from('89504e470d0a1a0a0000000d49484452', 'hex'), Buffer.alloc(600_000)]);
		const refused = await api.put(`/api/sessions/${id}/audio`, {
			data: png,
			headers: { 'content-type': 'audio/webm' }
		});
		expect(refused.status()).toBe(415);
		expect(await refused.json()).toMatchObject({ error: expect.stringMatching(/Audio must be .*png/), problems: [] });

		// 300 MB declared, 64 KiB sent: the answer comes before the rest would have been read.
		const cookie = (await api.storageState()).cookies.map((c) => `${c.name}=${c.value}`).join('; ');
		const answer = await new Promise<{ status: number; body: string }>((done, fail) => {
			const url = new URL(`/api/sessions/${id}/audio`, baseURL);
			const req = http.request(url, {
				method: 'PUT',
				headers: { cookie, origin: baseURL!, 'content-type': 'audio/wav', 'content-length': String(300 << 20) }
			});
			req.on('response', (res) => {
				let body = '';
				res.on('data', (d) => (body += d));
				res.on('end', () => {
					done({ status: res.statusCode!, body });
					req.destroy();
				});
			});
			req.on('error', fail);
			req.write(Buffer.alloc(65_536));
		});
		expect(answer.status).toBe(413);
		expect(JSON.parse(answer.body)).toEqual({ error: expect.stringMatching(/larger than 200 MB/), problems: [] });
	});

	test('caps the bodies of pages and the auth endpoints at 1 MiB, in the one error shape', async ({ baseURL }) => {
		const api = await request.newContext({ baseURL, extraHTTPHeaders: { origin: baseURL! } });
		const big = 'x'.repeat(2 << 20);
		const form = await api.post('/signin', { form: { email: 'a@b.example', password: big } });
		expect(form.status()).toBe(413);
		expect(await form.json()).toEqual({ error: 'The request is too large (over 1 MiB).', problems: [] });
		const auth = await api.post('/api/auth/sign-in/email', { data: { email: 'a@b.example', password: big } });
		expect(auth.status()).toBe(413);
		expect(await auth.json()).toEqual({ error: 'The request is too large (over 1 MiB).', problems: [] });
		// better-auth's own refusals get the shape too (its `message` and `code` stay for its client).
		const broken = await api.post('/api/auth/sign-in/email', {
			data: Buffer.from('{"email": broken'),
			headers: { 'content-type': 'application/json' }
		});
		expect(broken.status()).toBe(400);
		expect(await broken.json()).toMatchObject({ error: expect.any(String), problems: expect.any(Array) });
		const wrong = await api.post('/api/auth/sign-in/email', {
			data: { email: 'nobody@b.example', password: 'wrong-guess-1' }
		});
		expect(wrong.status()).toBe(401);
		expect(await wrong.json()).toMatchObject({ error: expect.any(String), problems: expect.any(Array) });
	});

	test('sends the security headers with pages, API answers and static files', async ({ baseURL }) => {
		const api = await request.newContext({ baseURL });
		const page = await api.get('/signin');
		const csp = page.headers()['content-security-policy'];
		expect(csp).toContain("frame-ancestors 'none'");
		expect(csp).toMatch(/script-src 'self' blob: 'nonce-[\w+/=]+'/);
		expect(csp).toContain("object-src 'none'");
		expect(page.headers()['x-content-type-options']).toBe('nosniff');
		expect(page.headers()['referrer-policy']).toBe('same-origin');
		expect(page.headers()['x-frame-options']).toBe('DENY');
		expect(page.headers()['strict-transport-security']).toBeUndefined(); // plain http here

		const json = await api.get('/api/mappings');
		expect(json.status()).toBe(401);
		expect(json.headers()['x-content-type-options']).toBe('nosniff');
		expect(json.headers()['content-security-policy']).toContain("default-src 'none'");

		const script = (await page.text()).match(/\/_app\/immutable\/[\w/.-]+\.js/)![0];
		const asset = await api.get(script);
		expect(asset.status()).toBe(200);
		expect(asset.headers()['x-content-type-options']).toBe('nosniff');
	});
});

// ---- production starts (`npm run serve`) on a spare port and data folder of their own ----

const port = Number(process.env.E2E_PORT ?? 4173) + 60;
const origin = `http://localhost:${port}`;
const dataDir = resolve(`e2e/.data/serve-${port}`);

interface Run {
	proc: ChildProcess;
	out: () => string;
	err: () => string;
	exit: Promise<number | null>;
}

function serve(env: Record<string, string | undefined>): Run {
	if (!existsSync('build/index.js')) throw new Error('Run `npm run build` first: these tests start the built app.');
	let out = '';
	let err = '';
	const proc = spawn('npm', ['run', 'serve', '--silent'], {
		cwd: resolve('.'),
		detached: true, // its own process group, so the app started by npm stops with it
		env: {
			PATH: process.env.PATH,
			HOME: process.env.HOME,
			PORT: String(port),
			PADPROOF_DATA_DIR: dataDir,
			DATABASE_URL: `file:${dataDir}/padproof.db`,
			...env
		}
	});
	proc.stdout!.on('data', (d) => (out += d));
	proc.stderr!.on('data', (d) => (err += d));
	const exit = new Promise<number | null>((done) => proc.once('exit', (code) => done(code)));
	return { proc, out: () => out, err: () => err, exit };
}

async function listening(run: Run) {
	for (let i = 0; i < 150; i++) {
		if (run.out().includes('Listening on')) return;
		if (run.proc.exitCode !== null) throw new Error(`the server stopped: ${run.err()}`);
		await new Promise((r) => setTimeout(r, 200));
	}
	throw new Error(`the server did not start: ${run.err()}`);
}

async function stop(run: Run) {
	if (run.proc.exitCode === null) process.kill(-run.proc.pid!, 'SIGTERM');
	await run.exit;
}

test.describe('npm run serve (NODE_ENV=production)', () => {
	test.describe.configure({ mode: 'serial' });
	test.beforeAll(() => rmSync(dataDir, { recursive: true, force: true }));
	test.afterAll(() => rmSync(dataDir, { recursive: true, force: true }));

	test('refuses a short secret and test-only settings with a clear message and exit code 1', async () => {
		const short = serve({ ORIGIN: origin, BETTER_AUTH_SECRET: 'too-short-0123456789' });
		expect(await short.exit).toBe(1);
		expect(short.err()).toContain('BETTER_AUTH_SECRET is 20 characters long; production needs at least 32');
		expect(short.err()).not.toMatch(/^\s+at /m); // a message, not a stack trace

		const unsafe = serve({ BETTER_AUTH_SECRET: SECRET, PADPROOF_RATE_LIMIT: 'off' });
		expect(await unsafe.exit).toBe(1);
		expect(unsafe.err()).toContain('PADPROOF_RATE_LIMIT=off is for tests only');
		expect(unsafe.err()).toContain('ORIGIN is not set');
	});

	test('creates no demo accounts without PADPROOF_DEMO=1', async () => {
		const run = serve({ ORIGIN: origin, BETTER_AUTH_SECRET: SECRET });
		try {
			await listening(run);
			const api = await request.newContext({ baseURL: origin, extraHTTPHeaders: { origin } });
			const r = await api.post('/api/auth/sign-in/email', { data: { email: DEMO.admin, password: DEMO_PASSWORD } });
			expect(r.status()).toBe(401);
			expect(run.out()).not.toContain('Demo school created');
		} finally {
			await stop(run);
		}
		rmSync(dataDir, { recursive: true, force: true });
	});

	test('with PADPROOF_DEMO=1 prints fresh passwords once, never the published one; uploads work', async () => {
		const run = serve({ ORIGIN: origin, BETTER_AUTH_SECRET: SECRET, PADPROOF_DEMO: '1' });
		const passwords = new Map<string, string>();
		try {
			await listening(run);
			for (const [, email, password] of run.out().matchAll(/^\s+(\S+@mixlab\.example)\s+(\S+)$/gm))
				passwords.set(email, password);
			expect([...passwords.keys()].sort()).toEqual(Object.values(DEMO).sort());
			expect(new Set(passwords.values()).size).toBe(5);
			expect([...passwords.values()]).not.toContain(DEMO_PASSWORD);

			const anonymous = await request.newContext({ baseURL: origin, extraHTTPHeaders: { origin } });
			const published = await anonymous.post('/api/auth/sign-in/email', {
				data: { email: DEMO.student, password: DEMO_PASSWORD }
			});
			expect(published.status()).toBe(401);
			const api = await signedIn(origin, DEMO.student, passwords.get(DEMO.student)!);
			const { ms } = await uploadTake(api, threeMinuteWav());
			console.log(`upload (npm run serve): 15.9 MB in ${ms} ms`);
		} finally {
			await stop(run);
		}
		const again = serve({ ORIGIN: origin, BETTER_AUTH_SECRET: SECRET, PADPROOF_DEMO: '1' });
		try {
			await listening(again);
			expect(again.out()).not.toContain('Demo school created');
		} finally {
			await stop(again);
		}
	});

	test('keeps sign-in rate limits on', async () => {
		const run = serve({ ORIGIN: origin, BETTER_AUTH_SECRET: SECRET });
		try {
			await listening(run);
			const api = await request.newContext({ baseURL: origin, extraHTTPHeaders: { origin } });
			const statuses: number[] = [];
			for (let i = 0; i < 12; i++) {
				const r = await api.post('/api/auth/sign-in/email', {
					data: { email: DEMO.teacher, password: `wrong-${i}-guess` }
				});
				statuses.push(r.status());
			}
			expect(statuses).toContain(429);
		} finally {
			await stop(run);
		}
	});

	test('sends HSTS when the public address is https', async () => {
		const run = serve({ ORIGIN: 'https://padproof.example.org', BETTER_AUTH_SECRET: SECRET });
		try {
			await listening(run);
			const r = await (await request.newContext()).get(`${origin}/signin`);
			expect(r.headers()['strict-transport-security']).toBe('max-age=31536000');
		} finally {
			await stop(run);
		}
	});
});
