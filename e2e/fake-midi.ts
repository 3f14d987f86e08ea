// A fake Web MIDI system for Playwright: replaces `navigator.requestMIDIAccess` before the page
// loads with a MIDIAccess whose ports the test plugs, unplugs and plays. Messages are real
// `MIDIMessageEvent`s (Web MIDI API), so their `timeStamp` is on the page's performance clock;
// everything sent to an output is recorded. Reusable by any spec that needs a controller.
import type { Page } from '@playwright/test';

export interface FakePort {
	id: string;
	name: string;
	type: 'input' | 'output';
	manufacturer?: string;
}

export interface FakeMidiOptions {
	ports?: FakePort[];
	/** Make the permission request fail the way a refusal does (NotAllowedError). */
	refuse?: boolean;
}

interface FakeMidiApi {
	/** `timeStamp`: when the message was played on the page's performance clock (default now). */
	send(id: string, bytes: number[], timeStamp?: number): void;
	plug(port: FakePort): void;
	unplug(id: string): void;
	sent(id: string): number[][];
	clear(id: string): void;
}

declare global {
	interface Window {
		__fakeMidi: FakeMidiApi;
	}
}

/** Runs in the page, before any of its scripts. Plain JavaScript semantics only. */
function install(options: FakeMidiOptions) {
	const handlerProperty = (target: EventTarget, type: string) => {
		let current: EventListener | null = null;
		Object.defineProperty(target, `on${type}`, {
			get: () => current,
			set(fn: EventListener | null) {
				if (current) target.removeEventListener(type, current);
				current = fn;
				if (fn) target.addEventListener(type, fn);
				if (fn && type === 'midimessage') (target as unknown as { open(): void }).open();
			}
		});
	};

	const access = new EventTarget() as EventTarget & Record<string, unknown>;
	const inputs = new Map<string, Port>();
	const outputs = new Map<string, Port>();
	Object.assign(access, { inputs, outputs, sysexEnabled: false });
	handlerProperty(access, 'statechange');

	class Port extends EventTarget {
		id: string;
		name: string;
		manufacturer: string;
		type: 'input' | 'output';
		version = '1.0';
		state: 'connected' | 'disconnected' = 'connected';
		connection: 'open' | 'closed' | 'pending' = 'closed';
		log: number[][] = [];
		constructor(spec: FakePort) {
			super();
			this.id = spec.id;
			this.name = spec.name;
			this.type = spec.type;
			this.manufacturer = spec.manufacturer ?? 'Padproof test rig';
			handlerProperty(this, 'statechange');
			if (spec.type === 'input') handlerProperty(this, 'midimessage');
		}
		changed() {
			for (const target of [this as EventTarget, access]) {
				const event = new Event('statechange');
				Object.defineProperty(event, 'port', { value: this });
				target.dispatchEvent(event);
			}
		}
		open() {
			if (this.state === 'connected' && this.connection !== 'open') {
				this.connection = 'open';
				this.changed();
			}
			return Promise.resolve(this);
		}
		close() {
			if (this.connection !== 'closed') {
				this.connection = 'closed';
				this.changed();
			}
			return Promise.resolve(this);
		}
		send(data: ArrayLike<number>) {
			if (this.state !== 'connected') throw new DOMException('The port is disconnected.', 'InvalidStateError');
			this.log.push(Array.from(data));
		}
		clear() {}
	}

	const plug = (spec: FakePort) => {
		const port = new Port(spec);
		(spec.type === 'input' ? inputs : outputs).set(spec.id, port);
		port.changed();
	};

	for (const spec of options.ports ?? []) {
		const port = new Port(spec);
		(spec.type === 'input' ? inputs : outputs).set(spec.id, port);
	}

	const unplugged = new Map<string, Port>();
	Object.defineProperty(Navigator.prototype, 'requestMIDIAccess', {
		configurable: true,
		value: (request?: { sysex?: boolean }) => {
			if (options.refuse) return Promise.reject(new DOMException('Permission denied.', 'NotAllowedError'));
			if (request?.sysex) return Promise.reject(new DOMException('SysEx is not allowed.', 'SecurityError'));
			return Promise.resolve(access);
		}
	});

	window.__fakeMidi = {
		send(id, bytes, timeStamp) {
			const port = inputs.get(id);
			if (!port || port.connection !== 'open') throw new Error(`fake input ${id} is not open`);
			const event = new MIDIMessageEvent('midimessage', { data: new Uint8Array(bytes) });
			// A device stamps a message when it is played; a busy page may deliver it later.
			if (timeStamp !== undefined) Object.defineProperty(event, 'timeStamp', { value: timeStamp });
			port.dispatchEvent(event);
		},
		plug,
		unplug(id) {
			const port = inputs.get(id) ?? outputs.get(id);
			if (!port) throw new Error(`no fake port ${id}`);
			inputs.delete(id);
			outputs.delete(id);
			unplugged.set(id, port);
			port.state = 'disconnected';
			// Web MIDI: an open port whose device goes away is left "pending".
			port.connection = port.connection === 'open' ? 'pending' : 'closed';
			port.changed();
		},
		sent: (id) => (outputs.get(id) ?? unplugged.get(id))?.log.map((m) => [...m]) ?? [],
		clear(id) {
			const port = outputs.get(id);
			if (port) port.log = [];
		}
	};
}

export async function installFakeMidi(page: Page, options: FakeMidiOptions = {}) {
	await page.addInitScript(install, options);
	return {
		send: (id: string, bytes: number[]) =>
			page.evaluate(([i, b]) => window.__fakeMidi.send(i, b), [id, bytes] as const),
		plug: (port: FakePort) => page.evaluate((p) => window.__fakeMidi.plug(p), port),
		unplug: (id: string) => page.evaluate((i) => window.__fakeMidi.unplug(i), id),
		sent: (id: string) => page.evaluate((i) => window.__fakeMidi.sent(i), id),
		clear: (id: string) => page.evaluate((i) => window.__fakeMidi.clear(i), id)
	};
}

export const ONE_CONTROLLER: FakePort[] = [
	{ id: 'pads-in', name: 'Test Pads', type: 'input' },
	{ id: 'pads-out', name: 'Test Pads', type: 'output' }
];
