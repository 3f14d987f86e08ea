import { describe, expect, it } from 'vitest';
import { runEvents, type InputEvent, type Mapping, type RigState } from '$lib/engine';
import { RigSnapshots } from '$lib/replay/rig-snapshots';
import { press, release, twoDeck } from './factories';

/** Every state the engine passes through, in applied order: the oracle. */
function statesOf(mapping: Mapping, events: InputEvent[], tempo: number) {
	const states: RigState[] = [];
	const at: number[] = [];
	runEvents(mapping, events, { tempo }, (result, _before, _index, t) => {
		states.push(result.state);
		at.push(t);
	});
	return { states, at };
}

/** A long, deterministic roll over the two-deck grid: presses and releases of every pad. */
function roll(n: number): InputEvent[] {
	const events: InputEvent[] = [];
	const held = new Set<number>();
	let seed = 7;
	for (let i = 0; i < n; i++) {
		seed = (seed * 1103515245 + 12345) % 2 ** 31;
		const pad = 1 + (seed % 16);
		const t = i * 37;
		if (held.has(pad)) {
			held.delete(pad);
			events.push(release(t, `pad-${pad}`));
		} else {
			held.add(pad);
			events.push(press(t, `pad-${pad}`));
		}
	}
	return events;
}

describe('RigSnapshots', () => {
	it('gives the same state after every event as one straight engine run', () => {
		const events = roll(300);
		const { states } = statesOf(twoDeck(), events, 124);
		const snaps = new RigSnapshots(twoDeck(), events, 124, 16);
		for (let k = 1; k <= events.length; k++) expect(snaps.stateAfter(k)).toEqual(states[k - 1]);
	});

	it('counts an event landing exactly at the cursor as landed', () => {
		const snaps = new RigSnapshots(twoDeck(), [press(1000, 'pad-13'), release(1500.25, 'pad-13')], 124);
		expect([snaps.countAt(999.99), snaps.countAt(1000), snaps.countAt(1500.24), snaps.countAt(1500.25)]).toEqual([
			0, 1, 1, 2
		]);
		expect(snaps.stateAt(1200).held).toEqual(['pad-13']);
		expect(snaps.stateAt(1500.25).held).toEqual([]);
	});

	it('places a quantized press at its grid line, as the engine lands it', () => {
		const demo = twoDeck();
		const mapping = {
			...demo,
			bindings: demo.bindings.map((b) => (b.input === 'pad-1' ? { ...b, quantize: '1/4' as const } : b))
		};
		// 120 BPM: beats every 500 ms, so a press at 1100 ms lands at 1500 ms (common practice: 60 000 ms / BPM per beat).
		const snaps = new RigSnapshots(mapping, [press(1100, 'pad-1'), press(1200, 'pad-5')], 120);
		expect(snaps.at).toEqual([1200, 1500]);
		expect(snaps.stateAt(1400).racks[0].routes.A).toBe(false);
		expect(snaps.stateAt(1500).racks[0].routes.A).toBe(true);
		expect(snaps.stateAt(1500)).toEqual(statesOf(mapping, [press(1100, 'pad-1'), press(1200, 'pad-5')], 120).states[1]);
	});

	it('starts from the rest state before the first event and with no events at all', () => {
		const empty = new RigSnapshots(twoDeck(), [], 124);
		expect(empty.stateAt(5000).held).toEqual([]);
		expect(new RigSnapshots(twoDeck(), [press(10, 'pad-13')], 124).stateAt(0).counters).toEqual({ held: 0 });
	});
});
