// A verifier counterexample saved as a session, so the replay page can show it with its finding.
import { api } from '$lib/api';
import { analyze, DEFAULT_TEMPO, sessionFromEvents, type Mapping, type VerifyResult } from '$lib/engine';

/** Saves the counterexample as a session of the mapping; answers the replay page's address. */
export async function openCounterexample(mappingId: string, mapping: Mapping, group: string, result: VerifyResult) {
	const events = result.counterexample ?? [];
	const tempo = mapping.tempo ?? DEFAULT_TEMPO;
	const session = sessionFromEvents(events, tempo, new Date().toISOString());
	const { id } = await api<{ id: string }>(
		'/api/sessions',
		{ method: 'POST' },
		{ mappingId, name: `Counterexample for ${group}`, session }
	);
	// The replay page lists analyze's findings in this order, so the index picks the same one.
	const last = events.length - 1;
	const findings = analyze(mapping, events, { tempo });
	const index = Math.max(
		0,
		findings.findIndex((f) => f.event === last && (!result.finding || f.kind === result.finding.kind))
	);
	return `/sessions/${id}?finding=${index}`;
}
