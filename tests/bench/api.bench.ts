// api.chunk_p50_ms / api.chunk_p99_ms / api.errors / api.lost_events: the chunk endpoint over
// HTTP on this machine. Starts `node build` (building first when there is no build) on a spare
// loopback port with a throwaway database, has 8 simulated rehearsals send 20-event chunks at
// once, re-sends every 10th chunk as a lost answer would, then counts what the server kept.
import { execFileSync, spawn } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Figure } from './run';

const PORT = 4390;
const ORIGIN = `http://localhost:${PORT}`;
const CLIENTS = 8;
const CHUNKS = 60;

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

async function signIn(email: string): Promise<string> {
	const r = await fetch(`${ORIGIN}/api/auth/sign-in/email`, {
		method: 'POST',
		headers: { 'content-type': 'application/json', origin: ORIGIN },
		body: JSON.stringify({ email, password: 'rehearse-1234' })
	});
	if (!r.ok) throw new Error(`sign-in failed: ${r.status}`);
	return r.headers
		.getSetCookie()
		.map((c) => c.split(';')[0])
		.join('; ');
}

export default async function (report: (f: Figure) => void) {
	if (!existsSync('build/index.js')) execFileSync('npx', ['vite', 'build'], { stdio: 'ignore' });
	const dir = mkdtempSync(join(tmpdir(), 'padproof-api-bench-'));
	const server = spawn('node', ['build'], {
		env: {
			...process.env,
			PORT: String(PORT),
			ORIGIN,
			BETTER_AUTH_URL: ORIGIN,
			PADPROOF_DATA_DIR: dir,
			DATABASE_URL: `file:${dir}/bench.db`,
			PADPROOF_DEMO: '1',
			PADPROOF_RATE_LIMIT: 'off',
			NODE_ENV: 'development'
		},
		stdio: 'ignore'
	});
	try {
		await waitFor(ORIGIN);
		const cookie = await signIn('kai@mixlab.example');
		const headers = { 'content-type': 'application/json', origin: ORIGIN, cookie };
		const { mappings } = await (await fetch(`${ORIGIN}/api/mappings`, { headers })).json();
		const latencies: number[] = [];
		let errors = 0;
		const client = async () => {
			const { id } = await (
				await fetch(`${ORIGIN}/api/sessions`, {
					method: 'POST',
					headers,
					body: JSON.stringify({ mappingId: mappings[0].id, tempo: 120 })
				})
			).json();
			for (let seq = 0; seq < CHUNKS; seq++) {
				const events = Array.from({ length: 20 }, (_, i) => ({
					t: seq * 2000 + i * 100,
					midi: [0x90, 36, 100],
					input: { input: 'pad-1', type: i % 2 ? 'release' : 'press' }
				}));
				for (let send = 0; send < (seq % 10 === 9 ? 2 : 1); send++) {
					const started = performance.now();
					const r = await fetch(`${ORIGIN}/api/sessions/${id}/chunks`, {
						method: 'POST',
						headers,
						body: JSON.stringify({ seq, events })
					});
					latencies.push(performance.now() - started);
					if (!r.ok) errors++;
					await r.arrayBuffer();
				}
			}
			const session = await (await fetch(`${ORIGIN}/api/sessions/${id}`, { headers })).json();
			return CHUNKS * 20 - session.events.length;
		};
		const lost = (await Promise.all(Array.from({ length: CLIENTS }, client))).reduce((a, b) => a + Math.abs(b), 0);
		latencies.sort((a, b) => a - b);
		const pct = (p: number) => latencies[Math.min(latencies.length - 1, Math.floor(p * latencies.length))];
		report({ name: 'api.chunk_p50_ms', value: Number(pct(0.5).toFixed(2)), unit: 'ms' });
		report({ name: 'api.chunk_p99_ms', value: Number(pct(0.99).toFixed(2)), unit: 'ms' });
		report({ name: 'api.errors', value: errors, unit: 'requests' });
		report({ name: 'api.lost_events', value: lost, unit: 'events' });
	} finally {
		server.kill('SIGTERM');
		rmSync(dir, { recursive: true, force: true });
	}
}
