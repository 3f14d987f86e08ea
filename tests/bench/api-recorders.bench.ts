// api.recorders50_*: 50 rehearsals recorded at once against the built server (`node build`, on a
// loopback port, throwaway database). For 30 s each recorder posts a chunk every 250 ms; every
// 10th chunk is sent twice (a lost answer) and every 7th is held back and sent after the next one
// (out of order). At the end all 50 finish together, while their last chunks are still arriving.
// Lost and doubled events are counted in the database file afterwards.
import { createClient } from '@libsql/client';
import { execFileSync, spawn } from 'node:child_process';
import { existsSync, mkdtempSync, openSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Figure } from './run';

const PORT = 4392;
const ORIGIN = `http://127.0.0.1:${PORT}`;
const RECORDERS = 50;
const SECONDS = 30;
const EVERY_MS = 250;
const EVENTS_PER_CHUNK = 6;
const ACCOUNTS = ['kai', 'lena', 'omar', 'tomas', 'ines'].map((n) => `${n}@mixlab.example`);

const sleep = (ms: number) => new Promise((r) => setTimeout(r, Math.max(0, ms)));

async function waitFor(url: string) {
	for (let i = 0; i < 900; i++) {
		try {
			if ((await fetch(url)).ok) return;
		} catch {
			/* not yet */
		}
		await sleep(200);
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

/** CPU time (user + system) the process has used so far, from Linux's /proc; null elsewhere. */
function cpuMs(pid: number | undefined): number | null {
	try {
		const fields = readFileSync(`/proc/${pid}/stat`, 'utf8').split(') ')[1].split(' ');
		return ((Number(fields[11]) + Number(fields[12])) * 1000) / 100; // utime, stime in clock ticks (USER_HZ = 100)
	} catch {
		return null;
	}
}

const percentile = (sorted: number[], p: number) =>
	sorted.length ? sorted[Math.min(sorted.length - 1, Math.floor(p * sorted.length))] : 0;

export default async function (report: (f: Figure) => void) {
	if (!existsSync('build/index.js')) execFileSync('npx', ['vite', 'build'], { stdio: 'ignore' });
	const dir = mkdtempSync(join(tmpdir(), 'padproof-recorders-bench-'));
	const file = join(dir, 'bench.db');
	// BENCH_NODE_ARGS="--cpu-prof --cpu-prof-dir=/tmp/prof" profiles the server (NODE_OPTIONS refuses --cpu-prof).
	const nodeArgs = (process.env.BENCH_NODE_ARGS ?? '').split(' ').filter(Boolean);
	const server = spawn('node', [...nodeArgs, 'build'], {
		env: {
			...process.env,
			HOST: '127.0.0.1',
			PORT: String(PORT),
			ORIGIN,
			BETTER_AUTH_URL: ORIGIN,
			PADPROOF_DATA_DIR: dir,
			DATABASE_URL: `file:${file}`,
			PADPROOF_DEMO: '1',
			PADPROOF_RATE_LIMIT: 'off',
			NODE_ENV: 'development'
		},
		stdio: ['ignore', 'ignore', openSync(join(dir, 'server.log'), 'w')]
	});
	let exited = '';
	server.on('exit', (code, signal) => (exited = `the server stopped: ${code ?? signal}`));
	let kill: ReturnType<typeof setTimeout> | undefined;
	try {
		await waitFor(ORIGIN);
		kill = setTimeout(() => server.kill('SIGKILL'), (SECONDS + 240) * 1000); // bounded in time
		const cookies = await Promise.all(ACCOUNTS.map(signIn));
		const headersFor = (i: number) => ({
			'content-type': 'application/json',
			origin: ORIGIN,
			cookie: cookies[i % cookies.length]
		});
		const { mappings } = await (await fetch(`${ORIGIN}/api/mappings`, { headers: headersFor(0) })).json();
		const mappingId = (mappings as { id: string; demo: boolean }[]).find((m) => m.demo)!.id;

		const cpuBefore = cpuMs(server.pid);
		const latencies: number[] = [];
		const finishes: number[] = [];
		let errors = 0;
		const sent = new Map<string, number>(); // session → distinct events sent

		const recorder = async (i: number) => {
			const headers = headersFor(i);
			const created = await fetch(`${ORIGIN}/api/sessions`, {
				method: 'POST',
				headers,
				body: JSON.stringify({ mappingId, tempo: 120 })
			});
			const { id } = (await created.json()) as { id: string };
			const post = async (seq: number) => {
				const events = Array.from({ length: EVENTS_PER_CHUNK }, (_, e) => ({
					t: seq * EVERY_MS + e * (EVERY_MS / EVENTS_PER_CHUNK),
					midi: [e % 2 ? 0x80 : 0x90, 36 + (seq % 16), e % 2 ? 0 : 100],
					input: { input: `pad-${1 + (seq % 16)}`, type: e % 2 ? 'release' : 'press' }
				}));
				const started = performance.now();
				try {
					const r = await fetch(`${ORIGIN}/api/sessions/${id}/chunks`, {
						method: 'POST',
						headers,
						body: JSON.stringify({ seq, events }),
						signal: AbortSignal.timeout(10_000)
					});
					await r.arrayBuffer();
					if (!r.ok) errors++;
				} catch {
					errors++;
				}
				latencies.push(performance.now() - started);
			};
			const start = performance.now() + (i * EVERY_MS) / RECORDERS; // recorders tick out of step
			const chunks = (SECONDS * 1000) / EVERY_MS;
			let held: number | null = null;
			for (let seq = 0; seq < chunks; seq++) {
				await sleep(start + seq * EVERY_MS - performance.now());
				if (seq % 7 === 6 && seq < chunks - 1) {
					held = seq; // sent after the next one
					continue;
				}
				await post(seq);
				if (seq % 10 === 9) await post(seq); // the answer was lost: sent again
				if (held !== null) {
					await post(held);
					held = null;
				}
			}
			sent.set(id, chunks * EVENTS_PER_CHUNK);
			return { id, headers };
		};
		const all = await Promise.all(Array.from({ length: RECORDERS }, (_, i) => recorder(i)));
		// Everyone presses Stop at once.
		await Promise.all(
			all.map(async ({ id, headers }) => {
				const started = performance.now();
				const r = await fetch(`${ORIGIN}/api/sessions/${id}`, {
					method: 'PATCH',
					headers,
					body: JSON.stringify({ finish: true }),
					signal: AbortSignal.timeout(60_000)
				});
				await r.arrayBuffer();
				if (!r.ok) errors++;
				finishes.push(performance.now() - started);
			})
		);

		const cpuAfter = cpuMs(server.pid);

		// Count what the server kept, in its database file.
		const db = createClient({ url: `file:${file}` });
		let lost = 0;
		let doubled = 0;
		for (const [id, expected] of sent) {
			const { rows } = await db.execute({
				sql: 'select coalesce(sum(event_count), 0) as kept, count(*) as chunks, count(distinct seq) as seqs from rehearsal_chunk where rehearsal_id = ?',
				args: [id]
			});
			const kept = Number(rows[0].kept);
			lost += Math.max(0, expected - kept);
			doubled += Math.max(0, kept - expected) + Number(rows[0].chunks) - Number(rows[0].seqs);
		}
		db.close();

		latencies.sort((a, b) => a - b);
		finishes.sort((a, b) => a - b);
		report({ name: 'api.recorders50_p50_ms', value: Number(percentile(latencies, 0.5).toFixed(2)), unit: 'ms' });
		report({ name: 'api.recorders50_p99_ms', value: Number(percentile(latencies, 0.99).toFixed(2)), unit: 'ms' });
		report({ name: 'api.recorders50_finish_p99_ms', value: Number(percentile(finishes, 0.99).toFixed(2)), unit: 'ms' });
		// The server's own CPU time per request: on a shared machine this moves far less than latency.
		if (cpuBefore !== null && cpuAfter !== null)
			report({
				name: 'api.recorders50_server_cpu_ms_per_request',
				value: Number(((cpuAfter - cpuBefore) / (latencies.length + finishes.length)).toFixed(3)),
				unit: 'ms'
			});
		report({ name: 'api.recorders50_requests', value: latencies.length, unit: 'requests' });
		report({ name: 'api.recorders50_errors', value: errors, unit: 'requests' });
		report({ name: 'api.recorders50_lost_events', value: lost, unit: 'events' });
		report({ name: 'api.recorders50_doubled_events', value: doubled, unit: 'events' });
	} catch (e) {
		console.error(readFileSync(join(dir, 'server.log'), 'utf8').slice(-4000), exited, (e as Error).cause);
		throw e;
	} finally {
		clearTimeout(kill);
		server.kill('SIGTERM');
		rmSync(dir, { recursive: true, force: true });
	}
}
