// The one input path: on-screen pads, the computer keyboard and every MIDI port feed this hub,
// and the engine listens to it. A pad held from two places (a finger and a MIDI pad) is one press
// until the last of them lets go, so the engine never sees a press it already has.
import { SvelteSet } from 'svelte/reactivity';
import type { ControllerProfile, InputEvent } from '$lib/engine/types';
import { createDecoder, type Decoded, type Decoder } from './decode';

export interface HubEvent extends InputEvent {
	source: string;
}

export type HubListener = (event: HubEvent) => void;

export const SCREEN_SOURCE = 'screen';
export const KEYBOARD_SOURCE = 'keyboard';

export class InputHub {
	/** Input ids held down right now, from any source. */
	readonly held = new SvelteSet<string>();
	#holders = new Map<string, Set<string>>();
	#listeners = new Set<HubListener>();
	#profile: ControllerProfile;
	#decoder: Decoder;
	#portDecoders = new Map<string, Decoder>();
	#now: () => number;

	constructor(profile: ControllerProfile, now: () => number = () => performance.now()) {
		this.#profile = profile;
		this.#decoder = createDecoder(profile);
		this.#now = now;
	}

	get profile(): ControllerProfile {
		return this.#profile;
	}

	/** Changes the profile every port without its own uses; lets go of everything first. */
	setProfile(profile: ControllerProfile): void {
		this.releaseAll();
		this.#profile = profile;
		this.#decoder = createDecoder(profile);
	}

	/** A port with its own profile (already aligned to the mapping's input ids). */
	usePortProfile(source: string, profile: ControllerProfile | null): void {
		this.releaseSource(source);
		if (profile) this.#portDecoders.set(source, createDecoder(profile));
		else this.#portDecoders.delete(source);
	}

	subscribe(listener: HubListener): () => void {
		this.#listeners.add(listener);
		return () => this.#listeners.delete(listener);
	}

	press(source: string, input: string, t = this.#now()): boolean {
		let holders = this.#holders.get(input);
		if (!holders) this.#holders.set(input, (holders = new Set()));
		if (holders.has(source)) return false;
		holders.add(source);
		if (holders.size > 1) return false;
		this.held.add(input);
		this.#emit({ t, input, type: 'press', source });
		return true;
	}

	release(source: string, input: string, t = this.#now()): boolean {
		const holders = this.#holders.get(input);
		if (!holders?.delete(source)) return false;
		if (holders.size > 0) return false;
		this.#holders.delete(input);
		this.held.delete(input);
		this.#emit({ t, input, type: 'release', source });
		return true;
	}

	turn(source: string, input: string, value: number, t = this.#now()): void {
		this.#emit({ t, input, type: 'turn', value: Math.min(1, Math.max(0, value)), source });
	}

	/** Decodes one message from a MIDI port and plays it; the result is for the monitor. */
	receiveMidi(source: string, bytes: ArrayLike<number>, t = this.#now()): Decoded {
		const decoded = (this.#portDecoders.get(source) ?? this.#decoder)(bytes, t);
		if (decoded.status === 'event') {
			const { event } = decoded;
			if (event.type === 'press') this.press(source, event.input, t);
			else if (event.type === 'release') this.release(source, event.input, t);
			else this.turn(source, event.input, event.value ?? 0, t);
		}
		return decoded;
	}

	/** Lets go of everything one source holds: a device unplugged mid-hold, a lost pointer. */
	releaseSource(source: string, t = this.#now()): number {
		let count = 0;
		for (const [input, holders] of [...this.#holders]) {
			if (holders.has(source) && this.release(source, input, t)) count++;
		}
		return count;
	}

	releaseAll(t = this.#now()): void {
		for (const [input, holders] of [...this.#holders]) {
			for (const source of [...holders]) this.release(source, input, t);
		}
	}

	heldBy(source: string): string[] {
		return [...this.#holders].filter(([, h]) => h.has(source)).map(([input]) => input);
	}

	#emit(event: HubEvent): void {
		for (const listener of this.#listeners) listener(event);
	}
}
