// api_tokens.cookie_p50_ms / api_tokens.token_p50_ms (and p99): what a personal API token costs
// per request. Starts `node build` (building first when there is no build) on a spare loopback
// port with a throwaway database, makes a token through the /account form, then lists sessions
// one request after another with the session cookie and with the token.
import { execFileSync, spawn } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Figure } from './run';

const PORT = 4391;
const ORIGIN = `http://localhost:${PORT}`;
const REQUESTS = 300;

async function waitFor(url: string) {
	for (let i = 0; i < 150; i++) {
		try {
			if ((await fetch(url)).ok) return;
		} catch {
			/* not yet */
		}
		await new Promise((r) => setTimeout(r, 200));
	}
	throw new Error('the server did not start');
}

async function latencies(headers: Record<string, string>): Promise<number[]> {
	const out: number[] = [];
	for (let i = 0; i < REQUESTS + 20; i++) {
		const started = performance.now();
		const r = await fetch(`${ORIGIN}/api/sessions`, { headers });
		await r.arrayBuffer();
		if (r.status !== 200) throw new Error(`GET /api/sessions answered ${r.status}`);
		if (i >= 20) out.push(performance.now() - started); // the first 20 warm up
	}
	return out.sort((a, b) => a - b);
}

const pct = (sorted: number[], p: number) =>
	Number(sorted[Math.min(sorted.length - 1, Math.floor(p * sorted.length))].toFixed(2));

export default async function (report: (f: Figure) => void) {
	if (!existsSync('build/index.js')) execFileSync('npx', ['vite', 'build'], { stdio: 'ignore' });
	const dir = mkdtempSync(join(tmpdir(), 'padproof-token-bench-'));
	const server = spawn('node', ['build'], {
		env: {
			...process.env,
			PORT: String(PORT),
			ORIGIN,
			BETTER_AUTH_URL: ORIGIN,
			PADPROOF_DATA_DIR: dir,
			DATABASE_URL: `file:${dir}/bench.db`,
			PADPROOF_DEMO: '1',
			// The per-token limit stays on (its counter is part of the cost), set above this run.
			PADPROOF_TOKEN_RATE_LIMIT: String(10 * REQUESTS),
			NODE_ENV: 'development'
		},
		stdio: 'ignore'
	});
	try {
		await waitFor(ORIGIN);
		const signIn = await fetch(`${ORIGIN}/api/auth/sign-in/email`, {
			method: 'POST',
			headers: { 'content-type': 'application/json', origin: ORIGIN },
			body: JSON.stringify({ email: 'kai@mixlab.example', password: 'rehearse-1234' })
		});
		if (!signIn.ok) throw new Error(`sign-in failed: ${signIn.status}`);
		const cookie = signIn.headers
			.getSetCookie()
			.map((c) => c.split(';')[0])
			.join('; ');
		const made = await fetch(`${ORIGIN}/account?/createToken`, {
			method: 'POST',
			headers: {
				cookie,
				origin: ORIGIN,
				'content-type': 'application/x-www-form-urlencoded',
				'x-sveltekit-action': 'true',
				accept: 'application/json'
			},
			body: 'name=Bench&expires=30'
		});
		const token = /pp_[A-Za-z]{64}/.exec(await made.text())?.[0];
		if (!token) throw new Error(`no token made: ${made.status}`);
		const byCookie = await latencies({ cookie });
		const byToken = await latencies({ authorization: `Bearer ${token}` });
		report({ name: 'api_tokens.cookie_p50_ms', value: pct(byCookie, 0.5), unit: 'ms' });
		report({ name: 'api_tokens.cookie_p99_ms', value: pct(byCookie, 0.99), unit: 'ms' });
		report({ name: 'api_tokens.token_p50_ms', value: pct(byToken, 0.5), unit: 'ms' });
		report({ name: 'api_tokens.token_p99_ms', value: pct(byToken, 0.99), unit: 'ms' });
	} finally {
		server.kill('SIGTERM');
		rmSync(dir, { recursive: true, force: true });
	}
}
