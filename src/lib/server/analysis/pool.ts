// A few worker threads for whole-session work (findings of a finished take, a take's drill score).
// Jobs go to the least busy worker; a worker that dies is replaced and its jobs fail with a clear
// error. PADPROOF_ANALYSIS_THREADS=0 works on the request thread (for tools that run once and exit).
import { availableParallelism } from 'node:os';
import { Worker } from 'node:worker_threads';
import type { Score } from '$lib/engine';
import type { Analysis, AnalysisJob, AnalysisReply, ScoreJob, WorkerJob } from './worker';

interface Slot {
	worker: Worker;
	pending: Map<number, { resolve: (result: unknown) => void; reject: (e: Error) => void }>;
}

function threads(): number {
	const set = Number(process.env.PADPROOF_ANALYSIS_THREADS);
	if (Number.isInteger(set) && set >= 0) return set;
	// Under `vite dev` this module is TypeScript served by Vite; a worker could only load it through
	// a TypeScript loader (slow to start), so development analyses on the request thread. The built
	// app and the tests (which do load it through tsx) use workers.
	if (import.meta.url.endsWith('.ts') && !process.env.VITEST) return 0;
	return Math.max(1, Math.min(4, availableParallelism() - 1));
}

let slots: Slot[] = [];
let nextId = 0;

async function spawn(): Promise<Slot> {
	const { workerUrl, ANALYSIS_WORKER } = await import('./worker');
	const url = new URL(workerUrl);
	// Under `vite dev` and vitest the module is TypeScript: the worker loads it through tsx.
	const worker = url.pathname.endsWith('.ts')
		? new Worker(
				`import('tsx/esm/api').then(({ register }) => { register(); return import(${JSON.stringify(url.href)}); });`,
				{ eval: true, workerData: ANALYSIS_WORKER }
			)
		: new Worker(url, { workerData: ANALYSIS_WORKER });
	worker.unref(); // an idle pool never keeps the process alive
	const slot: Slot = { worker, pending: new Map() };
	worker.on('message', (reply: AnalysisReply) => {
		const waiting = slot.pending.get(reply.id);
		slot.pending.delete(reply.id);
		if (!waiting) return;
		if ('error' in reply) waiting.reject(new Error(reply.error));
		else waiting.resolve(reply.result);
	});
	const fail = (e: Error) => {
		slots = slots.filter((s) => s !== slot);
		for (const waiting of slot.pending.values()) waiting.reject(e);
		slot.pending.clear();
	};
	worker.on('error', fail);
	worker.on('exit', (code) => fail(new Error(`The analysis worker stopped (exit code ${code}).`)));
	return slot;
}

let spawning: Promise<Slot> | null = null;

async function pick(): Promise<Slot> {
	const idle = slots.find((s) => s.pending.size === 0);
	if (idle || slots.length >= threads())
		return idle ?? slots.reduce((a, b) => (b.pending.size < a.pending.size ? b : a));
	spawning ??= spawn().then((slot) => {
		slots.push(slot);
		spawning = null;
		return slot;
	});
	return spawning;
}

/** Runs one job in a worker thread (on this thread when threads are turned off). */
async function offThread(job: WorkerJob): Promise<unknown> {
	if (threads() === 0) return (await import('./worker')).runJob(job);
	const slot = await pick();
	const id = ++nextId;
	return new Promise((resolve, reject) => {
		slot.pending.set(id, { resolve, reject });
		slot.worker.ref(); // keep the process up while a job is out
		slot.worker.postMessage({ id, job });
	}).finally(() => {
		if (slot.pending.size === 0) slot.worker.unref();
	});
}

/** Analyses a finished session in a worker thread: its findings and its length. */
export async function analyseSessionOffThread(job: AnalysisJob): Promise<Analysis> {
	return (await offThread({ kind: 'analysis', ...job })) as Analysis;
}

/** Counts a session's findings in a worker thread. */
export async function countFindingsOffThread(job: AnalysisJob): Promise<number> {
	return (await analyseSessionOffThread(job)).findings;
}

/** Scores a take against a drill in a worker thread (a long drill takes tens of milliseconds). */
export async function scoreOffThread(job: ScoreJob): Promise<Score> {
	return (await offThread({ kind: 'score', ...job })) as Score;
}

/** Starts the workers ahead of the first finish (a worker takes a moment to load the engine). */
export async function warmAnalysisWorkers(): Promise<void> {
	while (slots.length < threads()) slots.push(await spawn());
}

/** Stops the workers (tests and tools that want to exit at once). */
export async function stopAnalysisWorkers(): Promise<void> {
	const stopping = slots.map((s) => s.worker.terminate());
	slots = [];
	await Promise.all(stopping);
}
