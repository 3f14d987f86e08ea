// Effect catalog metadata and tempo math. Pure data: the audio layer builds the sound, this file
// only says what each effect is called, what a chain slot's `amount` means, and what the three
// focus parameters are. Parameters are stored 0..1 in the rig; beat-synced ones map that value to
// a note division (`divisionFromValue`) so a pad can say "1/16" and the rig still holds a number.
import type { EffectId } from './types';

export const DIVISIONS = ['1/2', '1/4', '1/8', '1/16', '1/32'] as const;
/** A note value: `1/8`, dotted `1/8.`, triplet `1/8t`. */
export type Division = string;

export interface EffectParam {
	id: string;
	label: string;
	default: number; // 0..1, as the rig stores it
	/** For beat-synced params: the divisions 0..1 is split into, slowest first. */
	divisions?: readonly Division[];
	/** For continuous params: the range the audio layer scales 0..1 onto. */
	range?: { min: number; max: number; unit: string; curve: 'linear' | 'exp' };
}

export interface EffectInfo {
	id: EffectId;
	label: string;
	amount: string; // what a chain slot's amount knob does
	params: readonly [EffectParam, EffectParam, EffectParam];
}

const beats = (id: string, label: string, divisions: readonly Division[], at: Division) => ({
	id,
	label,
	divisions,
	default: divisionValue(divisions, at)
});
const knob = (
	id: string,
	label: string,
	value: number,
	min = 0,
	max = 1,
	unit = '',
	curve: 'linear' | 'exp' = 'linear'
) => ({ id, label, default: value, range: { min, max, unit, curve } });

const ECHO_TIMES = ['1/4', '1/8.', '1/8', '1/16'] as const;
const SLICES = ['1/4', '1/8', '1/16', '1/32'] as const;

export const EFFECTS: Record<EffectId, EffectInfo> = {
	echo: {
		id: 'echo',
		label: 'Echo',
		amount: 'feedback',
		params: [
			beats('time', 'Time', ECHO_TIMES, '1/8'),
			knob('feedback', 'Feedback', 0.45),
			knob('tone', 'Tone', 0.6, 500, 12000, 'Hz', 'exp')
		]
	},
	'ping-pong': {
		id: 'ping-pong',
		label: 'Ping-pong echo',
		amount: 'feedback',
		params: [beats('time', 'Time', ECHO_TIMES, '1/8'), knob('feedback', 'Feedback', 0.4), knob('width', 'Width', 1)]
	},
	'tape-echo': {
		id: 'tape-echo',
		label: 'Tape echo',
		amount: 'feedback',
		params: [beats('time', 'Time', ECHO_TIMES, '1/8.'), knob('feedback', 'Feedback', 0.5), knob('wear', 'Wear', 0.3)]
	},
	reverb: {
		id: 'reverb',
		label: 'Reverb',
		amount: 'size',
		params: [
			knob('size', 'Size', 0.6),
			knob('decay', 'Decay', 0.5, 0.3, 10, 's', 'exp'),
			knob('damping', 'Damping', 0.4, 1000, 16000, 'Hz', 'exp')
		]
	},
	filter: {
		id: 'filter',
		label: 'Filter',
		amount: 'cutoff (low-pass below the middle, high-pass above)',
		params: [
			knob('cutoff', 'Cutoff', 0.5, 20, 20000, 'Hz', 'exp'),
			knob('resonance', 'Resonance', 0.3, 0.5, 15, 'Q', 'linear'),
			knob('drive', 'Drive', 0)
		]
	},
	stutter: {
		id: 'stutter',
		label: 'Stutter',
		amount: 'slice length',
		params: [beats('slice', 'Slice', SLICES, '1/8'), knob('smooth', 'Smooth', 0.2), knob('pitch', 'Pitch drop', 0)]
	},
	gate: {
		id: 'gate',
		label: 'Gate',
		amount: 'depth',
		params: [beats('rate', 'Rate', SLICES, '1/16'), knob('depth', 'Depth', 1), knob('shape', 'Shape', 0.3)]
	},
	bitcrush: {
		id: 'bitcrush',
		label: 'Bitcrush',
		amount: 'crush',
		params: [
			knob('bits', 'Bits', 0.5, 16, 2, 'bits', 'linear'),
			knob('rate', 'Sample rate', 0.5, 44100, 1000, 'Hz', 'exp'),
			knob('tone', 'Tone', 0.7)
		]
	},
	flanger: {
		id: 'flanger',
		label: 'Flanger',
		amount: 'depth',
		params: [
			beats('rate', 'Sweep', ['1/2', '1/4', '1/8', '1/16'], '1/4'),
			knob('depth', 'Depth', 0.6),
			knob('feedback', 'Feedback', 0.5)
		]
	},
	phaser: {
		id: 'phaser',
		label: 'Phaser',
		amount: 'depth',
		params: [
			beats('rate', 'Sweep', ['1/2', '1/4', '1/8', '1/16'], '1/4'),
			knob('depth', 'Depth', 0.6),
			knob('stages', 'Stages', 0.5, 2, 12, 'stages', 'linear')
		]
	}
};

/** 0..1 splits into equal bands, one per division, slowest first; the top edge is the last. */
export function divisionFromValue(divisions: readonly Division[], value: number): Division {
	const n = divisions.length;
	const i = Math.min(n - 1, Math.max(0, Math.floor(value * n)));
	return divisions[i];
}

/** The middle of a division's band, so small knob wobble never flips it. */
export function divisionValue(divisions: readonly Division[], division: Division): number {
	const i = divisions.indexOf(division);
	if (i < 0) throw new Error(`${division} is not one of ${divisions.join(', ')}`);
	return (i + 0.5) / divisions.length;
}

/** The value to store for focus parameter `param` (1-based) of `effect` to get `division`. */
export function paramForDivision(effect: EffectId, param: number, division: Division): number {
	const spec = EFFECTS[effect].params[param - 1];
	if (!spec?.divisions) throw new Error(`${effect} parameter ${param} is not beat-synced`);
	return divisionValue(spec.divisions, division);
}

// Tempo arithmetic (REFERENCES.md): ms per beat = 60000 / BPM; a note value = fraction × 240000 / BPM.
export function msPerBeat(bpm: number): number {
	return 60000 / bpm;
}

/** The fraction of a whole note: `1/8` → 0.125, `1/8.` → 0.1875, `1/8t` → 0.08333. */
export function divisionFraction(division: Division): number {
	const m = /^(\d+)\/(\d+)(\.|t)?$/.exec(division);
	if (!m || Number(m[2]) === 0) throw new Error(`"${division}" is not a note value like 1/8`);
	const base = Number(m[1]) / Number(m[2]);
	return m[3] === '.' ? base * 1.5 : m[3] === 't' ? (base * 2) / 3 : base;
}

export function divisionMs(division: Division, bpm: number): number {
	return (divisionFraction(division) * 240000) / bpm;
}

/** The first grid line at or after `t` on a beat clock that started at `origin`. */
export function nextGridLine(t: number, division: Division, bpm: number, origin = 0): number {
	const step = divisionMs(division, bpm);
	// The small tolerance keeps a press logged exactly on a line from jumping a whole step.
	const n = Math.ceil((t - origin) / step - 1e-9);
	return origin + Math.max(0, n) * step;
}
