// Everything a page needs to play a mapping from real controllers: the Web MIDI adapter, the one
// input hub, per-port profiles and light feedback to each device's output. The controllers page
// and the rehearsal room both build one of these around their mapping's profile.
import type { ControllerProfile } from '$lib/engine';
import type { Decoded } from './decode';
import { InputHub } from './input-hub.svelte';
import { MidiDevices, type ConnectOptions, type MidiPortInfo } from './midi-devices.svelte';
import { LightBank } from './pad-lights';
import { alignProfile } from './profiles';

export type DecodedListener = (port: string, decoded: Decoded, t: number) => void;

export const midiSource = (portId: string) => `midi:${portId}`;

export class ControllerRig {
	readonly devices = new MidiDevices();
	readonly hub: InputHub;
	readonly lights = new LightBank();
	/** Input port id → the device profile it was given (absent: the mapping's own profile). */
	profiles = $state<Record<string, ControllerProfile>>({});
	#mappingProfile: ControllerProfile;
	#listeners = new Set<DecodedListener>();
	#stops: (() => void)[] = [];

	constructor(mappingProfile: ControllerProfile) {
		this.#mappingProfile = mappingProfile;
		this.hub = new InputHub(mappingProfile);
	}

	onDecoded(listener: DecodedListener): () => void {
		this.#listeners.add(listener);
		return () => this.#listeners.delete(listener);
	}

	async start(options?: ConnectOptions): Promise<void> {
		if (this.#stops.length === 0) {
			this.#stops.push(
				this.devices.onMessage((port, bytes, t) => {
					const decoded = this.hub.receiveMidi(midiSource(port), bytes, t);
					for (const listener of this.#listeners) listener(port, decoded, t);
				}),
				this.devices.onArrive((port) => this.#arrive(port)),
				this.devices.onGone((port) => this.#gone(port))
			);
		}
		await this.devices.connect(options);
	}

	profileFor(inputPortId: string): ControllerProfile {
		return this.profiles[inputPortId] ?? this.#mappingProfile;
	}

	/** Gives one input port (and its device's output) a profile; null: back to the mapping's own. */
	assign(inputPortId: string, profile: ControllerProfile | null): void {
		const next = { ...this.profiles };
		if (profile) next[inputPortId] = profile;
		else delete next[inputPortId];
		this.profiles = next;
		this.hub.usePortProfile(midiSource(inputPortId), profile ? alignProfile(profile, this.#mappingProfile) : null);
		const output = this.devices.outputFor(inputPortId);
		if (output) this.#light(output);
	}

	show(lit: Set<string>, dim?: Set<string>): void {
		this.lights.show(lit, dim);
	}

	/** Lights off, holds released, listeners gone: the page is closing or moving on. */
	stop(): void {
		this.lights.darkAll();
		this.hub.releaseAll();
		for (const stop of this.#stops.splice(0)) stop();
		this.devices.disconnect();
	}

	#arrive(port: MidiPortInfo): void {
		if (port.kind === 'output') this.#light(port);
		else {
			const output = this.devices.outputFor(port.id);
			if (output) this.#light(output);
		}
	}

	#gone(port: MidiPortInfo): void {
		if (port.kind === 'input') this.hub.releaseSource(midiSource(port.id));
		else this.lights.detach(port.id);
	}

	#light(output: MidiPortInfo): void {
		const input = this.devices.inputs.find((i) => i.name === output.name && i.state === 'connected');
		const profile = input ? this.profileFor(input.id) : this.#mappingProfile;
		this.lights.attach(output.id, alignProfile(profile, this.#mappingProfile), this.devices.sink(output.id));
	}
}
