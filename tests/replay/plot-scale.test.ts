import { describe, expect, it } from 'vitest';
import {
	beatGrid,
	fullView,
	MIN_SPAN,
	msAt,
	panView,
	revealView,
	timeTicks,
	xOf,
	zoomView
} from '$lib/replay/plot-scale';

describe('zoom and pan', () => {
	it('keeps the moment under the anchor in place when zooming', () => {
		const view = { start: 0, end: 4000 };
		const zoomed = zoomView(view, 0.5, 1000, 4000);
		expect(zoomed).toEqual({ start: 500, end: 2500 });
		expect(xOf(1000, zoomed, 800)).toBeCloseTo(xOf(1000, view, 800));
	});

	it('never zooms in past the smallest span nor out past the whole session', () => {
		expect(
			zoomView({ start: 0, end: 100 }, 0.01, 50, 4000).end - zoomView({ start: 0, end: 100 }, 0.01, 50, 4000).start
		).toBe(MIN_SPAN);
		expect(zoomView({ start: 1000, end: 2000 }, 100, 1500, 4000)).toEqual(fullView(4000));
	});

	it('stops panning at either end', () => {
		expect(panView({ start: 0, end: 1000 }, -500, 4000)).toEqual({ start: 0, end: 1000 });
		expect(panView({ start: 2000, end: 3000 }, 5000, 4000)).toEqual({ start: 3000, end: 4000 });
	});

	it('pages the view to a moment outside it and leaves it alone inside', () => {
		const view = { start: 0, end: 1000 };
		expect(revealView(view, 500, 4000)).toBe(view);
		expect(revealView(view, 1500, 4000)).toEqual({ start: 1400, end: 2400 });
	});

	it('turns pixels back into the same ms', () => {
		const view = { start: 250, end: 1250 };
		expect(msAt(xOf(1000.25, view, 640), view, 640)).toBeCloseTo(1000.25, 9);
	});
});

describe('beatGrid', () => {
	// Common practice: a beat lasts 60 000 ms / BPM and a bar of 4/4 is four beats.
	it('draws a line every beat at 120 BPM and numbers every fourth as a bar', () => {
		const lines = beatGrid({ start: 0, end: 4000 }, 120, 800);
		expect(lines.map((l) => l.t)).toEqual([0, 500, 1000, 1500, 2000, 2500, 3000, 3500, 4000]);
		expect(lines.filter((l) => l.bar !== null).map((l) => [l.t, l.bar])).toEqual([
			[0, 1],
			[2000, 2],
			[4000, 3]
		]);
	});

	it('thins the lines out when beats would crowd closer than the gap', () => {
		const lines = beatGrid({ start: 0, end: 60_000 }, 120, 600, 10);
		// 1 beat = 5 px here, so every second beat (10 px) is drawn.
		expect(lines[1].t - lines[0].t).toBe(1000);
	});
});

describe('timeTicks', () => {
	it('labels round times at least the gap apart', () => {
		expect(timeTicks({ start: 0, end: 2500 }, 1000, 80)).toEqual([
			0, 200, 400, 600, 800, 1000, 1200, 1400, 1600, 1800, 2000, 2200, 2400
		]);
	});
});
