// The Web MIDI adapter, on the `webmidi` package: enables MIDI without SysEx, lists ports with
// their state, follows hot-plug, and hands every message on with its own timestamp. When the
// browser has no Web MIDI or the user refuses it, `status` and `problem` say so in plain words.
import type { Input, WebMidi as WebMidiType } from 'webmidi';
import type { MidiSink } from './lights';

export type MidiStatus = 'idle' | 'connecting' | 'ready' | 'unsupported' | 'refused' | 'failed';

export interface MidiPortInfo {
	id: string;
	name: string;
	manufacturer: string;
	kind: 'input' | 'output';
	state: 'connected' | 'disconnected';
}

interface PortLike {
	id: string;
	name?: string | null;
	manufacturer?: string | null;
	state: string;
}

export type MessageListener = (portId: string, bytes: Uint8Array, t: number) => void;
export type PortListener = (port: MidiPortInfo) => void;

export interface ConnectOptions {
	/** Stands in for `navigator.requestMIDIAccess` (tests, or a browser extension's shim). */
	requestMIDIAccess?: (options: { sysex: boolean; software: boolean }) => Promise<MIDIAccess>;
}

const PROBLEMS: Record<Exclude<MidiStatus, 'idle' | 'connecting' | 'ready'>, string> = {
	unsupported:
		'This browser has no Web MIDI, so hardware controllers cannot reach Padproof here. Chromium-based browsers support it. The on-screen pads and the computer keyboard work everywhere.',
	refused:
		'MIDI access was refused. Allow MIDI devices for this site in the browser settings and reload. Meanwhile the on-screen pads and the computer keyboard work.',
	failed:
		'The browser could not start its MIDI system. Check that the controller is plugged in and not held by another program, then try again. The on-screen pads and the computer keyboard still work.'
};

export class MidiDevices {
	status = $state<MidiStatus>('idle');
	problem = $state('');
	ports = $state.raw<MidiPortInfo[]>([]);

	#midi: typeof WebMidiType | null = null;
	#attached = new Map<
		string,
		{ input: Input; handler: (e: { message: { rawData: Uint8Array }; timestamp: number }) => void }
	>();
	#known = new Map<string, MidiPortInfo>();
	#onMessage = new Set<MessageListener>();
	#onArrive = new Set<PortListener>();
	#onGone = new Set<PortListener>();
	#sync = () => this.#refresh();

	get inputs(): MidiPortInfo[] {
		return this.ports.filter((p) => p.kind === 'input');
	}

	get outputs(): MidiPortInfo[] {
		return this.ports.filter((p) => p.kind === 'output');
	}

	onMessage(listener: MessageListener): () => void {
		this.#onMessage.add(listener);
		return () => this.#onMessage.delete(listener);
	}

	onArrive(listener: PortListener): () => void {
		this.#onArrive.add(listener);
		return () => this.#onArrive.delete(listener);
	}

	onGone(listener: PortListener): () => void {
		this.#onGone.add(listener);
		return () => this.#onGone.delete(listener);
	}

	async connect(options: ConnectOptions = {}): Promise<MidiStatus> {
		if (this.status === 'ready' || this.status === 'connecting') return this.status;
		const hasApi = typeof navigator !== 'undefined' && typeof navigator.requestMIDIAccess === 'function';
		if (!hasApi && !options.requestMIDIAccess) return this.#fail('unsupported');
		this.status = 'connecting';
		try {
			const { WebMidi } = await import('webmidi');
			await WebMidi.enable({ sysex: false, requestMIDIAccessFunction: options.requestMIDIAccess });
			this.#midi = WebMidi;
		} catch (error) {
			const name = error instanceof Error || error instanceof DOMException ? error.name : '';
			return this.#fail(name === 'SecurityError' || name === 'NotAllowedError' ? 'refused' : 'failed', error);
		}
		this.#midi.addListener('connected', this.#sync);
		this.#midi.addListener('disconnected', this.#sync);
		// Browsers differ in whether an unplugged port stays in the access maps; the raw event
		// is the one signal every engine sends, so it drives the refresh as well.
		this.#midi.interface?.addEventListener('statechange', this.#sync);
		this.status = 'ready';
		this.problem = '';
		this.#refresh();
		return this.status;
	}

	/** A sink for light feedback; sending to a port that went away throws, which lights expect. */
	sink(outputId: string): MidiSink {
		return {
			send: (bytes) => {
				const output = this.#midi?.getOutputById(outputId);
				if (!output || output.state !== 'connected') throw new Error(`Output ${outputId} is gone`);
				output.send(bytes);
			}
		};
	}

	/** The output port of the same device as an input (same port name, as devices report them). */
	outputFor(inputId: string): MidiPortInfo | null {
		const input = this.#known.get(inputId);
		return this.outputs.find((o) => o.state === 'connected' && input && o.name === input.name) ?? null;
	}

	disconnect(): void {
		const midi = this.#midi;
		if (!midi) return;
		midi.removeListener('connected', this.#sync);
		midi.removeListener('disconnected', this.#sync);
		midi.interface?.removeEventListener('statechange', this.#sync);
		for (const { input, handler } of this.#attached.values()) input.removeListener('midimessage', handler);
		this.#attached.clear();
		this.#midi = null;
		this.status = 'idle';
	}

	#fail(status: Exclude<MidiStatus, 'idle' | 'connecting' | 'ready'>, error?: unknown): MidiStatus {
		this.status = status;
		const detail = error instanceof Error && error.message ? ` (${error.message})` : '';
		this.problem = PROBLEMS[status] + (status === 'failed' ? detail : '');
		return status;
	}

	#refresh(): void {
		const access = this.#midi?.interface;
		if (!access) return;
		const seen = new Set<string>();
		const arrived: MidiPortInfo[] = [];
		const gone: MidiPortInfo[] = [];
		const visit = (port: PortLike, kind: 'input' | 'output') => {
			const info: MidiPortInfo = {
				id: port.id,
				name: port.name ?? port.id,
				manufacturer: port.manufacturer ?? '',
				kind,
				state: port.state === 'connected' ? 'connected' : 'disconnected'
			};
			seen.add(info.id);
			this.#note(info, arrived, gone);
		};
		access.inputs.forEach((port) => visit(port, 'input'));
		access.outputs.forEach((port) => visit(port, 'output'));
		for (const info of this.#known.values()) {
			if (!seen.has(info.id) && info.state === 'connected')
				this.#note({ ...info, state: 'disconnected' }, arrived, gone);
		}
		for (const info of this.#known.values()) if (info.kind === 'input') this.#attach(info);
		this.ports = [...this.#known.values()];
		for (const port of gone) for (const listener of this.#onGone) listener(port);
		for (const port of arrived) for (const listener of this.#onArrive) listener(port);
	}

	#note(info: MidiPortInfo, arrived: MidiPortInfo[], gone: MidiPortInfo[]): void {
		const before = this.#known.get(info.id);
		this.#known.set(info.id, info);
		if (info.state === 'connected' && before?.state !== 'connected') arrived.push(info);
		if (info.state === 'disconnected' && before?.state === 'connected') gone.push(info);
	}

	#attach(info: MidiPortInfo): void {
		const input = info.state === 'connected' ? this.#midi?.getInputById(info.id) : undefined;
		const current = this.#attached.get(info.id);
		if (current && current.input === input) return;
		if (current) current.input.removeListener('midimessage', current.handler);
		this.#attached.delete(info.id);
		if (!input) return;
		const handler = (e: { message: { rawData: Uint8Array }; timestamp: number }) => {
			for (const listener of this.#onMessage) listener(info.id, e.message.rawData, e.timestamp);
		};
		input.addListener('midimessage', handler);
		this.#attached.set(info.id, { input, handler });
	}
}
