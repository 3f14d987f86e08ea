// A small scripting handle on `window.padproofSounds`, installed by the /sounds page: browser
// tests and the benchmark render offline through it and measure the samples themselves.
import { EFFECTS } from '$lib/engine/effects';
import { DEMO_LOOPS } from './loops/patterns';
import type { RenderSpec } from './render';

export interface RenderedForScript {
	sampleRate: number;
	lookAhead: number;
	/** Each channel's Float32 samples, little-endian, base64 (exact and compact to hand over). */
	channels: string[];
	renderMs: number;
}

export interface SoundsHook {
	loops: { id: string; name: string; bpm: number }[];
	effects: string[];
	render(spec: RenderSpec): Promise<RenderedForScript>;
}

export function floatsToBase64(samples: Float32Array): string {
	const bytes = new Uint8Array(samples.buffer, samples.byteOffset, samples.byteLength);
	let text = '';
	for (let i = 0; i < bytes.length; i += 0x8000) text += String.fromCharCode(...bytes.subarray(i, i + 0x8000));
	return btoa(text);
}

export function installSoundsHook(target: { padproofSounds?: SoundsHook }): void {
	target.padproofSounds = {
		loops: DEMO_LOOPS.map(({ id, name, bpm }) => ({ id, name, bpm })),
		effects: Object.keys(EFFECTS),
		async render(spec) {
			const started = performance.now();
			const { renderRig } = await import('./render');
			const rendered = await renderRig(spec);
			const renderMs = performance.now() - started;
			return {
				sampleRate: rendered.sampleRate,
				lookAhead: rendered.lookAhead,
				channels: rendered.channels.map(floatsToBase64),
				renderMs
			};
		}
	};
}
