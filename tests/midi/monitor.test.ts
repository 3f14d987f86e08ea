import { describe, expect, it } from 'vitest';
import { createDecoder, describeMessage, type Decoded } from '$lib/midi/decode';
import { MidiMonitorLog } from '$lib/midi/midi-monitor.svelte';
import { SavedProfiles } from '$lib/midi/saved-profiles.svelte';
import { GENERIC_4X4 } from '$lib/midi/profiles';

const decode = createDecoder(GENERIC_4X4);
const describe_ = (d: Decoded) => (d.status === 'error' ? d.error : describeMessage(d.message));

describe('MidiMonitorLog', () => {
	function filled() {
		const log = new MidiMonitorLog(3);
		log.add('a', decode([0x90, 36, 100], 1), 1, describe_); // note, pad-1
		log.add('b', decode([0xb0, 7, 64], 2), 2, describe_); // CC 7, unmapped
		log.add('a', decode([0x90, 36], 3), 3, describe_); // malformed: a Note On needs 3 bytes (MIDI 1.0)
		return log;
	}

	it('keeps the newest messages first, with timestamps, bytes and what they played', () => {
		const log = filled();
		expect(log.entries.map((e) => [e.t, e.kind, e.bytes])).toEqual([
			[3, 'error', '90 24'],
			[2, 'cc', 'B0 07 40'],
			[1, 'note', '90 24 64']
		]);
		expect(log.entries[2]).toMatchObject({
			input: 'pad-1',
			inputLabel: 'Pad 1',
			summary: 'Note On ch 1 · note 36 vel 100'
		});
		expect(log.entries[0].problem).toContain('needs 3 bytes');
	});

	it('filters by device and by type', () => {
		const log = filled();
		log.port = 'a';
		expect(log.visible.map((e) => e.t)).toEqual([3, 1]);
		log.kind = 'note';
		expect(log.visible.map((e) => e.t)).toEqual([1]);
	});

	it('drops the oldest beyond its limit and counts what arrives while paused', () => {
		const log = filled();
		log.add('a', decode([0x80, 36, 0], 4), 4, describe_);
		expect(log.entries.map((e) => e.t)).toEqual([4, 3, 2]);
		log.togglePause();
		log.add('a', decode([0x90, 37, 1], 5), 5, describe_);
		expect(log.missed).toBe(1);
		expect(log.entries).toHaveLength(3);
		log.togglePause();
		expect(log.missed).toBe(0);
	});
});

describe('SavedProfiles', () => {
	function memoryStorage(initial: Record<string, string> = {}) {
		const data = new Map(Object.entries(initial));
		return {
			getItem: (k: string) => data.get(k) ?? null,
			setItem: (k: string, v: string) => void data.set(k, v),
			data
		} as unknown as Storage & { data: Map<string, string> };
	}

	it('saves a learned profile and reads it back', () => {
		const storage = memoryStorage();
		const profile = {
			name: 'Learned',
			rows: 1,
			cols: 1,
			inputs: [{ id: 'pad-1', kind: 'pad' as const, channel: 2, note: 60, row: 0, col: 0 }]
		};
		expect(new SavedProfiles(storage).save(profile)).toBe(true);
		expect(new SavedProfiles(storage).list).toEqual([profile]);
	});

	it('skips stored profiles that fail the schema, and refuses to save one', () => {
		const storage = memoryStorage({
			'padproof.controller-profiles': JSON.stringify([
				{ name: 'x', inputs: [{ id: 'a', kind: 'pad', channel: 99, note: 1 }] }
			])
		});
		const saved = new SavedProfiles(storage);
		expect(saved.list).toEqual([]);
		expect(saved.save({ name: 'bad', inputs: [{ id: 'a', kind: 'pad', channel: 0, note: 1 }] })).toBe(false);
	});

	it('survives storage that holds garbage', () => {
		expect(new SavedProfiles(memoryStorage({ 'padproof.controller-profiles': '{not json' })).list).toEqual([]);
	});
});

describe('describeMessage for system messages', () => {
	const name = (bytes: number[]) => {
		const d = decode(bytes, 0);
		if (d.status === 'error') throw new Error(d.error);
		return describeMessage(d.message);
	};

	// System real-time names: MIDI 1.0 Detailed Specification (REFERENCES.md, "System real-time
	// messages"): F8 Timing Clock, FA Start, FB Continue, FC Stop, FE Active Sensing, FF System Reset.
	it.each([
		[0xf8, 'Timing Clock'],
		[0xfa, 'Start'],
		[0xfb, 'Continue'],
		[0xfc, 'Stop'],
		[0xfe, 'Active Sensing'],
		[0xff, 'System Reset']
	])('names %i as MIDI 1.0 does: %s', (status, text) => {
		expect(name([status])).toBe(text);
	});

	// F9 and FD are undefined in MIDI 1.0 (REFERENCES.md): the monitor says so instead of inventing a name.
	it('calls an undefined status undefined', () => {
		expect(name([0xf9])).toBe('Undefined system message F9');
		expect(name([0xfd])).toBe('Undefined system message FD');
	});

	// System common and exclusive names: MIDI 1.0 Detailed Specification (from memory; not quoted
	// in REFERENCES.md): F0 System Exclusive, F2 Song Position Pointer.
	it('names a system exclusive and shows its first data bytes', () => {
		expect(name([0xf0, 0x7e, 0x7f, 0x06, 0x01, 0xf7])).toBe('System Exclusive · 7E 7F 06 01 F7');
		expect(name([0xf0, 1, 2, 3, 4, 5, 6, 7, 0xf7])).toBe('System Exclusive · 01 02 03 04 05 06 … (9 bytes)');
		expect(name([0xf2, 0x10, 0x00])).toBe('Song Position Pointer · 10 00');
	});
});
