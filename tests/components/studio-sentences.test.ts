import { describe, expect, it, vi } from 'vitest';
import { render, screen } from '@testing-library/svelte';
import userEvent from '@testing-library/user-event';
import PadSentences from '$lib/components/studio/PadSentences.svelte';
import { legatoRow, onePressEffect, paramForDivision } from '$lib/engine';

// Typing through user-event is slow in jsdom on a shared machine.
vi.setConfig({ testTimeout: 20_000 });

const echo = onePressEffect({
	input: 'pad-1',
	rack: 2,
	effect: 'echo',
	params: [paramForDivision('echo', 1, '1/8')],
	mix: 0.8,
	deck: 'A',
	decks: 2
});

describe('PadSentences', () => {
	it('shows the press and release steps in two lanes', () => {
		render(PadSentences, { binding: echo, mapping: { decks: 2 } });
		expect(screen.getByTestId('lane-press')).toHaveTextContent(
			'load Echo 1/8 into rack 2mix 80 %route to deck A onlyswitch on'
		);
		expect(screen.getByTestId('lane-release')).toHaveTextContent('switch off');
	});

	it('opens the first step a phrase speaks for', async () => {
		const onstep = vi.fn();
		render(PadSentences, { binding: echo, mapping: { decks: 2 }, onstep });
		await userEvent.setup().click(screen.getByRole('button', { name: 'route to deck A only' }));
		// Steps: chain, time, mix, route A, route B, on: the route phrase starts at step 4 (index 3).
		expect(onstep).toHaveBeenCalledWith(3);
	});

	it('marks the quantize grid on the lanes that wait for it', () => {
		const row = legatoRow({
			pads: ['a', 'b'],
			rack: 1,
			effect: 'gate',
			variants: ['1/8', '1/16'],
			counter: 'held',
			deck: 'A',
			decks: 2,
			quantize: '1/16'
		});
		render(PadSentences, { binding: { ...row.bindings[0], releaseAtOnce: true }, mapping: { decks: 2 } });
		expect(screen.getByTestId('lane-press')).toHaveTextContent('on the 1/16 grid');
		expect(screen.getByTestId('lane-release')).not.toHaveTextContent('grid');
	});

	it('says an empty pad does nothing', () => {
		render(PadSentences, { binding: undefined, mapping: { decks: 2 } });
		expect(screen.getByTestId('pad-sentences')).toHaveTextContent('This pad does nothing yet.');
	});
});
