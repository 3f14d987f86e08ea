// The computer keyboard as a controller: a block of keys laid out like the pad grid. Keys are
// matched by `KeyboardEvent.code` (the physical key), so the block keeps its shape on any layout.
import type { ControllerProfile } from '$lib/engine/types';
import { gridPads } from './profiles';

export interface KeyCell {
	code: string;
	label: string;
}

const ROWS: KeyCell[][] = [
	['1', '2', '3', '4', '5', '6', '7', '8'],
	['Q', 'W', 'E', 'R', 'T', 'Y', 'U', 'I'],
	['A', 'S', 'D', 'F', 'G', 'H', 'J', 'K'],
	['Z', 'X', 'C', 'V', 'B', 'N', 'M', ',']
].map((row) =>
	row.map((label) => ({
		label,
		code: label === ',' ? 'Comma' : /\d/.test(label) ? `Digit${label}` : `Key${label}`
	}))
);

export interface KeyBlock {
	rows: number;
	cols: number;
}

export const DEFAULT_KEY_BLOCK: KeyBlock = { rows: 4, cols: 4 };

export interface KeyBinding {
	code: string;
	label: string;
	input: string;
}

/** Keys for the top-left pads of the grid; pads outside the block have no key. */
export function keyboardLayout(profile: ControllerProfile, block: KeyBlock = DEFAULT_KEY_BLOCK): KeyBinding[] {
	const rows = Math.min(block.rows, ROWS.length);
	const cols = Math.min(block.cols, ROWS[0].length);
	const out: KeyBinding[] = [];
	for (const pad of gridPads(profile)) {
		if (pad.row! < rows && pad.col! < cols) {
			const cell = ROWS[pad.row!][pad.col!];
			out.push({ ...cell, input: pad.id });
		}
	}
	return out;
}
