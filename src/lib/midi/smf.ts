// Standard MIDI File import/export of a session's presses (a pad = a note), through the
// `midi-file` library. Export: format 1, a conductor track with tempo and 4/4, then one track of
// pad notes at 480 ticks per quarter. Import: formats 0 and 1 (running status included); anything
// malformed or cut short becomes an error value with a readable reason, never a throw.
import { parseMidi, writeMidi, type MidiData, type MidiEvent } from 'midi-file';
// Relative, not $lib: Node scripts load this module without SvelteKit's aliases.
import { sessionEvents } from '../engine/session';
import { constantClock } from '../engine/clock';
import type { ControllerProfile, InputEvent, SessionDocument } from '../engine/types';
import { createDecoder } from './decode';

export const TICKS_PER_QUARTER = 480;
export const PRESS_VELOCITY = 100;
const DEFAULT_US_PER_QUARTER = 500_000; // SMF 1.0: no tempo event means 120 BPM

export interface SmfExportOptions {
	bpm?: number;
	name?: string;
}

export interface SmfExport {
	bytes: Uint8Array;
	skipped: number; // events whose input has no MIDI address in the profile
}

export const usPerQuarter = (bpm: number) => Math.round(60_000_000 / bpm);

export function exportSessionMidi(
	events: readonly InputEvent[],
	profile: ControllerProfile,
	options: SmfExportOptions = {}
): SmfExport {
	const tempo = usPerQuarter(options.bpm ?? 120);
	const msPerTick = tempo / 1000 / TICKS_PER_QUARTER;
	const inputs = new Map(profile.inputs.map((i) => [i.id, i]));
	const timed: { tick: number; event: MidiEvent }[] = [];
	let skipped = 0;
	for (const e of events) {
		const input = inputs.get(e.input);
		const tick = Math.max(0, Math.round(e.t / msPerTick));
		const channel = (input?.channel ?? 1) - 1;
		if (input?.note !== undefined && e.type !== 'turn') {
			const event: MidiEvent =
				e.type === 'press'
					? { deltaTime: 0, type: 'noteOn', channel, noteNumber: input.note, velocity: PRESS_VELOCITY }
					: { deltaTime: 0, type: 'noteOff', channel, noteNumber: input.note, velocity: 0 };
			timed.push({ tick, event });
		} else if (input?.cc !== undefined) {
			const value = e.type === 'turn' ? Math.round((e.value ?? 0) * 127) : e.type === 'press' ? 127 : 0;
			timed.push({ tick, event: { deltaTime: 0, type: 'controller', channel, controllerType: input.cc, value } });
		} else skipped++;
	}
	timed.sort((a, b) => a.tick - b.tick);
	let last = 0;
	const pads: MidiEvent[] = [{ deltaTime: 0, meta: true, type: 'trackName', text: 'Pads' }];
	for (const { tick, event } of timed) {
		pads.push({ ...event, deltaTime: tick - last });
		last = tick;
	}
	pads.push({ deltaTime: 0, meta: true, type: 'endOfTrack' });
	const data: MidiData = {
		header: { format: 1, numTracks: 2, ticksPerBeat: TICKS_PER_QUARTER },
		tracks: [
			[
				{ deltaTime: 0, meta: true, type: 'trackName', text: asciiOnly(options.name ?? 'Padproof session') },
				{
					deltaTime: 0,
					meta: true,
					type: 'timeSignature',
					numerator: 4,
					denominator: 4,
					metronome: 24,
					thirtyseconds: 8
				},
				{ deltaTime: 0, meta: true, type: 'setTempo', microsecondsPerBeat: tempo },
				{ deltaTime: 0, meta: true, type: 'endOfTrack' }
			],
			pads
		]
	};
	return { bytes: Uint8Array.from(writeMidi(data, { running: false })), skipped };
}

const asciiOnly = (text: string) => text.replace(/[^\x20-\x7e]/g, '?').slice(0, 120);

export interface SmfNote {
	t: number; // ms from the start of the file
	tick: number;
	track: number;
	channel: number; // 1–16
	kind: 'press' | 'release' | 'cc';
	number: number; // note or controller
	value: number; // velocity or controller value
}

export type SmfImport =
	| {
			ok: true;
			format: 0 | 1;
			tracks: number;
			ticksPerQuarter: number | null; // null for SMPTE time
			bpm: number; // first tempo in the file, 120 when none
			notes: SmfNote[];
			events: InputEvent[]; // the notes decoded with the profile, when one is given
			unmapped: number;
			warnings: string[];
	  }
	| { ok: false; error: string };

const fail = (error: string): SmfImport => ({ ok: false, error });
const ascii = (bytes: number[], at: number) => String.fromCharCode(...bytes.slice(at, at + 4));
const u32 = (b: number[], at: number) => ((b[at] << 24) >>> 0) + (b[at + 1] << 16) + (b[at + 2] << 8) + b[at + 3];

/**
 * Checks the chunk framing before the library reads the file: it does not notice a chunk that
 * claims more bytes than the file holds. Unknown chunk types are skipped, as RP-001 asks.
 */
function frameChunks(bytes: number[]): { ok: true; file: number[]; warnings: string[] } | { ok: false; error: string } {
	if (bytes.length < 14 || ascii(bytes, 0) !== 'MThd') {
		return { ok: false, error: 'Not a Standard MIDI File: it does not start with an "MThd" header.' };
	}
	const headerLength = u32(bytes, 4);
	if (headerLength < 6 || 8 + headerLength > bytes.length) {
		return { ok: false, error: `The header chunk is cut short (it claims ${headerLength} bytes).` };
	}
	const tracksAnnounced = (bytes[10] << 8) | bytes[11];
	const file = bytes.slice(0, 8 + headerLength);
	const warnings: string[] = [];
	let at = 8 + headerLength;
	let tracks = 0;
	while (at < bytes.length) {
		if (at + 8 > bytes.length) {
			return { ok: false, error: `The file ends in the middle of a chunk header (byte ${at}).` };
		}
		const id = ascii(bytes, at);
		const length = u32(bytes, at + 4);
		if (at + 8 + length > bytes.length) {
			return {
				ok: false,
				error: `The file is truncated: ${id === 'MTrk' ? `track ${tracks + 1}` : `chunk "${id}"`} claims ${length} bytes but only ${bytes.length - at - 8} remain.`
			};
		}
		if (id === 'MTrk') {
			tracks++;
			for (let i = at; i < at + 8 + length; i++) file.push(bytes[i]);
		} else warnings.push(`Skipped an unknown "${id.replace(/[^\x20-\x7e]/g, '?')}" chunk.`);
		at += 8 + length;
	}
	if (tracks < tracksAnnounced) {
		return {
			ok: false,
			error: `The header announces ${tracksAnnounced} tracks but the file holds ${tracks}: it is truncated.`
		};
	}
	return { ok: true, file, warnings };
}

const isByte7 = (n: unknown) => Number.isInteger(n) && (n as number) >= 0 && (n as number) <= 127;

function badEvent(event: MidiEvent): boolean {
	if (!Number.isInteger(event.deltaTime) || event.deltaTime < 0) return true;
	switch (event.type) {
		case 'noteOn':
		case 'noteOff':
			return !isByte7(event.noteNumber) || !isByte7(event.velocity) || !(event.channel >= 0 && event.channel < 16);
		case 'controller':
			return !isByte7(event.controllerType) || !isByte7(event.value);
		case 'setTempo':
			return !(event.microsecondsPerBeat > 0);
		case 'programChange':
			return !isByte7(event.programNumber);
		case 'channelAftertouch':
		case 'noteAftertouch':
			return !isByte7(event.amount);
		case 'pitchBend':
			return !Number.isFinite(event.value);
		default:
			return false;
	}
}

export function importSessionMidi(input: ArrayLike<number> | ArrayBuffer, profile?: ControllerProfile): SmfImport {
	const bytes = Array.from(input instanceof ArrayBuffer ? new Uint8Array(input) : input, (b) => Number(b) & 0xff);
	const framed = frameChunks(bytes);
	if (!framed.ok) return fail(framed.error);
	let data: MidiData;
	try {
		data = parseMidi(framed.file);
	} catch (error) {
		return fail(
			`Not a readable MIDI file: ${typeof error === 'string' ? error : error instanceof Error ? error.message : 'unknown error'}.`
		);
	}
	const { header, tracks } = data;
	if (header.format !== 0 && header.format !== 1) {
		return fail(`Format ${header.format} files (independent sequences) are not supported; use format 0 or 1.`);
	}
	if (header.format === 0 && tracks.length !== 1) {
		return fail(`A format 0 file holds exactly one track; this one holds ${tracks.length}.`);
	}
	const ticksPerQuarter = header.ticksPerBeat ?? null;
	let smpteMsPerTick = 0;
	if (ticksPerQuarter === null) {
		const fps = header.framesPerSecond === 29 ? 29.97 : (header.framesPerSecond ?? 0);
		if (!(fps > 0) || !header.ticksPerFrame)
			return fail('The time division is neither ticks per quarter nor a valid SMPTE rate.');
		smpteMsPerTick = 1000 / (fps * header.ticksPerFrame);
	} else if (ticksPerQuarter === 0) return fail('The time division is 0 ticks per quarter note.');

	const warnings = [...framed.warnings];
	const all: { tick: number; track: number; order: number; event: MidiEvent }[] = [];
	for (const [track, events] of tracks.entries()) {
		let tick = 0;
		for (const [i, event] of events.entries()) {
			if (badEvent(event)) return fail(`Track ${track + 1}, event ${i + 1} is cut short or malformed.`);
			tick += event.deltaTime;
			all.push({ tick, track, order: all.length, event });
		}
		if (events.at(-1)?.type !== 'endOfTrack') warnings.push(`Track ${track + 1} has no End of Track event.`);
	}
	all.sort((a, b) => a.tick - b.tick || a.order - b.order);

	let tempo = DEFAULT_US_PER_QUARTER;
	let firstTempo: number | null = null;
	let ms = 0;
	let lastTick = 0;
	const notes: SmfNote[] = [];
	for (const { tick, track, event } of all) {
		ms +=
			ticksPerQuarter === null
				? (tick - lastTick) * smpteMsPerTick
				: ((tick - lastTick) * tempo) / ticksPerQuarter / 1000;
		lastTick = tick;
		if (event.type === 'setTempo') {
			tempo = event.microsecondsPerBeat;
			firstTempo ??= tempo;
		} else if (event.type === 'noteOn' || event.type === 'noteOff') {
			// MIDI 1.0: a Note On with velocity 0 is a Note Off (the library reports it as noteOff).
			const kind = event.type === 'noteOn' ? 'press' : 'release';
			notes.push({
				t: ms,
				tick,
				track,
				channel: event.channel + 1,
				kind,
				number: event.noteNumber,
				value: event.velocity
			});
		} else if (event.type === 'controller') {
			notes.push({
				t: ms,
				tick,
				track,
				channel: event.channel + 1,
				kind: 'cc',
				number: event.controllerType,
				value: event.value
			});
		}
	}

	const events: InputEvent[] = [];
	let unmapped = 0;
	if (profile) {
		const decode = createDecoder(profile);
		for (const n of notes) {
			const status = (n.kind === 'cc' ? 0xb0 : n.kind === 'press' ? 0x90 : 0x80) | (n.channel - 1);
			const decoded = decode([status, n.number, n.value], n.t);
			if (decoded.status === 'event') events.push(decoded.event);
			else unmapped++;
		}
	}
	return {
		ok: true,
		format: header.format,
		tracks: tracks.length,
		ticksPerQuarter,
		bpm: 60_000_000 / (firstTempo ?? DEFAULT_US_PER_QUARTER),
		notes,
		events,
		unmapped,
		warnings
	};
}

/** A recorded session's presses as a file, at the session's tempo. */
export function exportSessionFile(session: SessionDocument, profile: ControllerProfile): SmfExport {
	return exportSessionMidi(sessionEvents(session).events, profile, { bpm: session.tempo, name: session.mapping });
}

export type SessionImport =
	{ ok: true; session: SessionDocument; unmapped: number; warnings: string[] } | { ok: false; error: string };

/** A file as a session document: every note and CC kept with its raw bytes, decoded with the profile. */
export function importSessionFile(input: ArrayLike<number> | ArrayBuffer, profile: ControllerProfile): SessionImport {
	const r = importSessionMidi(input, profile);
	if (!r.ok) return r;
	const decode = createDecoder(profile);
	const events = r.notes.map((n) => {
		const status = (n.kind === 'cc' ? 0xb0 : n.kind === 'press' ? 0x90 : 0x80) | (n.channel - 1);
		const midi = [status, n.number, n.value];
		const d = decode(midi, n.t);
		const input =
			d.status === 'event'
				? { input: d.event.input, type: d.event.type, ...(d.event.value !== undefined && { value: d.event.value }) }
				: null;
		return { t: n.t, midi, input };
	});
	const session: SessionDocument = {
		version: 2,
		tempo: r.bpm,
		startedAt: new Date(0).toISOString(),
		clock: constantClock(r.bpm, 0),
		events
	};
	return { ok: true, session, unmapped: r.unmapped, warnings: r.warnings };
}
