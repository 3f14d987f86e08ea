import { describe, expect, it } from 'vitest';
import { MidiLearn } from '$lib/midi/midi-learn.svelte';
import { parseMessage, createDecoder, type MidiMessage } from '$lib/midi/decode';
import { alignProfile, GENERIC_4X4 } from '$lib/midi/profiles';

const msg = (bytes: number[]): MidiMessage => {
	const r = parseMessage(bytes);
	if (!r.ok) throw new Error(r.error);
	return r.message;
};

describe('MIDI learn', () => {
	it('asks for pads by row and column, counted from 1, then for knobs', () => {
		const learn = new MidiLearn({ name: 'My pads', rows: 2, cols: 3, knobs: 1 });
		expect(learn.prompts.map((p) => p.text)).toEqual([
			'Press the pad at row 1, column 1',
			'Press the pad at row 1, column 2',
			'Press the pad at row 1, column 3',
			'Press the pad at row 2, column 1',
			'Press the pad at row 2, column 2',
			'Press the pad at row 2, column 3',
			'Turn knob 1'
		]);
	});

	it('records the address of the Note On that answers, and ignores the release after it', () => {
		const learn = new MidiLearn({ name: 'My pads', rows: 1, cols: 2, knobs: 0 });
		expect(learn.hear(msg([0x95, 60, 90]))).toBe(true);
		// MIDI 1.0: Note On velocity 0 is a release, so it must not answer the next prompt.
		expect(learn.hear(msg([0x95, 60, 0]))).toBe(false);
		expect(learn.hear(msg([0x85, 61, 0]))).toBe(false);
		expect(learn.current?.text).toBe('Press the pad at row 1, column 2');
		expect(learn.learned[0]).toMatchObject({ kind: 'pad', channel: 6, note: 60, row: 0, col: 0, led: { note: 60 } });
	});

	it('refuses an address already learned and says which pad has it', () => {
		const learn = new MidiLearn({ name: 'x', rows: 1, cols: 2, knobs: 0 });
		learn.hear(msg([0x90, 60, 90]));
		expect(learn.hear(msg([0x90, 60, 90]))).toBe(false);
		expect(learn.notice).toContain('Pad 1·1');
	});

	it('learns a knob from a CC and a CC pad from a value of 64 or more', () => {
		const learn = new MidiLearn({ name: 'x', rows: 1, cols: 1, knobs: 1 });
		expect(learn.hear(msg([0xb0, 20, 10]))).toBe(false); // below the button threshold (DESIGN.md §4.1)
		expect(learn.hear(msg([0xb0, 20, 127]))).toBe(true);
		expect(learn.hear(msg([0x90, 40, 100]))).toBe(false); // a knob answers with a CC only
		expect(learn.hear(msg([0xb0, 21, 33]))).toBe(true);
		expect(learn.done).toBe(true);
		expect(learn.profile().inputs).toMatchObject([
			{ kind: 'pad', cc: 20 },
			{ kind: 'knob', cc: 21 }
		]);
	});

	it('can step back and skip', () => {
		const learn = new MidiLearn({ name: 'x', rows: 1, cols: 2, knobs: 0 });
		learn.hear(msg([0x90, 60, 90]));
		learn.back();
		expect(learn.learned).toHaveLength(0);
		learn.skip();
		expect(learn.current?.text).toBe('Press the pad at row 1, column 2');
	});

	it('builds a profile that plays a mapping by grid position', () => {
		const learn = new MidiLearn({ name: 'Learned', rows: 4, cols: 4, knobs: 0 });
		for (let n = 0; n < 16; n++) learn.hear(msg([0x90, 100 - n, 100]));
		const decode = createDecoder(alignProfile(learn.profile(), GENERIC_4X4));
		// Row 2, column 3 is the seventh prompt → note 94; on the generic grid that cell is pad-11.
		expect(decode([0x90, 94, 1], 0)).toMatchObject({ status: 'event', event: { input: 'pad-11' } });
	});
});
