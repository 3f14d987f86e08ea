import { afterEach, describe, expect, it, vi } from 'vitest';
import { applyEvents, demoMapping } from '$lib/engine';
import { LightBank, litInputs, padLights } from '$lib/midi/pad-lights';
import { PadRig } from '$lib/midi/pad-rig.svelte';
import { InputHub } from '$lib/midi/input-hub.svelte';
import type { InputEvent } from '$lib/engine';

const twoDeck = demoMapping('two-deck');
const press = (t: number, input: string): InputEvent => ({ t, input, type: 'press' });
const release = (t: number, input: string): InputEvent => ({ t, input, type: 'release' });

describe('litInputs', () => {
	it('lights nothing at rest', () => {
		expect(litInputs(twoDeck, applyEvents(twoDeck, []))).toEqual(new Set());
	});

	it('lights only the pad whose effect plays, not the other pads on the same rack', () => {
		// Demo two-deck: pad-1 is Echo A and pad-2 Reverb A, both on rack 1.
		const state = applyEvents(twoDeck, [press(0, 'pad-1')]);
		expect(litInputs(twoDeck, state)).toEqual(new Set(['pad-1']));
	});

	it('goes dark when the one-press pad is released', () => {
		const state = applyEvents(twoDeck, [press(0, 'pad-1'), release(10, 'pad-1')]);
		expect(litInputs(twoDeck, state).size).toBe(0);
	});

	it('keeps a legato row lit until the last finger lifts', () => {
		// Demo two-deck: pads 13–16 are the stutter row on rack 2, deck A, with the held counter.
		const held = applyEvents(twoDeck, [press(0, 'pad-13'), press(5, 'pad-14'), release(10, 'pad-13')]);
		expect(litInputs(twoDeck, held).has('pad-14')).toBe(true);
		const done = applyEvents(twoDeck, [
			press(0, 'pad-13'),
			press(5, 'pad-14'),
			release(10, 'pad-13'),
			release(20, 'pad-14')
		]);
		expect([...litInputs(twoDeck, done)]).toEqual([]);
	});
});

describe('a hold group shows which pad sounds', () => {
	// Demo two-deck: pads 13–16 load the stutter on rack 2 at slices 1/4, 1/8, 1/16, 1/32.
	it("lights the pad whose setting loaded the rack strong and the group's other held pads dim", () => {
		const state = applyEvents(twoDeck, [press(0, 'pad-13'), press(5, 'pad-14')]);
		const { lit, dim } = padLights(twoDeck, state);
		expect([...lit]).toEqual(['pad-14']);
		expect([...dim]).toEqual(['pad-13']);
	});

	it('moves the strong light to each newly pressed pad of the group', () => {
		const state = applyEvents(twoDeck, [press(0, 'pad-16'), press(5, 'pad-14'), press(9, 'pad-15')]);
		const { lit, dim } = padLights(twoDeck, state);
		expect([...lit]).toEqual(['pad-15']);
		expect([...dim].sort()).toEqual(['pad-14', 'pad-16']);
	});

	it('keeps the sounding setting strong after its pad lifts while another finger holds the effect', () => {
		// Lifting pad-14 does not load the rack again: the 1/8 slice still plays, pad-13 is held.
		const state = applyEvents(twoDeck, [press(0, 'pad-13'), press(5, 'pad-14'), release(9, 'pad-14')]);
		const { lit, dim } = padLights(twoDeck, state);
		expect([...lit]).toEqual(['pad-14']);
		expect([...dim]).toEqual(['pad-13']);
	});

	it('lights one pad alone strong and nothing dim', () => {
		const { lit, dim } = padLights(twoDeck, applyEvents(twoDeck, [press(0, 'pad-15')]));
		expect([...lit]).toEqual(['pad-15']);
		expect(dim.size).toBe(0);
	});

	it('sends a dim pad to the device at a quarter of its lit velocity', () => {
		const sent: number[][] = [];
		const bank = new LightBank({ schedule: () => 0, cancel: () => {} });
		bank.attach('out', twoDeck.profile, { send: (b) => sent.push(b) });
		bank.flush();
		sent.length = 0;
		const { lit, dim } = padLights(twoDeck, applyEvents(twoDeck, [press(0, 'pad-13'), press(5, 'pad-14')]));
		bank.show(lit, dim);
		bank.flush();
		// Demo profile: pad-13 answers on note 48, pad-14 on 49, lit velocity 127 (MIDI 1.0 Note On, ch 1);
		// dim = round(127 / 4) = 32.
		expect(sent.sort((a, b) => a[1] - b[1])).toEqual([
			[0x90, 48, 32],
			[0x90, 49, 127]
		]);
	});
});

describe('PadRig plays through the rig actor', () => {
	afterEach(() => {
		vi.useRealTimers();
	});

	it("waits for a quantized press's grid line, as the rehearsal room does", () => {
		vi.useFakeTimers();
		// pad-1 (Echo A) quantized to 1/4 at 120 BPM: grid lines every 500 ms (60000 / 120).
		const mapping = {
			...twoDeck,
			tempo: 120,
			bindings: twoDeck.bindings.map((b) => (b.input === 'pad-1' ? { ...b, quantize: '1/4' as const } : b))
		};
		const rig = new PadRig(mapping, () => 0);
		rig.apply(press(130, 'pad-1'));
		expect(rig.lit.has('pad-1')).toBe(false);
		expect(rig.events).toBe(0);
		vi.advanceTimersByTime(369);
		expect(rig.lit.has('pad-1')).toBe(false);
		vi.advanceTimersByTime(1);
		expect(rig.lit.has('pad-1')).toBe(true);
		expect(rig.events).toBe(1);
		rig.stop();
	});
});

describe('PadRig with the hub and a light bank', () => {
	it('lights the device pad while its effect is on and darkens it after', () => {
		const hub = new InputHub(twoDeck.profile);
		const rig = new PadRig(twoDeck);
		rig.listen(hub);
		const sent: number[][] = [];
		const bank = new LightBank({ schedule: () => 0, cancel: () => {} });
		bank.attach('out', twoDeck.profile, { send: (b) => sent.push(b) });
		bank.flush();
		sent.length = 0;
		hub.receiveMidi('midi:in', [0x90, 36, 100], 1);
		bank.show(rig.lit);
		bank.flush();
		// Demo profile: pad-1's light answers on note 36, velocity 127 lit (MIDI 1.0 Note On, ch 1).
		expect(sent).toEqual([[0x90, 36, 127]]);
		hub.receiveMidi('midi:in', [0x80, 36, 0], 2);
		bank.show(rig.lit);
		bank.flush();
		expect(sent.at(-1)).toEqual([0x90, 36, 0]);
		expect(rig.events).toBe(2);
	});

	it('darkens an output as it is detached', () => {
		const sent: number[][] = [];
		const bank = new LightBank({ schedule: () => 0, cancel: () => {} });
		bank.attach('out', twoDeck.profile, { send: (b) => sent.push(b) });
		bank.show(new Set(['pad-1']));
		bank.flush();
		sent.length = 0;
		bank.detach('out');
		expect(sent).toHaveLength(16);
		expect(sent.every(([, , v]) => v === 0)).toBe(true);
		expect(bank.size).toBe(0);
	});
});
