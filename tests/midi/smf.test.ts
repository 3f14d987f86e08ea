import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { writeMidi } from 'midi-file';
import { Midi } from '@tonejs/midi';
import {
	exportSessionFile,
	exportSessionMidi,
	importSessionFile,
	importSessionMidi,
	TICKS_PER_QUARTER
} from '$lib/midi/smf';
import { parseSession, sessionFromEvents } from '$lib/engine';
import { GENERIC_2X8_KNOBS, GENERIC_4X4 } from '$lib/midi/profiles';
import type { InputEvent } from '$lib/engine/types';

const hex = (s: string) =>
	s
		.trim()
		.split(/[\s|]+/)
		.map((b) => parseInt(b, 16));
const contains = (hay: Uint8Array, needle: number[]) => hay.some((_, i) => needle.every((b, k) => hay[i + k] === b));

// Standard MIDI Files 1.0 (RP-001), appendix example: format 0, division 96 (REFERENCES.md).
const APPENDIX_EXAMPLE = hex(`
	4D 54 68 64 00 00 00 06 00 00 00 01 00 60
	4D 54 72 6B 00 00 00 3B
	00 FF 58 04 04 02 18 08 | 00 FF 51 03 07 A1 20 | 00 C0 05 | 00 C1 2E | 00 C2 46 | 00 92 30 60 |
	00 3C 60 | 60 91 43 40 | 60 90 4C 20 | 81 40 82 30 40 | 00 3C 40 | 00 81 43 40 | 00 80 4C 40 |
	00 FF 2F 00`);

const press = (t: number, input: string): InputEvent => ({ t, input, type: 'press' });
const release = (t: number, input: string): InputEvent => ({ t, input, type: 'release' });

describe('export', () => {
	const session = [press(0, 'pad-1'), press(250, 'pad-2'), release(500, 'pad-1'), release(750, 'pad-2')];

	it('writes 120 BPM as the tempo meta event FF 51 03 07 A1 20', () => {
		// SMF 1.0 Set Tempo: 500000 µs per quarter = 07 A1 20 (REFERENCES.md).
		const { bytes } = exportSessionMidi(session, GENERIC_4X4, { bpm: 120 });
		expect(contains(bytes, [0xff, 0x51, 0x03, 0x07, 0xa1, 0x20])).toBe(true);
	});

	it('writes 128 BPM as 07 27 0E', () => {
		// Derived: 60 000 000 / 128 = 468 750 = 0x07270E (REFERENCES.md).
		const { bytes } = exportSessionMidi(session, GENERIC_4X4, { bpm: 128 });
		expect(contains(bytes, [0xff, 0x51, 0x03, 0x07, 0x27, 0x0e])).toBe(true);
	});

	it('writes a format 1 header with two tracks and 480 ticks per quarter', () => {
		// SMF 1.0 header: MThd, length 6, format, ntrks, division (bit 15 clear = ticks per quarter).
		const { bytes } = exportSessionMidi(session, GENERIC_4X4);
		expect([...bytes.slice(0, 14)]).toEqual(hex('4D 54 68 64 00 00 00 06 00 01 00 02 01 E0'));
	});

	it('ends every track with End of Track FF 2F 00', () => {
		// SMF 1.0: End of Track is required as the last event of each track.
		const { bytes } = exportSessionMidi(session, GENERIC_4X4);
		const ends = bytes.reduce(
			(n, _, i) => n + (bytes[i] === 0xff && bytes[i + 1] === 0x2f && bytes[i + 2] === 0 ? 1 : 0),
			0
		);
		expect(ends).toBe(2);
	});

	it('counts events whose input has no MIDI address as skipped', () => {
		const { skipped } = exportSessionMidi([press(0, 'nowhere'), press(0, 'pad-1')], GENERIC_4X4);
		expect(skipped).toBe(1);
	});
});

describe('import', () => {
	it("reads the spec's appendix example (format 0, running status) to the right notes and times", () => {
		const r = importSessionMidi(APPENDIX_EXAMPLE);
		expect(r.ok).toBe(true);
		if (!r.ok) return;
		expect(r).toMatchObject({ format: 0, tracks: 1, ticksPerQuarter: 96, bpm: 120 });
		// Ticks from the deltas; ms = ticks × (500000 / 96) / 1000 (REFERENCES.md ticks-to-time).
		const got = r.notes.map((n) => [n.kind, n.channel, n.number, n.value, n.tick, +n.t.toFixed(6)]);
		expect(got).toEqual([
			['press', 3, 48, 96, 0, 0],
			['press', 3, 60, 96, 0, 0],
			['press', 2, 67, 64, 96, 500],
			['press', 1, 76, 32, 192, 1000],
			['release', 3, 48, 64, 384, 2000],
			['release', 3, 60, 64, 384, 2000],
			['release', 2, 67, 64, 384, 2000],
			['release', 1, 76, 64, 384, 2000]
		]);
	});

	it('reads a format 1 file with running status', () => {
		const bytes = writeMidi(
			{
				header: { format: 1, numTracks: 2, ticksPerBeat: 480 },
				tracks: [
					[{ deltaTime: 0, meta: true, type: 'endOfTrack' }],
					[
						{ deltaTime: 0, type: 'noteOn', channel: 0, noteNumber: 36, velocity: 100 },
						{ deltaTime: 480, type: 'noteOn', channel: 0, noteNumber: 36, velocity: 0 },
						{ deltaTime: 0, meta: true, type: 'endOfTrack' }
					]
				]
			},
			{ running: true, useByte9ForNoteOff: true }
		);
		// Running status: the second Note On is written without its status byte (MIDI 1.0).
		expect(contains(Uint8Array.from(bytes), [0x83, 0x60, 0x24, 0x00])).toBe(true);
		const r = importSessionMidi(bytes, GENERIC_4X4);
		expect(r.ok && r.events).toEqual([press(0, 'pad-1'), release(500, 'pad-1')]);
	});

	it('follows tempo changes when turning ticks into milliseconds', () => {
		const bytes = writeMidi({
			header: { format: 1, numTracks: 2, ticksPerBeat: 96 },
			tracks: [
				[
					{ deltaTime: 0, meta: true, type: 'setTempo', microsecondsPerBeat: 500_000 },
					{ deltaTime: 96, meta: true, type: 'setTempo', microsecondsPerBeat: 1_000_000 },
					{ deltaTime: 0, meta: true, type: 'endOfTrack' }
				],
				[
					{ deltaTime: 192, type: 'noteOn', channel: 0, noteNumber: 36, velocity: 1 },
					{ deltaTime: 0, meta: true, type: 'endOfTrack' }
				]
			]
		});
		// Derived: 96 ticks at 0.5 s per quarter, then 96 ticks at 1 s per quarter = 1500 ms.
		const r = importSessionMidi(bytes);
		expect(r.ok && r.notes[0].t).toBeCloseTo(1500, 9);
		expect(r.ok && r.bpm).toBe(120);
	});

	it('refuses format 2 with a clear error', () => {
		const bytes = [...APPENDIX_EXAMPLE];
		bytes[9] = 2;
		expect(importSessionMidi(bytes)).toEqual({ ok: false, error: expect.stringContaining('Format 2') });
	});

	it('refuses a file that is not MIDI', () => {
		const r = importSessionMidi(new TextEncoder().encode('hello, this is not a MIDI file'));
		expect(r).toEqual({ ok: false, error: expect.stringContaining('MThd') });
	});

	it('turns every cut-short copy of a valid file into an error value', () => {
		// Every strict prefix lacks bytes a chunk length promises (SMF 1.0 chunk framing).
		const { bytes } = exportSessionMidi([press(0, 'pad-1'), release(100, 'pad-1')], GENERIC_4X4);
		for (let n = 0; n < bytes.length; n++) {
			const r = importSessionMidi(bytes.slice(0, n));
			expect(r.ok, `prefix of ${n} bytes`).toBe(false);
		}
		expect(importSessionMidi(bytes).ok).toBe(true);
	});

	it('skips chunks of unknown type, as RP-001 asks readers to', () => {
		const alien = [...hex('58 59 5A 57 00 00 00 02 01 02')];
		const r = importSessionMidi([...APPENDIX_EXAMPLE, ...alien]);
		expect(r.ok && r.notes).toHaveLength(8);
		expect(r.ok && r.warnings[0]).toContain('unknown');
	});

	it('never throws on random bytes', () => {
		fc.assert(
			fc.property(fc.uint8Array({ maxLength: 200 }), (bytes) => {
				const r = importSessionMidi(bytes);
				expect(typeof r.ok).toBe('boolean');
			}),
			{ numRuns: 500 }
		);
	});

	it('never throws on a valid file with random bytes overwritten or cut off', () => {
		fc.assert(
			fc.property(
				fc.array(fc.tuple(fc.nat({ max: APPENDIX_EXAMPLE.length - 1 }), fc.integer({ min: 0, max: 255 })), {
					maxLength: 6
				}),
				fc.nat({ max: APPENDIX_EXAMPLE.length }),
				(edits, cut) => {
					const bytes = APPENDIX_EXAMPLE.slice(0, cut);
					for (const [at, b] of edits) if (at < bytes.length) bytes[at] = b;
					const r = importSessionMidi(bytes);
					if (!r.ok) expect(r.error.length).toBeGreaterThan(10);
					else
						r.notes.forEach((n, i) => {
							// Times never run backwards and every data byte stays in MIDI 1.0's 0–127.
							if (i > 0) expect(n.t).toBeGreaterThanOrEqual(r.notes[i - 1].t);
							expect(n.number).toBeLessThanOrEqual(127);
							expect(n.channel).toBeGreaterThanOrEqual(1);
						});
				}
			),
			{ numRuns: 1000 }
		);
	});
});

const sessionArb = fc
	.array(
		fc.record({
			t: fc.double({ min: 0, max: 60_000, noNaN: true }),
			pad: fc.integer({ min: 1, max: 16 }),
			kind: fc.constantFrom('press', 'release', 'turn')
		}),
		{ maxLength: 60 }
	)
	.map((raw) =>
		raw
			.map((r): InputEvent => {
				if (r.kind === 'turn') return { t: r.t, input: `knob-${(r.pad % 8) + 1}`, type: 'turn', value: r.pad / 16 };
				return { t: r.t, input: `pad-${r.pad}`, type: r.kind as 'press' | 'release' };
			})
			.sort((a, b) => a.t - b.t)
	);

describe('round trip', () => {
	it.each([120, 128, 97])('keeps every press and release within one tick at %i BPM', (bpm) => {
		const tick = 60_000 / bpm / TICKS_PER_QUARTER; // ms per tick (SMF 1.0 ticks-to-time)
		fc.assert(
			fc.property(sessionArb, (events) => {
				const { bytes, skipped } = exportSessionMidi(events, GENERIC_2X8_KNOBS, { bpm });
				expect(skipped).toBe(0);
				const r = importSessionMidi(bytes, GENERIC_2X8_KNOBS);
				if (!r.ok) throw new Error(r.error);
				expect(r.events.map((e) => [e.input, e.type])).toEqual(events.map((e) => [e.input, e.type]));
				r.events.forEach((e, i) => {
					expect(Math.abs(e.t - events[i].t)).toBeLessThanOrEqual(tick);
					if (e.type === 'turn') expect(Math.abs(e.value! - events[i].value!)).toBeLessThanOrEqual(0.5 / 127);
				});
			}),
			{ numRuns: 200 }
		);
	});
});

describe('cross-check with @tonejs/midi', () => {
	it('reads our export to the same notes, ticks, tempo and resolution', () => {
		const events = [
			press(0, 'pad-1'),
			press(125, 'pad-6'),
			release(500, 'pad-1'),
			release(1000, 'pad-6'),
			press(1500, 'pad-16'),
			release(1750, 'pad-16')
		];
		const { bytes } = exportSessionMidi(events, GENERIC_4X4, { bpm: 120 });
		const ours = importSessionMidi(bytes);
		if (!ours.ok) throw new Error(ours.error);
		const theirs = new Midi(bytes);
		expect(theirs.header.ppq).toBe(480);
		expect(theirs.header.tempos[0].bpm).toBeCloseTo(120, 6);
		const tn = theirs.tracks
			.flatMap((t) => t.notes)
			.map((n) => ({ note: n.midi, on: n.ticks, off: n.ticks + n.durationTicks, ms: n.time * 1000 }));
		const presses = ours.notes.filter((n) => n.kind === 'press');
		const on = presses.map((p) => ({
			note: p.number,
			on: p.tick,
			off: ours.notes.find((n) => n.kind === 'release' && n.number === p.number && n.tick >= p.tick)!.tick,
			ms: p.t
		}));
		const byTick = (a: { on: number; note: number }, b: { on: number; note: number }) => a.on - b.on || a.note - b.note;
		expect(tn.sort(byTick)).toEqual(on.sort(byTick).map((n) => ({ ...n, ms: expect.closeTo(n.ms, 6) })));
		// Pad notes from the profile: pad-1 = 36, pad-6 = 41, pad-16 = 51 (Generic 4×4).
		expect(tn.map((n) => n.note)).toEqual([36, 41, 51]);
	});
});

describe('session documents', () => {
	it('exports a session at its own tempo and imports it back as a valid session document', () => {
		const session = sessionFromEvents([press(0, 'pad-1'), release(468.75, 'pad-1')], 128);
		const { bytes } = exportSessionFile(session, GENERIC_4X4);
		// Derived: 128 BPM = 468 750 µs per quarter = 07 27 0E (REFERENCES.md).
		expect(contains(bytes, [0xff, 0x51, 0x03, 0x07, 0x27, 0x0e])).toBe(true);
		const back = importSessionFile(bytes, GENERIC_4X4);
		if (!back.ok) throw new Error(back.error);
		expect(parseSession(back.session).ok).toBe(true);
		expect(back.session.tempo).toBeCloseTo(128, 9);
		// MIDI 1.0: 0x90 Note On ch 1, note 36 (pad-1); the release is written as Note Off 0x80.
		expect(back.session.events).toEqual([
			{ t: 0, midi: [0x90, 36, 100], input: { input: 'pad-1', type: 'press' } },
			{ t: expect.closeTo(468.75, 6), midi: [0x80, 36, 0], input: { input: 'pad-1', type: 'release' } }
		]);
	});

	it('keeps notes the profile does not know as unmapped events with their bytes', () => {
		const back = importSessionFile(APPENDIX_EXAMPLE, GENERIC_4X4);
		if (!back.ok) throw new Error(back.error);
		expect(back.unmapped).toBe(8);
		expect(back.session.events[0]).toEqual({ t: 0, midi: [0x92, 48, 96], input: null });
	});

	it('passes a bad file on as an error value', () => {
		expect(importSessionFile([0x4d, 0x54], GENERIC_4X4)).toEqual({ ok: false, error: expect.stringContaining('MThd') });
	});
});
