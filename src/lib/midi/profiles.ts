// Built-in generic controller profiles, plus the helpers that let any device's profile drive a
// mapping written for another one (pads matched by grid position).
import type { ControllerInput, ControllerProfile, Mapping } from '$lib/engine/types';

/** Pads numbered from the bottom-left, rising left to right then upwards (common practice). */
function padRows(rows: number, cols: number, firstNote: number, channel = 1): ControllerInput[] {
	const inputs: ControllerInput[] = [];
	for (let row = 0; row < rows; row++) {
		for (let col = 0; col < cols; col++) {
			const fromBottom = rows - 1 - row;
			const n = fromBottom * cols + col;
			const note = firstNote + n;
			inputs.push({
				id: `pad-${n + 1}`,
				kind: 'pad',
				label: `Pad ${n + 1}`,
				channel,
				note,
				row,
				col,
				led: { note, on: 127, off: 0 }
			});
		}
	}
	return inputs.sort((a, b) => a.row! - b.row! || a.col! - b.col!);
}

export const GENERIC_4X4: ControllerProfile = {
	name: 'Generic 4×4 pads',
	rows: 4,
	cols: 4,
	inputs: padRows(4, 4, 36)
};

export const GENERIC_8X8: ControllerProfile = {
	name: 'Generic 8×8 grid',
	rows: 8,
	cols: 8,
	inputs: padRows(8, 8, 36)
};

export const GENERIC_2X8_KNOBS: ControllerProfile = {
	name: 'Generic 2×8 pads + 8 knobs',
	rows: 2,
	cols: 8,
	inputs: [
		...padRows(2, 8, 36),
		...Array.from({ length: 8 }, (_, i): ControllerInput => ({
			id: `knob-${i + 1}`,
			kind: 'knob',
			label: `Knob ${i + 1}`,
			channel: 1,
			cc: 70 + i
		}))
	]
};

export const GENERIC_PROFILES: readonly ControllerProfile[] = [GENERIC_4X4, GENERIC_8X8, GENERIC_2X8_KNOBS];

export function gridPads(profile: ControllerProfile): ControllerInput[] {
	return profile.inputs.filter((i) => i.row !== undefined && i.col !== undefined);
}

export function gridSize(profile: ControllerProfile): { rows: number; cols: number } {
	const pads = gridPads(profile);
	return {
		rows: profile.rows ?? Math.max(0, ...pads.map((p) => p.row! + 1)),
		cols: profile.cols ?? Math.max(0, ...pads.map((p) => p.col! + 1))
	};
}

/**
 * Re-labels a device's inputs with the ids of a mapping's profile so the device can play that
 * mapping: grid inputs match by row and column, the rest by id. Device addresses and lights are
 * kept; inputs with no counterpart are dropped (they are then unmapped on that device).
 */
export function alignProfile(device: ControllerProfile, mapping: ControllerProfile): ControllerProfile {
	if (device === mapping) return mapping;
	const byCell = new Map(gridPads(mapping).map((i) => [`${i.row}:${i.col}`, i]));
	const byId = new Map(mapping.inputs.map((i) => [i.id, i]));
	const inputs: ControllerInput[] = [];
	for (const input of device.inputs) {
		const twin =
			input.row !== undefined && input.col !== undefined ? byCell.get(`${input.row}:${input.col}`) : byId.get(input.id);
		if (twin) inputs.push({ ...input, id: twin.id, label: twin.label ?? input.label });
	}
	return { ...mapping, name: device.name, inputs };
}

/**
 * A mapping played from a learned controller: every input of the mapping takes the address
 * (channel, note or CC, light) the device has at the same grid cell (or, off the grid, the same
 * id), so the bindings stay as they are. Inputs the device has no counterpart for keep their old
 * address; `matched` says how many moved.
 */
export function withLearnedProfile(mapping: Mapping, device: ControllerProfile): { mapping: Mapping; matched: number } {
	const aligned = new Map(alignProfile(device, mapping.profile).inputs.map((i) => [i.id, i]));
	let matched = 0;
	const inputs = mapping.profile.inputs.map((input) => {
		const learned = aligned.get(input.id);
		if (!learned) return input;
		matched++;
		const { channel, note, cc, led } = learned;
		return { ...input, channel, note, cc, led: led ?? input.led };
	});
	return { mapping: { ...mapping, profile: { ...mapping.profile, name: device.name, inputs } }, matched };
}
