// The Web MIDI adapter against a fake MIDIAccess (Web MIDI API shapes: inputs/outputs maps,
// ports with state and connection, statechange events), driven through the real `webmidi` package.
import { afterEach, describe, expect, it } from 'vitest';
import { WebMidi } from 'webmidi';
import { ControllerRig } from '$lib/midi/controller-rig.svelte';
import { MidiDevices } from '$lib/midi/midi-devices.svelte';
import { demoMapping } from '$lib/engine';

class FakePort extends EventTarget {
	state: 'connected' | 'disconnected' = 'connected';
	connection: 'open' | 'closed' | 'pending' = 'closed';
	manufacturer = 'Test';
	version = '1';
	onstatechange: ((e: Event) => void) | null = null;
	onmidimessage: ((e: Event) => void) | null = null;
	sent: number[][] = [];
	constructor(
		readonly access: FakeAccess,
		readonly id: string,
		readonly name: string,
		readonly type: 'input' | 'output'
	) {
		super();
	}
	changed() {
		for (const target of [this, this.access] as const) {
			const e = new Event('statechange');
			Object.defineProperty(e, 'port', { value: this });
			target.onstatechange?.(e);
			target.dispatchEvent(e);
		}
	}
	async open() {
		if (this.state === 'connected' && this.connection !== 'open') {
			this.connection = 'open';
			this.changed();
		}
		return this;
	}
	async close() {
		this.connection = 'closed';
		return this;
	}
	send(data: number[]) {
		if (this.state !== 'connected') throw new Error('disconnected');
		this.sent.push([...data]);
	}
	play(bytes: number[], timeStamp: number) {
		const e = new Event('midimessage');
		Object.defineProperty(e, 'data', { value: new Uint8Array(bytes) });
		Object.defineProperty(e, 'timeStamp', { value: timeStamp });
		this.onmidimessage?.(e);
	}
}

class FakeAccess extends EventTarget {
	inputs = new Map<string, FakePort>();
	outputs = new Map<string, FakePort>();
	sysexEnabled = false;
	onstatechange: ((e: Event) => void) | null = null;
	requested: unknown[] = [];
	add(id: string, name: string, type: 'input' | 'output', announce = true) {
		const port = new FakePort(this, id, name, type);
		(type === 'input' ? this.inputs : this.outputs).set(id, port);
		if (announce) port.changed();
		return port;
	}
	remove(id: string) {
		const port = this.inputs.get(id) ?? this.outputs.get(id)!;
		this.inputs.delete(id);
		this.outputs.delete(id);
		port.state = 'disconnected';
		port.connection = 'pending';
		port.changed();
	}
	request = (options: unknown) => {
		this.requested.push(options);
		return Promise.resolve(this as unknown as MIDIAccess);
	};
}

afterEach(async () => {
	if (WebMidi.enabled) await WebMidi.disable();
});

const settle = () => new Promise((r) => setTimeout(r, 0));

describe('MidiDevices', () => {
	it('asks for MIDI without SysEx and lists the ports with their state', async () => {
		const access = new FakeAccess();
		access.add('in-1', 'Test Pads', 'input', false);
		access.add('out-1', 'Test Pads', 'output', false);
		const devices = new MidiDevices();
		expect(await devices.connect({ requestMIDIAccess: access.request })).toBe('ready');
		// Web MIDI API: requestMIDIAccess({ sysex }) — we never ask for SysEx.
		expect(access.requested).toEqual([expect.objectContaining({ sysex: false })]);
		expect(devices.ports.map((p) => [p.id, p.kind, p.state])).toEqual([
			['in-1', 'input', 'connected'],
			['out-1', 'output', 'connected']
		]);
		expect(devices.outputFor('in-1')?.id).toBe('out-1');
	});

	it("hands messages on with the message's own timestamp", async () => {
		const access = new FakeAccess();
		const input = access.add('in-1', 'Pads', 'input', false);
		const devices = new MidiDevices();
		const heard: [string, number[], number][] = [];
		devices.onMessage((port, bytes, t) => heard.push([port, [...bytes], t]));
		await devices.connect({ requestMIDIAccess: access.request });
		await settle();
		input.play([0x90, 36, 100], 4321.5);
		expect(heard).toEqual([['in-1', [0x90, 36, 100], 4321.5]]);
	});

	it('shows a controller plugged in later and marks one pulled out as unplugged', async () => {
		const access = new FakeAccess();
		const devices = new MidiDevices();
		const gone: string[] = [];
		devices.onGone((p) => gone.push(p.id));
		await devices.connect({ requestMIDIAccess: access.request });
		expect(devices.ports).toEqual([]);
		access.add('in-2', 'Late Pads', 'input');
		await settle();
		expect(devices.inputs).toMatchObject([{ id: 'in-2', name: 'Late Pads', state: 'connected' }]);
		access.remove('in-2');
		await settle();
		expect(devices.inputs).toMatchObject([{ id: 'in-2', state: 'disconnected' }]);
		expect(gone).toEqual(['in-2']);
	});

	it('explains a refused permission and an absent API in plain words', async () => {
		const refused = new MidiDevices();
		const status = await refused.connect({
			requestMIDIAccess: () => Promise.reject(new DOMException('denied', 'NotAllowedError'))
		});
		expect(status).toBe('refused');
		expect(refused.problem).toContain('MIDI access was refused');
		const absent = new MidiDevices();
		expect(await absent.connect()).toBe('unsupported'); // jsdom has no navigator.requestMIDIAccess
		expect(absent.problem).toContain('on-screen pads');
	});
});

describe('ControllerRig', () => {
	it('releases what an unplugged controller held and lights its pads on the output', async () => {
		const mapping = demoMapping('two-deck');
		const access = new FakeAccess();
		const input = access.add('in-1', 'Pads', 'input', false);
		const output = access.add('out-1', 'Pads', 'output', false);
		const rig = new ControllerRig(mapping.profile);
		const events: string[] = [];
		rig.hub.subscribe((e) => events.push(`${e.type} ${e.input} ${e.source}`));
		await rig.start({ requestMIDIAccess: access.request });
		await settle();

		input.play([0x90, 40, 100], 10); // MIDI 1.0 Note On ch 1, note 40 = pad-5 in the demo grid
		rig.hub.press('screen', 'pad-2');
		rig.show(new Set(['pad-5']));
		rig.lights.flush();
		expect(output.sent).toContainEqual([0x90, 40, 127]);

		access.remove('in-1');
		await settle();
		expect(events).toEqual(['press pad-5 midi:in-1', 'press pad-2 screen', 'release pad-5 midi:in-1']);
		expect([...rig.hub.held]).toEqual(['pad-2']);

		output.sent = [];
		rig.stop();
		expect(output.sent).toHaveLength(16);
		expect(output.sent.every(([, , v]) => v === 0)).toBe(true);
	});
});
