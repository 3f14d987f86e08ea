import { describe, expect, it } from 'vitest';
import { DEMO_LOOPS } from '../../src/lib/audio/loops/patterns';
import { loopFrames, renderLoop } from '../../src/lib/audio/loops/render-loop';
import * as M from '../../src/lib/audio/measure';

const RATE = 48000;

describe('demo loops', () => {
	it('offers at least six loops between 85 and 175 BPM in different styles', () => {
		expect(DEMO_LOOPS.length).toBeGreaterThanOrEqual(6);
		for (const loop of DEMO_LOOPS) {
			expect(loop.bpm).toBeGreaterThanOrEqual(85);
			expect(loop.bpm).toBeLessThanOrEqual(175);
		}
		expect(new Set(DEMO_LOOPS.map((l) => l.style)).size).toBe(DEMO_LOOPS.length);
		for (const loop of DEMO_LOOPS)
			for (const lane of Object.values(loop.drums)) expect(lane).toHaveLength(loop.bars * 16);
	});

	it.each(DEMO_LOOPS.map((l) => [l.id, l] as const))(
		'%s lasts its bars at any tempo and is never silent',
		(_, loop) => {
			for (const bpm of [90, 128, 170]) {
				const [left, right] = renderLoop(loop, bpm, RATE);
				// Tempo arithmetic: a 4/4 bar = 240000 / BPM ms.
				expect(left.length).toBe(Math.round(((loop.bars * 240) / bpm) * RATE));
				expect(left.length).toBe(loopFrames(loop, bpm, RATE));
				expect(M.rms(left)).toBeGreaterThan(0.02);
				expect(M.peak(right)).toBeLessThan(4);
			}
		}
	);

	it('puts a four-on-the-floor kick on every beat', () => {
		const loop = DEMO_LOOPS.find((l) => l.id === 'glass-steps')!;
		const [left] = renderLoop(loop, 120, RATE);
		// 120 BPM: a beat every 500 ms (tempo arithmetic) = 24000 frames; the kick starts there.
		for (const beat of [0, 1, 2, 3]) expect(M.rms(left, beat * 24000, beat * 24000 + 480)).toBeGreaterThan(0.1);
	});
});
