import { describe, expect, it } from 'vitest';
import { createActor, SimulatedClock } from 'xstate';
import { rigMachine, type RigChangesEmitted } from '$lib/engine/machines/rig';
import { analyze } from '$lib/engine/analyze';
import { replay } from '$lib/engine/replay';
import { withTempo } from '$lib/engine/clock';
import {
	parseSession,
	sessionEvents,
	sessionFromEvents,
	sessionReplay,
	sessionStart,
	sessionStartRig
} from '$lib/engine/session';
import type { InputEvent, Mapping, SessionDocument } from '$lib/engine/types';
import { legatoMapping, press, release } from './factories';

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
	it('reads a version 1 rehearsal as version 2: beat 0 at 0, its tempo constant, no stored rig', () => {
		const r = parseSession(doc());
		expect(r.ok && r.session).toMatchObject({
			version: 2,
			tempo: 124,
			clock: { zero: 0, tempos: [{ at: 0, bpm: 124 }] }
		});
		expect(r.ok && r.session.initial).toBeUndefined();
	});

	it('keeps the beat clock and starting rig of a version 2 rehearsal', () => {
		const m = legatoMapping(2);
		const start = sessionStart(replay(m, [press(0, 'p1')]).final, { zero: 40, tempos: [{ at: 40, bpm: 124 }] }, 100);
		const r = parseSession(JSON.parse(JSON.stringify({ ...doc(), version: 2, ...start })));
		expect(r.ok && r.session.clock).toEqual({ zero: -60, tempos: [{ at: -60, bpm: 124 }] });
		expect(r.ok && r.session.initial?.held).toEqual(['p1']);
		expect(r.ok && r.session.initial?.counters).toEqual({ held: 1 });
	});

	it.each([
		[
			'a mix above 1 in the starting rig',
			(d: any) => (d.initial.racks[0].mix = 2),
			'initial.racks[0].mix',
			/at most 1/
		],
		[
			'tempo changes out of order',
			(d: any) => d.clock.tempos.push({ at: -1000, bpm: 90 }),
			'clock.tempos',
			/time order/
		],
		['a version 2 rehearsal without a clock', (d: any) => delete d.clock, 'clock', /required/]
	])('refuses %s', (_, change, path, message) => {
		const m = legatoMapping(2);
		const d: any = JSON.parse(
			JSON.stringify({
				...doc(),
				version: 2,
				...sessionStart(replay(m, []).final, { zero: 0, tempos: [{ at: 0, bpm: 120 }] }, 0)
			})
		);
		change(d);
		const r = parseSession(d);
		const hit = !r.ok && r.problems.find((p) => p.path === path);
		expect(hit && hit.message).toMatch(message);
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

/** Plays events into the live rig actor on room time and records a take from `takeStart`. */
function liveTake(mapping: Mapping, events: InputEvent[], takeStart: number, tempoAt?: [number, number]) {
	const clock = new SimulatedClock();
	const actor = createActor(rigMachine, { input: { mapping, tempo: 120 }, clock }).start();
	const landed: RigChangesEmitted[] = [];
	actor.on('changes', (e) => landed.push(e));
	let session = null as SessionDocument | null;
	const begin = () => {
		const { state, clock: beat } = actor.getSnapshot().context;
		session = {
			version: 2,
			tempo: 120,
			startedAt: '2026-01-01T00:00:00.000Z',
			...sessionStart(state, beat, takeStart),
			events: []
		};
	};
	for (const e of events) {
		if (!session && e.t >= takeStart) begin();
		if (tempoAt && e.t >= tempoAt[0] && actor.getSnapshot().context.clock.tempos.length === 1) {
			actor.send({ type: 'tempo', bpm: tempoAt[1], at: tempoAt[0] });
			// The recorder keeps the tempo changes of the take on its clock.
			if (session) session.clock = withTempo(session.clock, tempoAt[1], tempoAt[0] - takeStart);
		}
		clock.set(e.t);
		actor.send({ type: 'input', event: e });
		if (session)
			(session as SessionDocument).events.push({ t: e.t - takeStart, input: { input: e.input, type: e.type } });
	}
	clock.set(events.at(-1)!.t + 10_000);
	return { session: session!, landed, final: actor.getSnapshot().context.state };
}

describe('live vs replay (DESIGN.md §4: a session starts where the take did)', () => {
	it('replays a take that began with a pad held without a count overflow that never happened live', () => {
		const m = legatoMapping(2);
		const { session, landed, final } = liveTake(
			m,
			[press(500, 'p1'), press(1100, 'p2'), release(1200, 'p1'), release(1300, 'p2')],
			1000
		);
		expect(landed.some((e) => e.clamps.length)).toBe(false);
		const { events } = sessionEvents(session);
		const findings = analyze(m, events, sessionReplay(m, session));
		expect(findings).toEqual([]);
		expect(replay(m, events, sessionReplay(m, session)).final).toEqual(final);
		// Without the stored rig the same events read as an overflow below 0 and a dropout.
		expect(analyze(m, events).map((f) => f.kind)).toContain('count-overflow');
	});

	it('lands quantized events on the same grid lines as the take, across a tempo change', () => {
		const m = legatoMapping(2);
		const q = { ...m, bindings: m.bindings.map((b) => ({ ...b, quantize: '1/8' as const })) };
		const play = [press(1030, 'p1'), release(1410, 'p1'), press(2210, 'p2'), release(2620, 'p2')];
		const { session, landed } = liveTake(q, play, 777, [2000, 90]);
		const replayed = replay(q, sessionEvents(session).events, sessionReplay(q, session));
		const live = landed.filter((e) => e.changes.length).map((e) => e.at - 777);
		const again = [...new Set(replayed.changes.map((c) => c.t))];
		expect(again.map((t) => t.toFixed(6))).toEqual(live.map((t) => t.toFixed(6)));
	});

	it('fits a stored starting rig to the mapping it is replayed with', () => {
		const m = legatoMapping(2);
		const start = sessionStart(
			replay(m, [press(0, 'p1')]).final,
			{ zero: 0, tempos: [{ at: 0, bpm: 120 }] },
			0
		).initial;
		const rig = sessionStartRig(m, { ...start, held: ['p1', 'gone'], counters: { held: 99, other: 3 } });
		expect(rig.held).toEqual(['p1']);
		expect(rig.counters).toEqual({ held: 15 });
		expect(rig.racks).toHaveLength(m.racks.length);
	});
});
