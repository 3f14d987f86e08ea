// Times on the replay page: session ms shown as seconds with three decimals (the engine's own
// finding messages use the same form), and the `?t=` moment link read and written.

export const seconds = (ms: number) => `${(ms / 1000).toFixed(3)} s`;

/** `?t=12.438` (seconds) as ms, or null when absent or not a time. */
export function parseMoment(value: string | null): number | null {
	if (value === null || !/^\s*\d+(\.\d+)?\s*$/.test(value)) return null;
	return Math.round(Number(value) * 1_000_000) / 1000;
}

/** The same page opened at `ms`: other query parameters (e.g. `against`) kept. */
export function momentLink(url: URL | string, ms: number): string {
	const link = new URL(url);
	link.searchParams.set('t', (ms / 1000).toFixed(3));
	link.hash = '';
	return link.toString();
}
