import { afterEach, describe, expect, it } from 'vitest';
import { analyze, demoMapping, type InputEvent, type Mapping } from '$lib/engine';
import type { RecorderStatus } from '$lib/recorder/session-recorder.svelte';
import { RehearsalRoom, type RecorderHooks, type RoomRecorder } from '$lib/rehearse/rehearsal-room.svelte';

// Demo mappings (src/lib/engine/demo.ts): pad-1 = Echo A on rack 1; pad-13..16 the stutter row on
// rack 2, deck A. The broken row switches rack 2 off on any release; the two-deck set counts `held`.

let now = 0;

/** Stands in for the session recorder: keeps what it is given, on a clock from its start. */
class FakeRecorder implements RoomRecorder {
	status: RecorderStatus = 'idle';
	name = '';
	eventCount = 0;
	unsent = 0;
	offline = false;
	error: string | null = null;
	uploadProgress: number | null = null;
	refused = [];
	recorded: Parameters<RoomRecorder['record']>[0][] = [];
	#startedAt = 0;
	elapsed = () => (this.status === 'recording' ? now - this.#startedAt : 0);
	start = async (name?: string) => {
		this.status = 'recording';
		this.name = name ?? '';
		this.#startedAt = now;
	};
	record = (e: Parameters<RoomRecorder['record']>[0]) => {
		this.recorded.push(e);
		this.eventCount++;
	};
	stop = async () => {
		this.status = 'saved';
		return { id: 's1', findings: 0 };
	};
	discard = async () => {
		if (this.eventCount === 0) this.status = 'idle';
	};
	resume = async () => false;
	attachAudio = () => {};
	dispose = () => {};
}

const rooms: RehearsalRoom[] = [];

/** A room on a hand-driven clock (room time = ms since the room opened at 1000). */
function roomFor(mapping: Mapping) {
	now = 1000;
	const recorder = new FakeRecorder();
	const room = new RehearsalRoom({ mappingId: 'm1', mapping, now: () => now, recorder });
	rooms.push(room);
	const at = (ms: number) => (now = 1000 + ms);
	const press = (input: string, ms: number) => room.press(input, 'screen', at(ms));
	const release = (input: string, ms: number) => room.release(input, 'screen', at(ms));
	return { room, recorder, press, release, at };
}

afterEach(() => {
	for (const room of rooms.splice(0)) room.dispose();
});

describe('RehearsalRoom', () => {
	it('plays a pad through the engine: the rack sounds on its deck and the pad lights', async () => {
		const { room, press, release } = roomFor(demoMapping('two-deck'));
		await room.start();
		press('pad-1', 10);
		expect(room.state.racks[0].on).toBe(true);
		expect(room.state.racks[0].routes.A).toBe(true);
		expect(room.lit.has('pad-1')).toBe(true);
		expect(room.held.has('pad-1')).toBe(true);
		release('pad-1', 300);
		expect(room.state.racks[0].on).toBe(false);
		expect(room.lit.size).toBe(0);
		expect(room.events).toBe(2);
	});

	it('shows a dropout while it lasts, naming the pad still held and its deck', async () => {
		const { room, press, release } = roomFor(demoMapping('broken-row'));
		await room.start();
		press('pad-13', 0);
		press('pad-14', 100);
		expect(room.findings.open).toEqual([]);
		release('pad-13', 250);
		expect(room.findings.open).toHaveLength(1);
		const [f] = room.findings.open;
		expect(f).toMatchObject({ kind: 'dropout', deck: 'A', input: 'pad-14', start: 250, end: null });
		expect(f.pad).toBe('Stutter 1/8 (Pad 14)');
		release('pad-14', 400);
		expect(room.findings.open).toEqual([]);
		expect(room.findings.closed).toMatchObject([{ kind: 'dropout', start: 250, end: 400 }]);
	});

	it('shows the very findings a replay of the same events gives', async () => {
		const mapping = demoMapping('broken-row');
		const { room, press, release } = roomFor(mapping);
		await room.start();
		const script: [string, 'press' | 'release', number][] = [
			['pad-13', 'press', 0],
			['pad-14', 'press', 50],
			['pad-13', 'release', 90],
			['pad-15', 'press', 120],
			['pad-14', 'release', 160],
			['pad-1', 'press', 200],
			['pad-15', 'release', 240],
			['pad-1', 'release', 300]
		];
		for (const [input, type, t] of script) (type === 'press' ? press : release)(input, t);
		const events: InputEvent[] = script.map(([input, type, t]) => ({ t, input, type }));
		expect(room.findings.all.map(({ pad: _pad, ...f }) => f)).toEqual(analyze(mapping, events, { tempo: 124 }));
		expect(room.findings.all.length).toBeGreaterThan(0);
	});

	it('leaves analysis alone while nothing goes wrong', async () => {
		const { room, press, release } = roomFor(demoMapping('two-deck'));
		await room.start();
		for (let i = 0; i < 10; i++) {
			press('pad-1', i * 100);
			release('pad-1', i * 100 + 50);
		}
		press('pad-13', 2000);
		press('pad-14', 2010);
		release('pad-13', 2020);
		release('pad-14', 2030);
		expect(room.events).toBe(24);
		expect(room.findings.analyses).toBe(0);
		expect(room.findings.all).toEqual([]);
	});

	it('records what it plays while recording, on the recorder’s clock', async () => {
		const { room, recorder, press, release, at } = roomFor(demoMapping('two-deck'));
		await room.start();
		press('pad-2', 0); // before recording: not recorded
		room.countInOn = false;
		at(40);
		room.record('Take');
		expect(recorder.status).toBe('recording');
		release('pad-2', 100);
		press('pad-13', 250);
		expect(recorder.recorded).toEqual([
			{ input: { input: 'pad-2', type: 'release' }, t: 60 },
			{ input: { input: 'pad-13', type: 'press' }, t: 210 }
		]);
	});

	it('refuses to reset the rig while recording, and resets it otherwise', async () => {
		const { room, recorder, press } = roomFor(demoMapping('two-deck'));
		await room.start();
		press('pad-1', 0);
		room.countInOn = false;
		room.record('Take');
		expect(recorder.status).toBe('recording');
		room.reset();
		expect(room.state.racks[0].on).toBe(true);
		await room.stopRecording('Take');
		expect(room.saved).toEqual({ id: 's1', findings: 0 });
		room.reset();
		expect(room.state.racks[0].on).toBe(false);
		expect(room.held.size).toBe(0);
		expect(room.events).toBe(0);
	});

	it('changes the tempo within 60–200 BPM', async () => {
		const { room } = roomFor(demoMapping('two-deck'));
		await room.start();
		expect(room.tempo).toBe(124); // the demo mappings' tempo
		room.setTempo(300);
		expect(room.tempo).toBe(200);
		room.setTempo(97.6);
		expect(room.clock.tempo).toBe(98);
	});

	it("puts the take's beat clock zero on a drill's beat 0, and sends that clock when the take ends", async () => {
		now = 1000;
		let sent: ReturnType<RecorderHooks['clock']> | null = null;
		let started: ReturnType<RecorderHooks['snapshot']>;
		const room = new RehearsalRoom({
			mappingId: 'm1',
			mapping: demoMapping('two-deck'),
			now: () => now,
			recorder: (hooks) => {
				const r = new FakeRecorder();
				const start = r.start;
				r.start = async (name) => {
					started = hooks.snapshot();
					await start(name);
				};
				r.stop = async () => {
					sent = hooks.clock();
					r.status = 'saved';
					return { id: 's1', findings: 0 };
				};
				return r;
			}
		});
		rooms.push(room);
		await room.start();
		room.setTempo(120);
		room.countInOn = false;
		now = 1000 + 5_250; // room time 5250: the take starts between beats
		room.record('Drill try');
		await Promise.resolve();
		expect(started!.clock.zero).toBe(-5_250); // the room's beat 0, long before the take
		// Beat 0 of the drill at room time 7500 (beat 15 of the room's clock at 120 BPM).
		expect(room.anchorTake(room.clock.timeOfBeat(15))).toBe(2_250);
		now = 1000 + 9_000;
		await room.stopRecording('Drill try');
		expect(sent).toEqual({ zero: 2_250, tempos: [{ at: 2_250, bpm: 120 }] });
	});
});
