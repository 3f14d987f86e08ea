import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { createActor, SimulatedClock } from 'xstate';
import { rigMachine, type RigChangesEmitted } from '$lib/engine/machines/rig';
import { replay } from '$lib/engine/replay';
import { demoMapping } from '$lib/engine/demo';
import type { InputEvent, Mapping, RigChange } from '$lib/engine/types';
import { legatoMapping, press, release } from '../factories';

/** Play events live through the actor on a simulated clock, as a device would send them. */
function playLive(mapping: Mapping, events: InputEvent[], tempo?: number) {
	const clock = new SimulatedClock();
	const actor = createActor(rigMachine, { input: { mapping, tempo }, clock }).start();
	const changes: RigChange[] = [];
	actor.on('changes', (e: RigChangesEmitted) => changes.push(...e.changes));
	for (const e of events) {
		clock.set(e.t);
		actor.send({ type: 'input', event: e });
	}
	clock.set((events.at(-1)?.t ?? 0) + 10_000);
	return { actor, changes };
}

const quantized = (q: '1/8' | '1/16'): Mapping => {
	const m = demoMapping('two-deck');
	return { ...m, bindings: m.bindings.map((b) => (b.group ? { ...b, quantize: q } : b)) };
};

describe('rig actor', () => {
	it('holds the state the pure API computes', () => {
		const m = legatoMapping(4);
		const events = [press(0, 'p1'), press(10, 'p2'), release(20, 'p1')];
		const { actor } = playLive(m, events);
		expect(actor.getSnapshot().context.state).toEqual(replay(m, events).final);
		expect(actor.getSnapshot().context.state.counters.held).toBe(1);
	});

	it('waits for the grid line before engaging a quantized pad', () => {
		// 1/16 at 124 BPM = 120.97 ms (REFERENCES.md formula: 0.0625 × 240000 / 124).
		const clock = new SimulatedClock();
		const live = createActor(rigMachine, { input: { mapping: quantized('1/16') }, clock }).start();
		const seen: number[] = [];
		live.on('changes', (e) => seen.push(e.at));
		clock.set(1010);
		live.send({ type: 'input', event: press(1010, 'pad-13') });
		expect(live.getSnapshot().context.state.racks[1].on).toBe(false);
		clock.set(1088);
		expect(seen).toEqual([]);
		clock.set(1089);
		expect(live.getSnapshot().context.state.racks[1].on).toBe(true);
		expect(seen[0]).toBeCloseTo(1088.71, 2);
	});

	it('waits for the grid line before a quantized release too, as replay does', () => {
		// 1/16 at 120 BPM = 125 ms (REFERENCES.md): press 130 → 250, release 260 → 375 (DESIGN.md §4.5).
		const m = { ...legatoMapping(2), tempo: 120 };
		const q = { ...m, bindings: m.bindings.map((b) => ({ ...b, quantize: '1/16' as const })) };
		const clock = new SimulatedClock();
		const live = createActor(rigMachine, { input: { mapping: q }, clock }).start();
		const seen: [number, number][] = [];
		live.on('changes', (e) => seen.push([e.index, e.at]));
		clock.set(130);
		live.send({ type: 'input', event: press(130, 'p1') });
		clock.set(260);
		live.send({ type: 'input', event: release(260, 'p1') });
		expect(live.getSnapshot().context.state.racks[0].on).toBe(true);
		clock.set(374);
		expect(live.getSnapshot().context.state.racks[0].on).toBe(true);
		clock.set(375);
		expect(live.getSnapshot().context.state.racks[0].on).toBe(false);
		expect(seen).toEqual([
			[0, 250],
			[1, 375]
		]);
	});

	it('keeps the beat across a tempo change given with its time', () => {
		const clock = new SimulatedClock();
		const live = createActor(rigMachine, { input: { mapping: quantized('1/8'), tempo: 120 }, clock }).start();
		live.send({ type: 'tempo', bpm: 60, at: 1000 });
		expect(live.getSnapshot().context.clock).toEqual({
			zero: 0,
			tempos: [
				{ at: 0, bpm: 120 },
				{ at: 1000, bpm: 60 }
			]
		});
	});

	it('follows a tempo change and resets to the starting rig', () => {
		const clock = new SimulatedClock();
		const live = createActor(rigMachine, { input: { mapping: quantized('1/8') }, clock }).start();
		live.send({ type: 'tempo', bpm: 120 });
		live.send({ type: 'input', event: press(0, 'pad-13') });
		expect(live.getSnapshot().context.state.racks[1].on).toBe(true); // 0 ms is on the grid
		live.send({ type: 'reset' });
		expect(live.getSnapshot().context.state.racks[1].on).toBe(false);
		expect(live.getSnapshot().context.nextIndex).toBe(0);
	});

	it('gives the same changes as replay for any play, quantized or not', () => {
		const ids = ['pad-13', 'pad-14', 'pad-15', 'pad-16', 'pad-1', 'pad-5'];
		const events = fc
			.array(fc.tuple(fc.nat(ids.length - 1), fc.integer({ min: 0, max: 300 })), { maxLength: 40 })
			.map((moves) => {
				const held = new Set<string>();
				let t = 0;
				return moves.map(([k, gap]): InputEvent => {
					t += gap;
					const input = ids[k];
					const type = held.has(input) ? 'release' : 'press';
					if (type === 'release') held.delete(input);
					else held.add(input);
					return { t, input, type };
				});
			});
		fc.assert(
			fc.property(fc.constantFrom(demoMapping('two-deck'), quantized('1/8'), quantized('1/16')), events, (m, evs) => {
				const live = playLive(m, evs);
				const pure = replay(m, evs);
				expect(JSON.stringify(live.changes)).toBe(JSON.stringify(pure.changes));
				expect(live.actor.getSnapshot().context.state).toEqual(pure.final);
			}),
			{ numRuns: 150 }
		);
	});
});
