// Whole-session work, run in a worker thread so that finishing or scoring a long take does not
// hold up everyone else's requests: counting a session's findings, and scoring a take against a
// drill (DESIGN.md §4.8). The pool (./pool.ts) starts this very module as the worker's code: on
// the main thread it only tells where it is; in a worker started with ANALYSIS_WORKER as its data
// it answers jobs.
import {
	analyze,
	scoreDrill,
	sessionEvents,
	sessionReplay,
	type DrillDocument,
	type Mapping,
	type Score,
	type SessionDocument
} from '$lib/engine';
import { isMainThread, parentPort, workerData } from 'node:worker_threads';

export const ANALYSIS_WORKER = 'padproof-analysis';

export interface AnalysisJob {
	mapping: Mapping;
	session: SessionDocument;
}

export interface ScoreJob {
	drill: DrillDocument;
	mapping: Mapping;
	session: SessionDocument;
	/** Session time (ms) of the drill's beat 0. */
	zero: number;
}

export type WorkerJob = ({ kind: 'findings' } & AnalysisJob) | ({ kind: 'score' } & ScoreJob);

export type AnalysisReply = { id: number; result: unknown } | { id: number; error: string };

/** How many findings a session has against the mapping version it was played with. */
export function countFindings({ mapping, session }: AnalysisJob): number {
	return analyze(mapping, sessionEvents(session).events, sessionReplay(mapping, session)).length;
}

/** A take's score against a drill. */
export function scoreJob({ drill, mapping, session, zero }: ScoreJob): Score {
	return scoreDrill(drill, mapping, session, { zero });
}

export function runJob(job: WorkerJob): number | Score {
	return job.kind === 'score' ? scoreJob(job) : countFindings(job);
}

export const workerUrl = import.meta.url;

if (!isMainThread && workerData === ANALYSIS_WORKER && parentPort) {
	const port = parentPort;
	port.on('message', ({ id, job }: { id: number; job: WorkerJob }) => {
		let reply: AnalysisReply;
		try {
			reply = { id, result: runJob(job) };
		} catch (e) {
			reply = { id, error: e instanceof Error ? e.message : String(e) };
		}
		port.postMessage(reply);
	});
}
