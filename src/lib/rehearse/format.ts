// Times as the room shows them: m:ss.t for the recorder, seconds with milliseconds for findings.

export function formatClock(ms: number): string {
	const tenths = Math.max(0, Math.floor(ms / 100));
	const s = Math.floor(tenths / 10);
	return `${Math.floor(s / 60)}:${String(s % 60).padStart(2, '0')}.${tenths % 10}`;
}

export function formatSeconds(ms: number): string {
	return `${(ms / 1000).toFixed(3)} s`;
}

export const percent = (x: number) => `${Math.round(x * 100)}%`;
