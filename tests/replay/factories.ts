// Fixtures for the replay helpers: the demo stutter chord as a session document.
import { demoMapping, type InputEvent, type SessionDocument } from '$lib/engine';

export const brokenRow = () => demoMapping('broken-row');
export const twoDeck = () => demoMapping('two-deck');

export const press = (t: number, input: string): InputEvent => ({ t, input, type: 'press' });
export const release = (t: number, input: string): InputEvent => ({ t, input, type: 'release' });

/** Two fingers on the stutter row (pad-13, pad-14); the first lifts while the second is down. */
export const chord = (): InputEvent[] => [
	press(1000, 'pad-13'),
	press(1200, 'pad-14'),
	release(1500.25, 'pad-13'),
	release(2000, 'pad-14')
];

export function sessionOf(events: InputEvent[], extra: SessionDocument['events'] = []): SessionDocument {
	const all = [...events.map(({ t, ...input }) => ({ t, input })), ...extra].sort((a, b) => a.t - b.t);
	return {
		version: 2,
		tempo: 124,
		startedAt: '2026-03-02T18:30:00.000Z',
		clock: { zero: 0, tempos: [{ at: 0, bpm: 124 }] },
		events: all
	};
}
