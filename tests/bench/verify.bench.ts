// Verifier speed on hold-group rows of 4 to 64 pads. The pads of a row differ only in their
// parameter values, so the verifier folds them (DESIGN.md §4.7); the 12-pad row is also measured
// unfolded, where every held set is a state and the space doubles with each pad. Measures only.
import { legatoRow } from '../../src/lib/engine/builders';
import { verifyGroupSync } from '../../src/lib/engine/verify';
import type { Mapping } from '../../src/lib/engine/types';
import type { Figure } from './run';

function row(n: number): Mapping {
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
		name: `legato ${n}`,
		decks: 2,
		profile: { name: 'grid', inputs: pads.map((id, i) => ({ id, kind: 'pad', channel: 1, note: i })) },
		racks: [{ id: 'stutter', label: 'Stutter' }],
		counters: [r.counter],
		bindings: r.bindings
	};
}

export default async function (report: (f: Figure) => void) {
	const runs: [string, number, boolean][] = [4, 8, 12, 16, 32, 64].map((n) => [`legato${n}`, n, true]);
	runs.push(['legato12_unfolded', 12, false]);
	for (const [name, n, fold] of runs) {
		const m = row(n);
		const pads = m.profile.inputs.map((i) => i.id);
		verifyGroupSync(m, pads, { fold }); // warm the JIT and the mapping's caches
		const t0 = performance.now();
		const r = verifyGroupSync(m, pads, { fold });
		const ms = performance.now() - t0;
		if (!r.ok) throw new Error(`hold group of ${n} should be proved, got ${r.status}`);
		report({ name: `verify.${name}_ms`, value: Math.round(ms * 100) / 100, unit: 'ms' });
		report({ name: `verify.${name}_states`, value: r.statesExplored, unit: 'states' });
	}
}
