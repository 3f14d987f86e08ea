// The plot's time axis: the visible stretch of the session (a view), zoom and pan within it,
// pixel ↔ ms, and the beat grid at the session tempo (a bar is four beats from ms 0, the
// engine's clock origin).

export interface View {
	start: number;
	end: number;
}

export const MIN_SPAN = 40; // ms: zoomed all the way in, a frame or two of a fast roll

export const fullView = (duration: number): View => ({ start: 0, end: duration });

function clampView(start: number, span: number, duration: number): View {
	span = Math.min(Math.max(span, MIN_SPAN), duration);
	start = Math.min(Math.max(start, 0), duration - span);
	return { start, end: start + span };
}

/** `factor` < 1 zooms in; the moment under `anchor` stays where it is on screen. */
export function zoomView(view: View, factor: number, anchor: number, duration: number): View {
	const span = view.end - view.start;
	const next = Math.min(Math.max(span * factor, MIN_SPAN), duration);
	const share = span > 0 ? (anchor - view.start) / span : 0.5;
	return clampView(anchor - share * next, next, duration);
}

export const panView = (view: View, delta: number, duration: number): View =>
	clampView(view.start + delta, view.end - view.start, duration);

/** The view moved (a page at a time) just enough that `ms` is inside it. */
export function revealView(view: View, ms: number, duration: number): View {
	const span = view.end - view.start;
	if (ms >= view.start && ms <= view.end) return view;
	return clampView(ms < view.start ? ms - span * 0.9 : ms - span * 0.1, span, duration);
}

export const xOf = (ms: number, view: View, width: number) => ((ms - view.start) / (view.end - view.start)) * width;

export const msAt = (x: number, view: View, width: number) => view.start + (x / width) * (view.end - view.start);

export interface GridLine {
	t: number;
	bar: number | null; // bar number (from 1) when the line starts a bar
}

/** Beat lines at least `minGap` px apart: every beat, or every 2, 4, 8… beats when zoomed out. */
export function beatGrid(view: View, tempo: number, width: number, minGap = 10): GridLine[] {
	const beat = 60_000 / tempo;
	const pxPerBeat = (beat / (view.end - view.start)) * width;
	let stride = 1;
	while (stride * pxPerBeat < minGap) stride *= 2;
	const lines: GridLine[] = [];
	for (let b = Math.ceil(view.start / beat / stride) * stride; b * beat <= view.end; b += stride) {
		lines.push({ t: b * beat, bar: b % 4 === 0 ? b / 4 + 1 : null });
	}
	return lines;
}

const TICK_STEPS = [
	1, 2, 5, 10, 20, 50, 100, 200, 500, 1000, 2000, 5000, 10_000, 15_000, 30_000, 60_000, 120_000, 300_000, 600_000
];

/** Time labels at least `minGap` px apart, on round numbers of ms. */
export function timeTicks(view: View, width: number, minGap = 80): number[] {
	const span = view.end - view.start;
	const step = TICK_STEPS.find((s) => (s / span) * width >= minGap) ?? span;
	const ticks: number[] = [];
	for (let t = Math.ceil(view.start / step) * step; t <= view.end; t += step) ticks.push(t);
	return ticks;
}
