import { describe, expect, it } from 'vitest';
import { LightFeedback } from '$lib/midi/lights';
import { GENERIC_4X4 } from '$lib/midi/profiles';
import type { ControllerProfile } from '$lib/engine/types';

/** A hand-cranked clock and timer queue, so coalescing is checked without waiting. */
function harness(profile: ControllerProfile = GENERIC_4X4, intervalMs = 10) {
	const sent: number[][] = [];
	let now = 0;
	const timers: { at: number; run: () => void; id: number }[] = [];
	let nextId = 1;
	const lights = new LightFeedback(
		profile,
		{ send: (b) => sent.push(b) },
		{
			intervalMs,
			now: () => now,
			schedule: (run, ms) => {
				const id = nextId++;
				timers.push({ at: now + ms, run, id });
				return id;
			},
			cancel: (id) => {
				const i = timers.findIndex((t) => t.id === id);
				if (i >= 0) timers.splice(i, 1);
			}
		}
	);
	const advance = (ms: number) => {
		now += ms;
		for (const t of timers.filter((t) => t.at <= now)) {
			timers.splice(timers.indexOf(t), 1);
			t.run();
		}
	};
	return { lights, sent, timers, advance };
}

describe('LightFeedback', () => {
	it('sends a Note On with the profile velocity to light a pad, on the pad channel', () => {
		const profile: ControllerProfile = {
			name: 'One pad',
			inputs: [{ id: 'a', kind: 'pad', channel: 10, note: 40, led: { note: 41, on: 45, off: 3 } }]
		};
		const { lights, sent, advance } = harness(profile);
		lights.show(['a']);
		advance(0);
		// MIDI 1.0: 0x99 = Note On, channel 10; LED note and velocity from the profile.
		expect(sent).toEqual([[0x99, 41, 45]]);
		lights.show([]);
		advance(10);
		expect(sent.at(-1)).toEqual([0x99, 41, 3]);
	});

	it('sends only what changed since the last flush', () => {
		const { lights, sent, advance } = harness();
		lights.show(['pad-1']);
		advance(0);
		expect(sent).toHaveLength(16); // first flush tells the device every light
		sent.length = 0;
		lights.show(['pad-1', 'pad-2']);
		advance(10);
		expect(sent).toEqual([[0x90, 37, 127]]);
	});

	it('coalesces a burst of changes into one flush of the net difference', () => {
		const { lights, sent, timers, advance } = harness();
		lights.show([]);
		advance(0);
		sent.length = 0;
		for (let i = 0; i < 100; i++) lights.show(i % 2 ? [] : ['pad-1', 'pad-16']);
		lights.show(['pad-16']);
		expect(timers).toHaveLength(1);
		advance(10);
		expect(sent).toEqual([[0x90, 51, 127]]);
	});

	it('waits out the interval after a flush before flushing again', () => {
		const { lights, sent, advance } = harness(GENERIC_4X4, 10);
		lights.show([]);
		advance(0);
		sent.length = 0;
		lights.show(['pad-1']);
		advance(9);
		expect(sent).toEqual([]);
		advance(1);
		expect(sent).toEqual([[0x90, 36, 127]]);
	});

	it('darkens every light at once, cancelling a pending flush', () => {
		const { lights, sent, timers } = harness();
		lights.show(['pad-1']);
		lights.dark();
		expect(timers).toHaveLength(0);
		expect(sent).toHaveLength(16);
		expect(sent.every((m) => m[2] === 0)).toBe(true);
	});

	it('stops quietly when the port has gone away', () => {
		let calls = 0;
		const lights = new LightFeedback(GENERIC_4X4, {
			send: () => {
				calls++;
				throw new Error('port closed');
			}
		});
		lights.show(['pad-1']);
		expect(() => lights.flush()).not.toThrow();
		expect(() => lights.dark()).not.toThrow();
		expect(calls).toBe(2);
	});
});
