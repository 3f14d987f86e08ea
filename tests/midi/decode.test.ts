import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { createDecoder, decodeMessage, describeMessage, parseMessage } from '$lib/midi/decode';
import { GENERIC_2X8_KNOBS, GENERIC_4X4 } from '$lib/midi/profiles';
import type { ControllerProfile } from '$lib/engine/types';

const decode4x4 = createDecoder(GENERIC_4X4);

describe('parseMessage', () => {
	// MIDI 1.0 Detailed Specification, channel voice messages: status 0x8n–0xEn, n = channel − 1.
	it.each([
		[[0x80, 60, 64], 'note-off', 1],
		[[0x90, 60, 100], 'note-on', 1],
		[[0xa5, 60, 10], 'poly-pressure', 6],
		[[0xbf, 7, 100], 'cc', 16],
		[[0xc9, 5], 'program', 10],
		[[0xd0, 30], 'channel-pressure', 1],
		[[0xe3, 0, 64], 'pitch-bend', 4]
	])('reads %j as %s on channel %i', (bytes, kind, channel) => {
		const result = parseMessage(bytes);
		expect(result).toMatchObject({ ok: true, message: { kind, channel } });
	});

	it('takes the channel from the low nibble of the status byte', () => {
		// MIDI 1.0: status 0x9n is Note On on channel n + 1; 0x9F is channel 16.
		for (let n = 0; n < 16; n++) {
			const r = parseMessage([0x90 | n, 36, 1]);
			expect(r.ok && r.message.channel).toBe(n + 1);
		}
	});

	it('reads pitch bend as a 14-bit value, least significant byte first', () => {
		// MIDI 1.0: pitch bend 00 40 is the centre, 8192.
		const r = parseMessage([0xe0, 0x00, 0x40]);
		expect(r.ok && r.message.data2).toBe(8192);
	});

	it('reads real-time bytes as system messages', () => {
		// MIDI 1.0: 0xF8 is Timing Clock, a one-byte system real-time message.
		expect(parseMessage([0xf8])).toMatchObject({ ok: true, message: { kind: 'system' } });
	});

	it.each([
		[[], 'Empty'],
		[[0x24, 0x64], 'not a status byte'],
		[[0x90, 36], 'needs 3 bytes'],
		[[0x90, 36, 100, 5], 'needs 3 bytes'],
		[[0xc0, 1, 2], 'needs 2 bytes'],
		[[0x90, 0x80, 100], 'above 7F'],
		[[0x90, 36, 300], 'Not a byte']
	])('gives an error value for malformed bytes %j', (bytes, words) => {
		const r = parseMessage(bytes);
		expect(r.ok).toBe(false);
		expect(!r.ok && r.error).toContain(words);
	});
});

describe('decoding with a profile (DESIGN.md §4.1)', () => {
	it('turns a Note On with velocity above 0 into a press at the message time', () => {
		// Generic 4×4: note 36 is the bottom-left pad (common practice for pad grids).
		const d = decode4x4([0x90, 36, 100], 1234.5);
		expect(d).toMatchObject({ status: 'event', event: { t: 1234.5, input: 'pad-1', type: 'press' } });
		expect(d.status === 'event' && d.input).toMatchObject({ row: 3, col: 0 });
	});

	it('turns a Note On with velocity 0 into a release', () => {
		// MIDI 1.0 Detailed Specification: a Note On with velocity 0 acts as a Note Off.
		expect(decode4x4([0x90, 36, 0], 0)).toMatchObject({ status: 'event', event: { type: 'release' } });
	});

	it('turns a Note Off into a release whatever its velocity', () => {
		// MIDI 1.0: Note Off 0x8n with a release velocity.
		expect(decode4x4([0x80, 51, 64], 0)).toMatchObject({
			status: 'event',
			event: { input: 'pad-16', type: 'release' }
		});
	});

	it('tells inputs apart by channel as well as note', () => {
		const ch10: ControllerProfile = {
			name: 'Pads on channel 10',
			inputs: [{ id: 'kick', kind: 'pad', channel: 10, note: 36 }]
		};
		// MIDI 1.0: 0x99 = Note On, channel 10.
		expect(decodeMessage([0x99, 36, 90], ch10, 0)).toMatchObject({ status: 'event', event: { input: 'kick' } });
		expect(decodeMessage([0x90, 36, 90], ch10, 0).status).toBe('unmapped');
	});

	const ccButton: ControllerProfile = {
		name: 'CC button',
		inputs: [{ id: 'shift', kind: 'button', channel: 1, cc: 20 }]
	};

	// DESIGN.md §4.1: a CC on a button input presses at value ≥ 64 and releases below 64
	// (common practice: the midpoint of the 0–127 data range).
	it.each([
		[127, 'press'],
		[64, 'press'],
		[63, 'release'],
		[0, 'release']
	])('reads a CC button at value %i as a %s', (value, type) => {
		expect(decodeMessage([0xb0, 20, value], ccButton, 0)).toMatchObject({
			status: 'event',
			event: { input: 'shift', type }
		});
	});

	it.each([
		[0, 0],
		[127, 1],
		[64, 64 / 127]
	])('turns a knob CC of %i into a turn with value %f (value / 127)', (value, expected) => {
		// DESIGN.md §4.1: knob → turn with value/127; MIDI 1.0 data bytes are 0–127.
		const d = decodeMessage([0xb0, 70, value], GENERIC_2X8_KNOBS, 0);
		expect(d).toMatchObject({ status: 'event', event: { input: 'knob-1', type: 'turn' } });
		expect(d.status === 'event' && d.event.value).toBeCloseTo(expected, 10);
	});

	it('logs a note on an unmapped address as unmapped, with the message kept for the monitor', () => {
		const d = decode4x4([0x90, 60, 100], 0);
		expect(d).toMatchObject({ status: 'unmapped', message: { kind: 'note-on', data1: 60 } });
	});

	it('ignores a note sent to a knob address and a CC sent to a note pad', () => {
		expect(decodeMessage([0xb0, 36, 127], GENERIC_4X4, 0).status).toBe('unmapped');
		const knobWithNote: ControllerProfile = { name: 'x', inputs: [{ id: 'k', kind: 'knob', channel: 1, note: 1 }] };
		expect(decodeMessage([0x90, 1, 100], knobWithNote, 0).status).toBe('unmapped');
	});

	it('reports malformed bytes as an error value', () => {
		expect(decode4x4([0x90, 36], 0)).toMatchObject({ status: 'error', bytes: [0x90, 36] });
	});

	it('never throws on random bytes, and every result has one of the three statuses', () => {
		fc.assert(
			fc.property(fc.array(fc.integer({ min: -5, max: 400 }), { maxLength: 6 }), (bytes) => {
				const d = decode4x4(bytes, 0);
				expect(['event', 'unmapped', 'error']).toContain(d.status);
			})
		);
	});

	it('describes messages for the monitor', () => {
		const r = parseMessage([0x90, 36, 100]);
		expect(r.ok && describeMessage(r.message)).toBe('Note On ch 1 · note 36 vel 100');
	});
});
