// Verifier speed on legato rows of 4, 8, 12 and 16 pads (every held set is a state, so the space
// doubles with each pad). Measures only.
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
		racks: [{ id: 'row', label: 'Row' }],
		profile: { name: 'grid', inputs: pads.map((id, i) => ({ id, kind: 'pad', channel: 1, note: 36 + i })) },
		counters: [r.counter],
		bindings: r.bindings
	};
}

export default async function (report: (f: Figure) => void) {
	for (const n of [4, 8, 12, 16]) {
		const m = row(n);
		const pads = m.profile.inputs.map((i) => i.id);
		const t0 = performance.now();
		const r = verifyGroupSync(m, pads);
		const ms = performance.now() - t0;
		if (!r.ok) throw new Error(`legato row of ${n} should be proved, got ${r.status}`);
		report({ name: `verify.legato${n}_ms`, value: Math.round(ms), unit: 'ms' });
	}
}
