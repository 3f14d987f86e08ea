// Whole-session work, run in a worker thread so that finishing or scoring a long take does not
// hold up everyone else's requests: a finished session's findings and length, and a take's score
// against a drill (DESIGN.md §4.8). The pool (./pool.ts) starts this very module as the worker's
// code: on the main thread it only tells where it is; in a worker started with ANALYSIS_WORKER as
// its data it answers jobs.
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

export interface ScoreJob {
	drill: DrillDocument;
	mapping: Mapping;
	session: SessionDocument;
	/** Session time (ms) of the drill's beat 0. */
	zero: number;
}

export type WorkerJob = ({ kind: 'analysis' } & AnalysisJob) | ({ kind: 'score' } & ScoreJob);

export type AnalysisReply = { id: number; result: unknown } | { id: number; error: string };

export function analyseSession({ mapping, session }: AnalysisJob): Analysis {
	const { events } = sessionEvents(session);
	const findings = analyze(mapping, events, sessionReplay(mapping, session));
	return { findings: findings.length, length: replayLength(session, landingTimes(mapping, events, session), findings) };
}

export function countFindings(job: AnalysisJob): number {
	return analyseSession(job).findings;
}

/** A take's score against a drill. */
export function scoreJob({ drill, mapping, session, zero }: ScoreJob): Score {
	return scoreDrill(drill, mapping, session, { zero });
}

export function runJob(job: WorkerJob): Analysis | Score {
	return job.kind === 'score' ? scoreJob(job) : analyseSession(job);
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
