// Runs the engine's verifier off the main thread. Messages in: { type: 'prove', mapping, inputs }
// or { type: 'cancel' }; out: { type: 'progress', progress } then { type: 'done', result }.
import { verifyGroup, type Mapping, type VerifyProgress, type VerifyResult } from '$lib/engine';

export type VerifyRequest = { type: 'prove'; mapping: Mapping; inputs: string[] } | { type: 'cancel' };
export type VerifyReply =
	| { type: 'progress'; progress: VerifyProgress }
	| { type: 'done'; result: VerifyResult }
	| { type: 'failed'; message: string };

let running: AbortController | null = null;

self.onmessage = async (e: MessageEvent<VerifyRequest>) => {
	const post = (reply: VerifyReply) => self.postMessage(reply);
	if (e.data.type === 'cancel') return running?.abort();
	running?.abort();
	const controller = (running = new AbortController());
	try {
		const result = await verifyGroup(e.data.mapping, e.data.inputs, {
			signal: controller.signal,
			chunk: 5000,
			onProgress: (progress) => post({ type: 'progress', progress })
		});
		post({ type: 'done', result });
	} catch (error) {
		post({ type: 'failed', message: error instanceof Error ? error.message : String(error) });
	} finally {
		if (running === controller) running = null;
	}
};
