// Plays a list of input events (an imported MIDI file) into the input hub in real time, as if a
// controller called "file" were playing them. Stopping lets go of whatever the file still held.
import type { InputEvent } from '$lib/engine';
import type { InputHub } from './input-hub.svelte';

export const FILE_SOURCE = 'file';

export class FilePlayback {
	playing = $state(false);
	#timers: ReturnType<typeof setTimeout>[] = [];
	#hub: InputHub | null = null;

	play(events: readonly InputEvent[], hub: InputHub): void {
		this.stop();
		this.#hub = hub;
		this.playing = true;
		const last = events.at(-1)?.t ?? 0;
		for (const e of events) {
			this.#timers.push(
				setTimeout(() => {
					if (e.type === 'press') hub.press(FILE_SOURCE, e.input);
					else if (e.type === 'release') hub.release(FILE_SOURCE, e.input);
					else hub.turn(FILE_SOURCE, e.input, e.value ?? 0);
				}, e.t)
			);
		}
		this.#timers.push(setTimeout(() => this.stop(), last + 1));
	}

	stop(): void {
		for (const timer of this.#timers.splice(0)) clearTimeout(timer);
		this.#hub?.releaseSource(FILE_SOURCE);
		this.#hub = null;
		this.playing = false;
	}
}
