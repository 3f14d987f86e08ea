/**
 * A tempo as people read it: at most two decimals, none when it is whole. A MIDI file stores
 * whole microseconds per quarter note (SMF 1.0 Set Tempo), so 124 BPM comes back as
 * 60 000 000 / 483 871 = 123.99999173… and is shown "124 BPM".
 */
export function formatBpm(bpm: number): string {
	return `${Number(bpm.toFixed(2))} BPM`;
}
