import { describe, expect, it } from 'vitest';
import { applyEvents, demoMapping } from '$lib/engine';
import { LightBank, litInputs } from '$lib/midi/pad-lights';
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
