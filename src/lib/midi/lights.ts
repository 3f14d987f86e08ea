// Light feedback: the set of lit inputs → Note On messages to the controller's output.
// Changes are coalesced: at most one flush per interval, and a flush sends only the lights whose
// velocity differs from what the device was last told, so a fast roll never floods the port.
import type { ControllerProfile } from '$lib/engine/types';

export interface MidiSink {
	send(bytes: number[]): void;
}

interface Led {
	status: number;
	note: number;
	on: number;
	off: number;
}

export interface LightOptions {
	intervalMs?: number;
	now?: () => number;
	schedule?: (run: () => void, delayMs: number) => unknown;
	cancel?: (handle: unknown) => void;
}

/** A quarter of the lit velocity, at least 1 and never the dark velocity. */
export function dimVelocity(led: { on: number; off: number }): number {
	const v = Math.max(1, Math.round(led.on / 4));
	return v === led.off ? v + 1 : v;
}

export class LightFeedback {
	readonly #leds = new Map<string, Led>();
	readonly #sink: MidiSink;
	readonly #sent = new Map<string, number>();
	#wanted = new Map<string, number>();
	#timer: unknown = null;
	#lastFlush = -Infinity;
	readonly #interval: number;
	readonly #now: () => number;
	readonly #schedule: (run: () => void, delayMs: number) => unknown;
	readonly #cancel: (handle: unknown) => void;
	messagesSent = 0;

	constructor(profile: ControllerProfile, sink: MidiSink, options: LightOptions = {}) {
		this.#sink = sink;
		this.#interval = options.intervalMs ?? 10;
		this.#now = options.now ?? (() => performance.now());
		this.#schedule = options.schedule ?? ((run, ms) => setTimeout(run, ms));
		this.#cancel = options.cancel ?? ((h) => clearTimeout(h as ReturnType<typeof setTimeout>));
		for (const input of profile.inputs) {
			if (!input.led) continue;
			const status = 0x90 | ((input.channel - 1) & 0x0f);
			this.#leds.set(input.id, { status, note: input.led.note, on: input.led.on ?? 127, off: input.led.off ?? 0 });
		}
	}

	/**
	 * Asks for exactly these inputs to be lit (and `dim` ones lit low); sent at the next flush. A pad
	 * LED's brightness follows the Note On velocity on most pad controllers (common practice), so
	 * dim is a quarter of the profile's lit velocity.
	 */
	show(lit: Iterable<string>, dim: Iterable<string> = []): void {
		const set = new Set(lit);
		const low = new Set(dim);
		const wanted = new Map<string, number>();
		for (const [id, led] of this.#leds) {
			const velocity = set.has(id) ? led.on : low.has(id) ? dimVelocity(led) : led.off;
			wanted.set(id, velocity);
		}
		this.#wanted = wanted;
		if (this.#timer !== null) return;
		const wait = Math.max(0, this.#lastFlush + this.#interval - this.#now());
		this.#timer = this.#schedule(() => {
			this.#timer = null;
			this.flush();
		}, wait);
	}

	/** Sends what changed since the last flush. */
	flush(): number {
		if (this.#timer !== null) {
			this.#cancel(this.#timer);
			this.#timer = null;
		}
		this.#lastFlush = this.#now();
		let count = 0;
		for (const [id, velocity] of this.#wanted) {
			if (this.#sent.get(id) === velocity) continue;
			const led = this.#leds.get(id)!;
			if (!this.#trySend([led.status, led.note, velocity])) return count;
			this.#sent.set(id, velocity);
			count++;
		}
		return count;
	}

	/** Every light off now, whatever the device was told before (page closing, device leaving). */
	dark(): void {
		if (this.#timer !== null) this.#cancel(this.#timer);
		this.#timer = null;
		this.#wanted = new Map();
		for (const [id, led] of this.#leds) {
			if (!this.#trySend([led.status, led.note, led.off])) break;
			this.#sent.set(id, led.off);
		}
	}

	#trySend(bytes: number[]): boolean {
		try {
			this.#sink.send(bytes);
			this.messagesSent++;
			return true;
		} catch {
			// The port went away between the change and the flush; nothing left to light.
			return false;
		}
	}
}
