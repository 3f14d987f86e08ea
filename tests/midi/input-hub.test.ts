import { describe, expect, it } from 'vitest';
import { InputHub, type HubEvent } from '$lib/midi/input-hub.svelte';
import { GENERIC_4X4, alignProfile } from '$lib/midi/profiles';

function hub() {
	let now = 0;
	const h = new InputHub(GENERIC_4X4, () => now++);
	const seen: HubEvent[] = [];
	h.subscribe((e) => seen.push(e));
	return { h, seen };
}

describe('InputHub', () => {
	it('plays a MIDI note as a press and its Note On velocity 0 as the release', () => {
		const { h, seen } = hub();
		h.receiveMidi('midi:a', [0x90, 36, 100], 10);
		expect(h.held.has('pad-1')).toBe(true);
		h.receiveMidi('midi:a', [0x90, 36, 0], 20); // MIDI 1.0: velocity 0 = Note Off
		expect(seen).toEqual([
			{ t: 10, input: 'pad-1', type: 'press', source: 'midi:a' },
			{ t: 20, input: 'pad-1', type: 'release', source: 'midi:a' }
		]);
		expect(h.held.size).toBe(0);
	});

	it('treats a pad held from two places as one press until the last lets go', () => {
		const { h, seen } = hub();
		h.press('screen', 'pad-1', 1);
		h.receiveMidi('midi:a', [0x90, 36, 100], 2);
		h.release('screen', 'pad-1', 3);
		expect(seen.map((e) => e.type)).toEqual(['press']);
		h.receiveMidi('midi:a', [0x80, 36, 0], 4);
		expect(seen.map((e) => [e.type, e.t])).toEqual([
			['press', 1],
			['release', 4]
		]);
	});

	it('ignores a repeated press and a release of a pad the source does not hold', () => {
		const { h, seen } = hub();
		h.press('keyboard', 'pad-2');
		h.press('keyboard', 'pad-2');
		h.release('screen', 'pad-2');
		expect(seen).toHaveLength(1);
	});

	it('releases exactly what an unplugged device held', () => {
		const { h, seen } = hub();
		h.receiveMidi('midi:a', [0x90, 36, 100]);
		h.receiveMidi('midi:a', [0x90, 37, 100]);
		h.receiveMidi('midi:b', [0x90, 38, 100]);
		h.press('screen', 'pad-4');
		expect(h.releaseSource('midi:a', 99)).toBe(2);
		expect([...h.held].sort()).toEqual(['pad-3', 'pad-4']);
		expect(seen.filter((e) => e.type === 'release')).toEqual([
			{ t: 99, input: 'pad-1', type: 'release', source: 'midi:a' },
			{ t: 99, input: 'pad-2', type: 'release', source: 'midi:a' }
		]);
	});

	it('decodes each port with its own profile, so two controllers play the same pads', () => {
		const { h, seen } = hub();
		const other = alignProfile(
			{ name: 'Other', inputs: [{ id: 'x', kind: 'pad', channel: 2, note: 90, row: 3, col: 0 }] },
			GENERIC_4X4
		);
		h.usePortProfile('midi:b', other);
		h.receiveMidi('midi:b', [0x91, 90, 100], 5);
		expect(h.receiveMidi('midi:a', [0x91, 90, 100], 6).status).toBe('unmapped');
		expect(seen).toEqual([{ t: 5, input: 'pad-1', type: 'press', source: 'midi:b' }]);
	});

	it('passes knob turns through and clamps them to 0..1', () => {
		const { h, seen } = hub();
		h.turn('screen', 'knob-1', 1.5, 0);
		expect(seen[0]).toMatchObject({ type: 'turn', value: 1 });
	});

	it('stops telling a listener once it unsubscribes', () => {
		const h = new InputHub(GENERIC_4X4);
		const seen: HubEvent[] = [];
		const stop = h.subscribe((e) => seen.push(e));
		h.press('screen', 'pad-1');
		stop();
		h.release('screen', 'pad-1');
		expect(seen).toHaveLength(1);
	});
});
