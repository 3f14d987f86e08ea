// The whole-session analysis, run in a worker thread so that finishing a long take does not hold
// up everyone else's requests. The pool (./pool.ts) starts this very module as the worker's code:
// on the main thread it only tells where it is; in a worker started with ANALYSIS_WORKER as its
// data it answers jobs.
import { analyze, sessionEvents, sessionReplay, type Mapping, type SessionDocument } from '$lib/engine';
import { landingTimes, replayLength } from '$lib/replay/model';
import { isMainThread, parentPort, workerData } from 'node:worker_threads';

export const ANALYSIS_WORKER = 'padproof-analysis';

export interface AnalysisJob {
	mapping: Mapping;
	session: SessionDocument;
}

export interface Analysis {
	/** How many findings the session has against the mapping version it was played with. */
	findings: number;
	/** Its length (ms) as the replay page shows it with that mapping: quantized landings and finding ends included. */
	length: number;
}

export type AnalysisReply = ({ id: number } & Analysis) | { id: number; error: string };

export function analyseSession({ mapping, session }: AnalysisJob): Analysis {
	const { events } = sessionEvents(session);
	const findings = analyze(mapping, events, sessionReplay(mapping, session));
	return { findings: findings.length, length: replayLength(session, landingTimes(mapping, events, session), findings) };
}

export function countFindings(job: AnalysisJob): number {
	return analyseSession(job).findings;
}

export const workerUrl = import.meta.url;

if (!isMainThread && workerData === ANALYSIS_WORKER && parentPort) {
	const port = parentPort;
	port.on('message', ({ id, job }: { id: number; job: AnalysisJob }) => {
		let reply: AnalysisReply;
		try {
			reply = { id, ...analyseSession(job) };
		} catch (e) {
			reply = { id, error: e instanceof Error ? e.message : String(e) };
		}
		port.postMessage(reply);
	});
}
