// The doctor panel's handle on the verifier worker: one proof at a time, with progress and cancel.
import type { Mapping, VerifyProgress, VerifyResult } from '$lib/engine';
import type { VerifyReply, VerifyRequest } from './verify.worker';

export type ProofStatus = 'idle' | 'running' | 'done' | 'failed';

export class VerifyClient {
	status = $state<ProofStatus>('idle');
	progress = $state<VerifyProgress | null>(null);
	result = $state.raw<VerifyResult | null>(null);
	error = $state<string | null>(null);
	/** The group the current or last proof is about. */
	group = $state<string | null>(null);
	/** The document the current or last proof is about (an answer for another one no longer holds). */
	mapping = $state.raw<Mapping | null>(null);
	#worker: Worker | null = null;
	#make: () => Worker;

	constructor(make = () => new Worker(new URL('./verify.worker.ts', import.meta.url), { type: 'module' })) {
		this.#make = make;
	}

	prove(mapping: Mapping, group: string, inputs: string[]) {
		const worker = (this.#worker ??= this.#listen(this.#make()));
		this.status = 'running';
		this.group = group;
		this.mapping = mapping;
		this.progress = null;
		this.result = null;
		this.error = null;
		// A $state proxy can't be cloned into a worker: send a plain copy.
		const request: VerifyRequest = { type: 'prove', mapping: JSON.parse(JSON.stringify(mapping)), inputs };
		worker.postMessage(request);
	}

	cancel() {
		this.#worker?.postMessage({ type: 'cancel' } satisfies VerifyRequest);
	}

	/** Forget the last answer (the mapping changed, so it no longer holds). */
	reset() {
		if (this.status === 'running') this.cancel();
		this.status = 'idle';
		this.result = null;
		this.progress = null;
		this.group = null;
	}

	dispose() {
		this.#worker?.terminate();
		this.#worker = null;
	}

	#listen(worker: Worker): Worker {
		worker.onmessage = (e: MessageEvent<VerifyReply>) => {
			const reply = e.data;
			if (reply.type === 'progress') this.progress = reply.progress;
			else if (reply.type === 'done') {
				this.result = reply.result;
				this.status = 'done';
			} else {
				this.error = reply.message;
				this.status = 'failed';
			}
		};
		worker.onerror = (e) => {
			this.error = e.message || 'The verifier stopped unexpectedly.';
			this.status = 'failed';
		};
		return worker;
	}
}
