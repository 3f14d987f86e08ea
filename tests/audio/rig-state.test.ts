import { describe, expect, it } from 'vitest';
import { quietRig, writeChange, type Touched } from '../../src/lib/audio/rig-state';
import { positionActive, positionValues, rackEngaged } from '../../src/lib/audio/chain-values';
import { EFFECTS, paramForDivision } from '../../src/lib/engine/effects';
import { loadedPosition } from '../../src/lib/engine/rig';

const touched = (): Touched => ({ racks: new Set(), decks: new Set() });

describe('following engine changes', () => {
	it('writes rack, chain position, parameter, route and deck paths and notes what they touched', () => {
		const state = quietRig(2);
		const t = touched();
		for (const [path, to] of [
			['racks.1.on', true],
			['racks.1.routes.B', true],
			['racks.1.chain.2.effect', 'gate'],
			['racks.1.chain.2.on', true],
			['racks.1.chain.2.params.0', 0.9],
			['decks.C.playing', false],
			['counters.held', 2]
		] as const) {
			writeChange(state, { t: 0, event: 0, path, from: null, to }, t);
		}
		expect(state.racks[1].on).toBe(true);
		expect(state.racks[1].routes.B).toBe(true);
		expect(state.racks[1].chain[2]).toMatchObject({ effect: 'gate', on: true });
		expect(state.racks[1].chain[2].params[0]).toBe(0.9);
		expect(state.racks[1].chain[1].effect).toBeNull();
		expect(state.decks.C.playing).toBe(false);
		expect([...t.racks]).toEqual([1]);
		expect([...t.decks]).toEqual(['C']);
	});
});

describe('chain position settings', () => {
	it('gives every position its own three parameters by catalog id', () => {
		const echo = { ...loadedPosition('echo'), params: [paramForDivision('echo', 1, '1/16'), 0.2, 0.9] };
		expect(positionValues(echo)).toEqual({ time: echo.params[0], feedback: 0.2, tone: 0.9 });
		const reverb = { ...loadedPosition('reverb'), params: [0.8, 0.1, 0.3] };
		expect(positionValues(reverb)).toEqual({ size: 0.8, decay: 0.1, damping: 0.3 });
	});

	it('loads a position at the catalog defaults and an empty one plays nothing', () => {
		const gate = loadedPosition('gate');
		expect(positionValues(gate)).toEqual(Object.fromEntries(EFFECTS.gate.params.map((p) => [p.id, p.default])));
		const empty = quietRig().racks[0].chain[0];
		expect(positionValues(empty)).toEqual({});
		expect(positionActive(empty)).toBe(false);
		expect(positionActive({ ...gate, on: false })).toBe(false);
		expect(positionActive(gate)).toBe(true);
	});

	it('engages a rack only when on, routed, mixed in, and with a position on (DESIGN.md §4.4)', () => {
		const rack = quietRig().racks[0];
		rack.on = true;
		rack.routes.A = true;
		rack.chain[1] = loadedPosition('gate');
		expect(rackEngaged(rack, 'A')).toBe(true);
		expect(rackEngaged(rack, 'B')).toBe(false); // not routed there
		rack.chain[1] = { ...rack.chain[1], on: false }; // the chain's only effect is off
		expect(rackEngaged(rack, 'A')).toBe(false);
		rack.chain[1] = loadedPosition('gate');
		rack.mix = 0;
		expect(rackEngaged(rack, 'A')).toBe(false);
	});
});
