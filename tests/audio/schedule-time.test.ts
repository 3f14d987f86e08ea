import { describe, expect, it } from 'vitest';
import { changeTime, exactTime, onFrame, RENDER_QUANTUM, type AudioClock } from '../../src/lib/audio/schedule-time';

/** A context clock that moves as the browser's does: a render quantum at a time. */
function fakeContext(sampleRate: number, quanta: number): AudioClock {
	return { sampleRate, currentTime: (quanta * RENDER_QUANTUM) / sampleRate };
}

describe('live changes', () => {
	for (const rate of [44100, 48000]) {
		it(`are scheduled within one render quantum of the event arriving at ${rate} Hz`, () => {
			// Web Audio API §2.4: a render quantum is 128 frames (2.90 ms at 44.1 kHz, 2.67 ms at 48 kHz).
			const quantum = RENDER_QUANTUM / rate;
			for (const quanta of [0, 1, 977, 123_456]) {
				const context = fakeContext(rate, quanta);
				const arrived = context.currentTime;
				// The event's own time may sit behind or ahead of the audio clock (clock drift, a
				// 40 ms look-ahead of old): live scheduling does not wait for it.
				for (const at of [arrived - 0.5, arrived, arrived + 0.04, arrived + 3]) {
					const added = changeTime(context, true, at) - arrived;
					expect(added).toBeGreaterThanOrEqual(0);
					expect(added).toBeLessThan(quantum);
				}
			}
		});
	}

	it('follow the context clock as it moves on', () => {
		const context = { sampleRate: 48000, currentTime: 0 };
		const times: number[] = [];
		for (let q = 0; q < 4; q++) {
			context.currentTime = (q * RENDER_QUANTUM) / 48000;
			times.push(changeTime(context, true, 0));
		}
		expect(times).toEqual([0, 128, 256, 384].map((f) => f / 48000));
	});
});

describe('exact changes (replay, offline render)', () => {
	it('land on the frame of their own time, ahead of the clock', () => {
		const context = fakeContext(48000, 10);
		const at = 1.23456;
		const time = changeTime(context, false, at);
		expect(time).toBe(onFrame(at, 48000));
		// A quarter frame before the frame, so that frame is the first to hear it.
		expect(time * 48000).toBeCloseTo(Math.round(at * 48000) - 0.25, 6);
	});

	it('never land before the current time', () => {
		const context = fakeContext(48000, 1000);
		expect(exactTime(context, context.currentTime - 1)).toBe(context.currentTime);
	});
});
