// MIDI path speed: one incoming message → decode with the profile → engine `applyEvent` → which
// pads are lit → light feedback flushed to a device sink. p99 per message in µs on the two-deck
// demo mapping. MIDI's own wire needs 960 µs for a 3-byte message (MIDI 1.0 hardware section:
// 31.25 kbaud, 10 bits a byte). Measures only.
import { demoMapping } from '../../src/lib/engine/demo';
import { applyEvent, initialRigState } from '../../src/lib/engine/rig';
import { createDecoder } from '../../src/lib/midi/decode';
import { LightFeedback } from '../../src/lib/midi/lights';
import { litInputs } from '../../src/lib/midi/pad-lights';
import type { Figure } from './run';

/** Note On / Note Off pairs on the demo grid with a fixed seed: rolls on the stutter row, single pads. */
function messages(n: number): number[][] {
	let seed = 777;
	const rand = () => (seed = (seed * 1103515245 + 12345) & 0x7fffffff) / 0x7fffffff;
	const held = new Set<number>();
	const out: number[][] = [];
	while (out.length < n) {
		const note = rand() < 0.6 ? 48 + Math.floor(rand() * 4) : 36 + Math.floor(rand() * 12);
		if (held.has(note)) {
			held.delete(note);
			// MIDI 1.0: both ways of ending a note occur in the wild.
			out.push(rand() < 0.5 ? [0x80, note, 0] : [0x90, note, 0]);
		} else if (note >= 48 || held.size === 0 || [...held].every((h) => h >= 48)) {
			held.add(note);
			out.push([0x90, note, 1 + Math.floor(rand() * 126)]);
		}
	}
	return out;
}

export default async function (report: (f: Figure) => void) {
	const mapping = demoMapping('two-deck');
	const decode = createDecoder(mapping.profile);
	let sent = 0;
	const lights = new LightFeedback(
		mapping.profile,
		{ send: () => void sent++ },
		{ schedule: () => 0, cancel: () => {} }
	);
	const stream = messages(220_000);

	let state = initialRigState(mapping);
	let index = 0;
	const one = (bytes: number[], t: number) => {
		const d = decode(bytes, t);
		if (d.status !== 'event') return;
		state = applyEvent(mapping, state, d.event, index++).state;
		lights.show(litInputs(mapping, state));
		lights.flush();
	};

	for (let i = 0; i < 20_000; i++) one(stream[i], i); // warm the JIT

	const per = new Float64Array(stream.length - 20_000);
	const start = performance.now();
	for (let i = 20_000; i < stream.length; i++) {
		const t0 = performance.now();
		one(stream[i], i);
		per[i - 20_000] = performance.now() - t0;
	}
	const elapsed = performance.now() - start;
	per.sort();
	report({
		name: 'midi.message_p99_us',
		value: Math.round(per[Math.floor(per.length * 0.99)] * 1000 * 10) / 10,
		unit: 'us'
	});
	report({ name: 'midi.messages_per_s', value: Math.round(per.length / (elapsed / 1000)), unit: 'messages/s' });
	if (sent === 0) throw new Error('no light messages were sent: the benchmark measured nothing');
}
