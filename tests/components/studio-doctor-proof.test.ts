// The doctor panel's "Prove": progress while the verifier runs, and cancel. The worker is a stand-in
// that speaks the worker's messages and runs the engine's own verifier in this thread, one state per
// turn of the event loop, so a proof of a 12-pad group is still running when Cancel is pressed.
import { describe, expect, it, vi } from 'vitest';
import { render, screen, waitFor, within } from '@testing-library/svelte';
import userEvent from '@testing-library/user-event';
import DoctorPanel from '$lib/components/studio/DoctorPanel.svelte';
import { legatoRow, verifyGroup, type Mapping } from '$lib/engine';
import { VerifyClient } from '$lib/verify/verify-client.svelte';
import type { VerifyReply, VerifyRequest } from '$lib/verify/verify.worker';

vi.setConfig({ testTimeout: 30_000 });

/** A hold-group row of `n` pads that cannot be folded together: each also counts its own counter. */
function bigRow(n: number): Mapping {
	const pads = Array.from({ length: n }, (_, i) => `pad-${i + 1}`);
	const r = legatoRow({
		pads,
		rack: 1,
		effect: 'stutter',
		variants: pads.map((_, i) => (i + 0.5) / n),
		counter: 'held',
		deck: 'A',
		decks: 2
	});
	return {
		version: 2,
		name: 'Big row',
		decks: 2,
		profile: { name: 'grid', inputs: pads.map((id, i) => ({ id, kind: 'pad', channel: 1, note: i })) },
		racks: [{ id: 'stutter', label: 'Stutter' }],
		counters: [r.counter, ...pads.map((_, i) => ({ id: `own${i}`, max: 15, rest: 0 }))],
		bindings: r.bindings.map((b, i) => ({
			...b,
			steps: [
				...b.steps,
				{ target: { kind: 'counter', counter: `own${i}` }, action: 'count-up' },
				{ target: { kind: 'counter', counter: `own${i}` }, action: 'count-down', phase: 'release' }
			]
		}))
	} as Mapping;
}

class StandInWorker {
	onmessage: ((e: MessageEvent<VerifyReply>) => void) | null = null;
	onerror: ((e: ErrorEvent) => void) | null = null;
	received: VerifyRequest['type'][] = [];
	#running: AbortController | null = null;

	postMessage(request: VerifyRequest) {
		this.received.push(request.type);
		if (request.type === 'cancel') return this.#running?.abort();
		const controller = (this.#running = new AbortController());
		const post = (reply: VerifyReply) => this.onmessage?.({ data: reply } as MessageEvent<VerifyReply>);
		void verifyGroup(request.mapping, request.inputs, {
			signal: controller.signal,
			chunk: 1,
			onProgress: (progress) => post({ type: 'progress', progress })
		}).then((result) => post({ type: 'done', result }));
	}

	terminate() {
		this.#running?.abort();
	}
}

describe('proving a hold group', () => {
	it('shows progress, cancels, and then claims nothing proved', async () => {
		const mapping = bigRow(12);
		const worker = new StandInWorker();
		const verifier = new VerifyClient(() => worker as unknown as Worker);
		render(DoctorPanel, { mapping, verifier, onstep: () => {}, onreplay: () => {}, replaying: false });
		const user = userEvent.setup();
		const group = within(screen.getByTestId('group-held'));

		await user.click(group.getByRole('button', { name: /^Prove/ }));
		expect(verifier.status).toBe('running');
		expect(group.queryByRole('button', { name: /^Prove/ })).toBeNull();
		// Progress: the status line counts the states checked so far.
		const status = await group.findByRole('status');
		await waitFor(() => expect(status.textContent).toMatch(/Checking every order… [\d,]+ states, \d+ events deep/));
		const seen = verifier.progress!.statesExplored;
		expect(seen).toBeGreaterThan(0);

		await user.click(group.getByRole('button', { name: 'Cancel' }));
		await waitFor(() => expect(verifier.status).toBe('done'));
		expect(worker.received).toEqual(['prove', 'cancel']);
		expect(verifier.result?.status).toBe('cancelled');
		expect(verifier.result!.ok).toBe(false);
		// Stopped early: far fewer than the 4,097 states a whole proof of this row checks.
		expect(verifier.result!.statesExplored).toBeGreaterThanOrEqual(seen);
		expect(verifier.result!.statesExplored).toBeLessThan(4097);

		expect(group.getByText(/^Cancelled after [\d,]+ states\.$/)).toBeInTheDocument();
		expect(group.queryByTestId('proof')).toBeNull();
		expect(group.queryByText(/Proved/)).toBeNull();
		expect(group.queryByRole('status')).toBeNull();
		// The group can be proved again.
		expect(group.getByRole('button', { name: /^Prove/ })).toBeEnabled();
	});
});
