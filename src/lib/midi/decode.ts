// MIDI message decoding (DESIGN.md §4.1). Pure: bytes + controller profile → input event.
// Malformed bytes give an error value, never a throw: they come from hardware we don't control.
import type { ControllerInput, ControllerProfile, InputEvent } from '$lib/engine/types';

export type MessageKind =
	'note-off' | 'note-on' | 'poly-pressure' | 'cc' | 'program' | 'channel-pressure' | 'pitch-bend' | 'system';

export interface MidiMessage {
	kind: MessageKind;
	bytes: number[];
	channel?: number; // 1–16, channel messages only
	data1?: number; // note, controller, program or pressure
	data2?: number; // velocity, value, pressure; pitch bend: the full 14-bit value
}

export type ParseResult = { ok: true; message: MidiMessage } | { ok: false; error: string };

const CHANNEL_KINDS: Record<number, { kind: MessageKind; length: number }> = {
	0x8: { kind: 'note-off', length: 3 },
	0x9: { kind: 'note-on', length: 3 },
	0xa: { kind: 'poly-pressure', length: 3 },
	0xb: { kind: 'cc', length: 3 },
	0xc: { kind: 'program', length: 2 },
	0xd: { kind: 'channel-pressure', length: 2 },
	0xe: { kind: 'pitch-bend', length: 3 }
};

const hex = (bytes: ArrayLike<number>) =>
	Array.from(bytes, (b) => (Number(b) & 0xff).toString(16).padStart(2, '0').toUpperCase()).join(' ');

export function formatBytes(bytes: ArrayLike<number>): string {
	return hex(bytes);
}

/** One complete message, as Web MIDI delivers them (no running status inside a message). */
export function parseMessage(bytes: ArrayLike<number>): ParseResult {
	const list = Array.from(bytes ?? [], Number);
	if (list.length === 0) return { ok: false, error: 'Empty message' };
	if (list.some((b) => !Number.isInteger(b) || b < 0 || b > 255)) {
		return { ok: false, error: `Not a byte sequence: ${list.slice(0, 8).join(', ')}` };
	}
	const status = list[0];
	if (status < 0x80) {
		return { ok: false, error: `Starts with data byte ${hex([status])}, not a status byte` };
	}
	if (status >= 0xf0) return { ok: true, message: { kind: 'system', bytes: list } };
	const shape = CHANNEL_KINDS[status >> 4];
	if (list.length !== shape.length) {
		return {
			ok: false,
			error: `${shape.kind} needs ${shape.length} bytes, got ${list.length} (${hex(list)})`
		};
	}
	const data = list.slice(1);
	const bad = data.find((b) => b > 0x7f);
	if (bad !== undefined) return { ok: false, error: `Data byte ${hex([bad])} is above 7F` };
	const message: MidiMessage = {
		kind: shape.kind,
		bytes: list,
		channel: (status & 0x0f) + 1,
		data1: data[0]
	};
	if (shape.kind === 'pitch-bend') message.data2 = data[0] | (data[1] << 7);
	else if (data.length > 1) message.data2 = data[1];
	return { ok: true, message };
}

export type Decoded =
	| { status: 'event'; message: MidiMessage; input: ControllerInput; event: InputEvent }
	| { status: 'unmapped'; message: MidiMessage }
	| { status: 'error'; bytes: number[]; error: string };

const noteKey = (channel: number, note: number) => `n${channel}:${note}`;
const ccKey = (channel: number, cc: number) => `c${channel}:${cc}`;

export type Decoder = (bytes: ArrayLike<number>, t: number) => Decoded;

/** Builds the lookup once per profile, so each message costs one map read. */
export function createDecoder(profile: ControllerProfile): Decoder {
	const byAddress = new Map<string, ControllerInput>();
	for (const input of profile.inputs) {
		if (input.note !== undefined) byAddress.set(noteKey(input.channel, input.note), input);
		if (input.cc !== undefined) byAddress.set(ccKey(input.channel, input.cc), input);
	}
	return (bytes, t) => {
		const parsed = parseMessage(bytes);
		if (!parsed.ok) return { status: 'error', bytes: Array.from(bytes ?? [], Number), error: parsed.error };
		const message = parsed.message;
		const { kind, channel = 0, data1 = 0, data2 = 0 } = message;
		if (kind === 'note-on' || kind === 'note-off') {
			const input = byAddress.get(noteKey(channel, data1));
			if (!input || input.kind === 'knob' || input.kind === 'fader') return { status: 'unmapped', message };
			// MIDI 1.0: Note On with velocity 0 is a Note Off.
			const type = kind === 'note-on' && data2 > 0 ? 'press' : 'release';
			return { status: 'event', message, input, event: { t, input: input.id, type } };
		}
		if (kind === 'cc') {
			const input = byAddress.get(ccKey(channel, data1));
			if (!input) return { status: 'unmapped', message };
			if (input.kind === 'knob' || input.kind === 'fader') {
				return { status: 'event', message, input, event: { t, input: input.id, type: 'turn', value: data2 / 127 } };
			}
			const type = data2 >= 64 ? 'press' : 'release';
			return { status: 'event', message, input, event: { t, input: input.id, type } };
		}
		return { status: 'unmapped', message };
	};
}

export function decodeMessage(bytes: ArrayLike<number>, profile: ControllerProfile, t: number): Decoded {
	return createDecoder(profile)(bytes, t);
}

// System message names as the MIDI 1.0 Detailed Specification gives them. F4, F5, F9 and FD are
// undefined there.
const SYSTEM_NAMES: Record<number, string> = {
	0xf0: 'System Exclusive',
	0xf1: 'MIDI Time Code Quarter Frame',
	0xf2: 'Song Position Pointer',
	0xf3: 'Song Select',
	0xf6: 'Tune Request',
	0xf7: 'End of Exclusive',
	0xf8: 'Timing Clock',
	0xfa: 'Start',
	0xfb: 'Continue',
	0xfc: 'Stop',
	0xfe: 'Active Sensing',
	0xff: 'System Reset'
};

function describeSystem(bytes: readonly number[]): string {
	const status = bytes[0];
	const name = SYSTEM_NAMES[status];
	if (!name) return `Undefined system message ${hex([status])}`;
	const data = bytes.slice(1);
	if (data.length === 0) return name;
	return `${name} · ${hex(data.slice(0, 6))}${data.length > 6 ? ` … (${bytes.length} bytes)` : ''}`;
}

/** A short human summary for the monitor: "Note On ch 1 · 36 vel 100". */
export function describeMessage(message: MidiMessage): string {
	const ch = `ch ${message.channel}`;
	switch (message.kind) {
		case 'note-on':
			return `Note On ${ch} · note ${message.data1} vel ${message.data2}`;
		case 'note-off':
			return `Note Off ${ch} · note ${message.data1} vel ${message.data2}`;
		case 'poly-pressure':
			return `Poly pressure ${ch} · note ${message.data1} ${message.data2}`;
		case 'cc':
			return `CC ${ch} · #${message.data1} = ${message.data2}`;
		case 'program':
			return `Program ${ch} · ${message.data1}`;
		case 'channel-pressure':
			return `Channel pressure ${ch} · ${message.data1}`;
		case 'pitch-bend':
			return `Pitch bend ${ch} · ${message.data2}`;
		default:
			return describeSystem(message.bytes);
	}
}
