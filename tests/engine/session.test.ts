import { describe, expect, it } from 'vitest';
import { parseSession, sessionEvents, sessionFromEvents } from '$lib/engine/session';
import { press, release } from './factories';

const doc = () => ({
	version: 1,
	tempo: 124,
	startedAt: '2025-03-01T19:30:00.000Z',
	events: [
		// MIDI 1.0: Note On 0x90 on channel 1, note 36 velocity 100; Note On with velocity 0 is a Note Off.
		{ t: 0, midi: [0x90, 36, 100], input: { input: 'p1', type: 'press' } },
		{ t: 12.5, midi: [0xb0, 99, 1], input: null },
		{ t: 250, midi: [0x90, 36, 0], input: { input: 'p1', type: 'release' } }
	]
});

describe('parseSession', () => {
	it('accepts a recorded rehearsal', () => {
		const r = parseSession(doc());
		expect(r.ok).toBe(true);
	});

	it('drops unmapped messages for replay but keeps the way back to the session', () => {
		const r = parseSession(doc());
		if (!r.ok) throw new Error('expected a session');
		expect(sessionEvents(r.session)).toEqual({ events: [press(0, 'p1'), release(250, 'p1')], indexes: [0, 2] });
	});

	it.each([
		['events out of time order', (d: any) => (d.events[2].t = 5), 'events[2].t', /time order/],
		['a MIDI data byte above 255', (d: any) => (d.events[0].midi[1] = 300), 'events[0].midi[1]', /at most 255/],
		['a start time that is not a date', (d: any) => (d.startedAt = 'yesterday'), 'startedAt', /.+/],
		['a tempo of 0', (d: any) => (d.tempo = 0), 'tempo', /at least 40/],
		['an unknown event type', (d: any) => (d.events[0].input.type = 'hold'), 'events[0].input.type', /one of/]
	])('refuses %s', (_, change, path, message) => {
		const d = doc();
		change(d);
		const r = parseSession(d);
		const hit = !r.ok && r.problems.find((p) => p.path === path);
		expect(hit && hit.message).toMatch(message);
	});

	it('wraps plain events, e.g. a counterexample, into a valid session', () => {
		const s = sessionFromEvents([press(250, 'p1'), release(500, 'p1')], 120);
		expect(parseSession(s).ok).toBe(true);
		expect(sessionEvents(s).events).toEqual([press(250, 'p1'), release(500, 'p1')]);
	});
});
