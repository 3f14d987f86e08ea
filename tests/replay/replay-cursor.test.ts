import { describe, expect, it } from 'vitest';
import { ReplayCursor, type Ticker } from '$lib/replay/replay-cursor.svelte';

/** Frames run only when the test says so, at the time it sets. */
function manualTicker() {
	let now = 0;
	let queued: (() => void) | null = null;
	const ticker: Ticker = {
		now: () => now,
		frame: (cb) => ((queued = cb), 1),
		cancel: () => (queued = null)
	};
	const advance = (ms: number) => {
		now += ms;
		const cb = queued;
		queued = null;
		cb?.();
	};
	return { ticker, advance };
}

const times = [1000, 1200, 1200, 1500.25, 2000];

describe('ReplayCursor', () => {
	it('moves in real time times the speed while playing', () => {
		const { ticker, advance } = manualTicker();
		const cursor = new ReplayCursor(times, 2500, 0, ticker);
		cursor.play();
		advance(100);
		expect(cursor.t).toBe(100);
		cursor.setSpeed(0.25);
		advance(100);
		expect(cursor.t).toBe(125);
		cursor.setSpeed(4);
		advance(100);
		expect(cursor.t).toBe(525);
	});

	it('stops at the end, and plays again from the start', () => {
		const { ticker, advance } = manualTicker();
		const cursor = new ReplayCursor(times, 2500, 2400, ticker);
		cursor.play();
		advance(500);
		expect([cursor.t, cursor.playing]).toEqual([2500, false]);
		cursor.play();
		expect(cursor.t).toBe(0);
	});

	it('does not play a session with no events', () => {
		const { ticker, advance } = manualTicker();
		const cursor = new ReplayCursor([], 0, 0, ticker);
		cursor.play();
		advance(4000);
		expect([cursor.playing, cursor.t]).toEqual([false, 0]);
	});

	it('stays put after a pause', () => {
		const { ticker, advance } = manualTicker();
		const cursor = new ReplayCursor(times, 2500, 0, ticker);
		cursor.toggle();
		advance(50);
		cursor.toggle();
		advance(500);
		expect([cursor.t, cursor.playing]).toEqual([50, false]);
	});

	it('steps from one event landing to the next and back', () => {
		const cursor = new ReplayCursor(times, 2500, 0, manualTicker().ticker);
		const visited: number[] = [];
		for (let i = 0; i < 5; i++) visited.push((cursor.stepForward(), cursor.t));
		expect(visited).toEqual([1000, 1200, 1500.25, 2000, 2500]);
		const back: number[] = [];
		for (let i = 0; i < 5; i++) back.push((cursor.stepBack(), cursor.t));
		expect(back).toEqual([2000, 1500.25, 1200, 1000, 0]);
	});

	it('keeps seeks inside the session', () => {
		const cursor = new ReplayCursor(times, 2500, 0, manualTicker().ticker);
		cursor.seek(-5);
		expect(cursor.t).toBe(0);
		cursor.seek(9000);
		expect(cursor.t).toBe(2500);
		cursor.seek(Number.NaN);
		expect(cursor.t).toBe(0);
	});

	it('only plays at the offered speeds', () => {
		const cursor = new ReplayCursor(times, 2500, 0, manualTicker().ticker);
		cursor.setSpeed(3.2);
		expect(cursor.speed).toBe(4);
		cursor.setSpeed(0.1);
		expect(cursor.speed).toBe(0.25);
	});
});
