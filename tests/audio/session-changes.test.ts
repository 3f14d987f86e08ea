import { demoMapping, type Mapping } from '$lib/engine';
import { sessionChanges } from '$lib/audio/render';
import { describe, expect, it } from 'vitest';

describe('sessionChanges (what a WAV export plays)', () => {
	it('lands a quantized press on the next 1/8 grid line, as replay does', () => {
		// Echo A (pad-1) quantized to 1/8: at 120 BPM a 1/8 is 250 ms (tempo arithmetic, 240000/BPM × 1/8).
		const base = demoMapping('two-deck');
		const mapping: Mapping = {
			...base,
			bindings: base.bindings.map((b) => (b.input === 'pad-1' ? { ...b, quantize: '1/8' } : b))
		};
		const { changes } = sessionChanges(mapping, [{ t: 610, input: 'pad-1', type: 'press' }], 120);
		const on = changes.find((c) => c.path === 'racks.0.on' && c.to === true);
		expect(on?.t).toBe(750);
	});

	it('keeps an unquantized press at its own time', () => {
		const { changes } = sessionChanges(demoMapping('two-deck'), [{ t: 610, input: 'pad-1', type: 'press' }], 120);
		expect(changes.find((c) => c.path === 'racks.0.on')?.t).toBe(610);
	});
});
