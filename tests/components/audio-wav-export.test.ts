// The sounds page's WAV export renders what is heard: the playing decks' loops at their levels. A
// deck that is stopped, or has no loop, is left out of the render.
import { describe, expect, it, vi } from 'vitest';
import { render, screen } from '@testing-library/svelte';
import userEvent from '@testing-library/user-event';
import WavExport from '$lib/components/audio/WavExport.svelte';
import type { SoundStage } from '$lib/audio/sound-stage.svelte';
import type { RenderSpec } from '$lib/audio/render';

const rendered = vi.hoisted(() => [] as RenderSpec[]);
vi.mock('$lib/audio/render', () => ({
	renderRig: async (spec: RenderSpec) => {
		rendered.push(spec);
		return { channels: [new Float32Array(4)], sampleRate: 44_100 };
	}
}));
vi.mock('$lib/audio/wav', () => ({ encodeWav: () => new Uint8Array(44) }));

function stage(): SoundStage {
	return {
		tempo: 124,
		masterDb: -3,
		loops: { A: 'glass-steps', B: 'low-pulse', C: null, D: 'dust-hats' },
		playing: { A: true, B: false, C: true, D: true },
		levels: { A: 0, B: -2, C: -4, D: -6 },
		rigState: () => ({ marker: 'the rig as set' })
	} as unknown as SoundStage;
}

describe('WavExport', () => {
	it('renders the playing decks with loops and leaves out the stopped one', async () => {
		URL.createObjectURL = vi.fn(() => 'blob:wav');
		URL.revokeObjectURL = vi.fn();
		const click = vi.spyOn(HTMLAnchorElement.prototype, 'click').mockImplementation(() => {});
		render(WavExport, { stage: stage(), seconds: 4 });
		await userEvent.click(screen.getByTestId('export-wav'));
		await vi.waitFor(() => expect(rendered).toHaveLength(1));
		const spec = rendered[0];
		// B has a loop but is stopped; C plays but has no loop.
		expect(spec.decks).toEqual({
			A: { loop: 'glass-steps', levelDb: 0 },
			D: { loop: 'dust-hats', levelDb: -6 }
		});
		expect(spec).toMatchObject({ seconds: 4, tempo: 124, masterDb: -3, state: { marker: 'the rig as set' } });
		await vi.waitFor(() => expect(screen.getByRole('status')).toHaveTextContent(/^Rendered 4 s in \d+ ms\.$/));
		expect(click).toHaveBeenCalledTimes(1);
		click.mockRestore();
	});
});
