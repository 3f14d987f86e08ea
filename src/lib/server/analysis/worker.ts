// The whole-session analysis, run in a worker thread so that finishing a long take does not hold
// up everyone else's requests. The pool (./pool.ts) starts this very module as the worker's code:
// on the main thread it only tells where it is; in a worker started with ANALYSIS_WORKER as its
// data it answers jobs.
import { analyze, sessionEvents, sessionReplay, type Mapping, type SessionDocument } from '$lib/engine';
import { isMainThread, parentPort, workerData } from 'node:worker_threads';

export const ANALYSIS_WORKER = 'padproof-analysis';

export interface AnalysisJob {
	mapping: Mapping;
	session: SessionDocument;
}

export type AnalysisReply = { id: number; findings: number } | { id: number; error: string };

/** How many findings a session has against the mapping version it was played with. */
export function countFindings({ mapping, session }: AnalysisJob): number {
	return analyze(mapping, sessionEvents(session).events, sessionReplay(mapping, session)).length;
}

export const workerUrl = import.meta.url;

if (!isMainThread && workerData === ANALYSIS_WORKER && parentPort) {
	const port = parentPort;
	port.on('message', ({ id, job }: { id: number; job: AnalysisJob }) => {
		let reply: AnalysisReply;
		try {
			reply = { id, findings: countFindings(job) };
		} catch (e) {
			reply = { id, error: e instanceof Error ? e.message : String(e) };
		}
		port.postMessage(reply);
	});
}
