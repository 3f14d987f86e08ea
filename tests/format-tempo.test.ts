import { describe, expect, it } from 'vitest';
import { formatBpm } from '$lib/format-tempo';
import { usPerQuarter } from '$lib/midi/smf';

describe('formatBpm', () => {
	it('shows a tempo read back from a MIDI file as the whole number it was written as', () => {
		// SMF 1.0 Set Tempo holds whole µs per quarter: 124 BPM is written as 483871 µs, which reads
		// back as 60 000 000 / 483 871 BPM.
		expect(usPerQuarter(124)).toBe(483_871);
		expect(60_000_000 / 483_871).not.toBe(124);
		expect(formatBpm(60_000_000 / 483_871)).toBe('124 BPM');
	});

	it.each([
		[120, '120 BPM'],
		[128.5, '128.5 BPM'],
		[93.3333333, '93.33 BPM'],
		[174.996, '175 BPM']
	])('shows %f as %s', (bpm, text) => {
		expect(formatBpm(bpm)).toBe(text);
	});
});
