import { describe, expect, it } from 'vitest';
import { quietRig, writeChange, type Touched } from '../../src/lib/audio/rig-state';
import { rackEngaged, slotActive, slotValues } from '../../src/lib/audio/slot-values';
import { EFFECTS, paramForDivision } from '../../src/lib/engine/effects';

const touched = (): Touched => ({ racks: new Set(), decks: new Set() });

describe('following engine changes', () => {
	it('writes rack, slot, route and deck paths and notes what they touched', () => {
		const state = quietRig();
		const t = touched();
		for (const [path, to] of [
			['racks.1.on', true],
			['racks.1.routes.B', true],
			['racks.1.slots.2.effect', 'gate'],
			['racks.1.params.0', 0.9],
			['decks.C.playing', false],
			['counters.held', 2]
		] as const) {
			writeChange(state, { t: 0, event: 0, path, from: null, to }, t);
		}
		expect(state.racks[1].on).toBe(true);
		expect(state.racks[1].routes.B).toBe(true);
		expect(state.racks[1].slots[2].effect).toBe('gate');
		expect(state.racks[1].params[0]).toBe(0.9);
		expect(state.decks.C.playing).toBe(false);
		expect([...t.racks]).toEqual([1]);
		expect([...t.decks]).toEqual(['C']);
	});
});

describe('slot settings', () => {
	it('gives slot 1 the rack knobs in focus mode', () => {
		const rack = quietRig().racks[0];
		rack.mode = 'focus';
		rack.params = [paramForDivision('echo', 1, '1/16'), 0.2, 0.9];
		expect(slotValues(rack, 0, 'echo')).toEqual({ time: rack.params[0], feedback: 0.2, tone: 0.9 });
	});

	it('keeps catalog defaults in chain mode and lets amount drive the named parameter', () => {
		const rack = quietRig().racks[0];
		rack.slots[1] = { effect: 'reverb', on: true, amount: 0.8 };
		const values = slotValues(rack, 1, 'reverb');
		expect(values.size).toBe(0.8);
		expect(values.decay).toBe(EFFECTS.reverb.params[1].default);
	});

	it('engages a rack only when on, routed, mixed in, and with an effect on (DESIGN.md §4.4)', () => {
		const rack = quietRig().racks[0];
		rack.on = true;
		rack.slots[1] = { effect: 'gate', on: true, amount: 0.5 };
		expect(rackEngaged(rack, true)).toBe(true);
		expect(rackEngaged(rack, false)).toBe(false);
		rack.mode = 'focus'; // focus plays slot 1 only, which is empty
		expect(slotActive(rack, 1)).toBe(false);
		expect(rackEngaged(rack, true)).toBe(false);
		rack.mode = 'chain';
		rack.mix = 0;
		expect(rackEngaged(rack, true)).toBe(false);
	});
});
