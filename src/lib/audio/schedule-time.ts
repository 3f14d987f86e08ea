// When a rig change sounds, on the audio clock (DESIGN.md §5). Two ways, one per use:
// - live (a pad pressed now): the next render quantum. Web Audio applies an automation event
//   timed at or before `currentTime` from the next block it renders (Web Audio API, AudioParam
//   "If startTime is less than currentTime, it is clamped to currentTime"), so scheduling at
//   `currentTime` adds no delay of our own beyond the block being rendered.
// - exact (replay, offline render): at the event's own time on the session clock, on a frame.
// Pure functions of a clock, so tests can drive them with a fake context.

/** The part of an AudioContext scheduling reads. */
export interface AudioClock {
	readonly currentTime: number;
	readonly sampleRate: number;
}

/** Web Audio API §2.4: audio is rendered in blocks of 128 sample-frames (one render quantum). */
export const RENDER_QUANTUM = 128;

/** A live change: at the context's current time, which the next rendered quantum starts from. */
export function liveTime(clock: AudioClock): number {
	return clock.currentTime;
}

/**
 * `seconds` on a frame, a quarter frame early so that frame is the first to hear it whether the
 * browser rounds event times up or to nearest (seconds × rate is rarely an exact integer).
 */
export function onFrame(seconds: number, sampleRate: number): number {
	return (Math.round(seconds * sampleRate) - 0.25) / sampleRate;
}

/** An exact change at `seconds` on the context clock: on its frame, never before the current time. */
export function exactTime(clock: AudioClock, seconds: number): number {
	return Math.max(onFrame(seconds, clock.sampleRate), clock.currentTime);
}
