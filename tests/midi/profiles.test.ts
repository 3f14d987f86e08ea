import { describe, expect, it } from 'vitest';
import { GENERIC_2X8_KNOBS, GENERIC_4X4, GENERIC_8X8, alignProfile, gridSize } from '$lib/midi/profiles';
import { createDecoder } from '$lib/midi/decode';
import { keyboardLayout } from '$lib/midi/keyboard';
import type { ControllerProfile } from '$lib/engine/types';

const notes = (p: ControllerProfile) => p.inputs.flatMap((i) => (i.note === undefined ? [] : [i.note]));

describe('generic profiles', () => {
	it('puts the 4×4 pads on notes 36–51, one note each, lit on their own note', () => {
		// Issue 5: "4×4 pads on notes 36–51" (common practice for pad controllers).
		expect(notes(GENERIC_4X4).sort((a, b) => a - b)).toEqual(Array.from({ length: 16 }, (_, i) => 36 + i));
		expect(GENERIC_4X4.inputs.every((i) => i.led?.note === i.note)).toBe(true);
	});

	it('numbers pads from the bottom-left corner upwards', () => {
		const at = (row: number, col: number) => GENERIC_4X4.inputs.find((i) => i.row === row && i.col === col)?.note;
		expect(at(3, 0)).toBe(36);
		expect(at(3, 3)).toBe(39);
		expect(at(0, 0)).toBe(48);
		expect(at(0, 3)).toBe(51);
	});

	it('gives the 8×8 grid 64 distinct notes and the 2×8 profile 16 pads and 8 knobs', () => {
		expect(new Set(notes(GENERIC_8X8)).size).toBe(64);
		expect(gridSize(GENERIC_8X8)).toEqual({ rows: 8, cols: 8 });
		expect(GENERIC_2X8_KNOBS.inputs.filter((i) => i.kind === 'pad')).toHaveLength(16);
		expect(GENERIC_2X8_KNOBS.inputs.filter((i) => i.kind === 'knob' && i.cc !== undefined)).toHaveLength(8);
	});
});

describe('alignProfile', () => {
	it("lets a device with other notes play a mapping's pads by grid position", () => {
		const device: ControllerProfile = {
			name: 'Learned',
			rows: 4,
			cols: 4,
			inputs: [{ id: 'pad-x', kind: 'pad', channel: 2, note: 60, row: 0, col: 0, led: { note: 60 } }]
		};
		const aligned = alignProfile(device, GENERIC_4X4);
		const top = GENERIC_4X4.inputs.find((i) => i.row === 0 && i.col === 0)!;
		expect(createDecoder(aligned)([0x91, 60, 1], 0)).toMatchObject({ status: 'event', event: { input: top.id } });
		expect(aligned.inputs[0].led).toEqual({ note: 60 });
	});
});

describe('keyboard block', () => {
	it('puts 1 2 3 4 / Q W E R / A S D F / Z X C V on the top-left 4×4 pads', () => {
		const keys = keyboardLayout(GENERIC_8X8);
		expect(keys).toHaveLength(16);
		const label = (row: number, col: number) => {
			const pad = GENERIC_8X8.inputs.find((i) => i.row === row && i.col === col)!;
			return keys.find((k) => k.input === pad.id)?.label;
		};
		expect([label(0, 0), label(0, 3), label(1, 0), label(2, 1), label(3, 3)]).toEqual(['1', '4', 'Q', 'S', 'V']);
		expect(keys.find((k) => k.label === 'Q')?.code).toBe('KeyQ');
	});
});
