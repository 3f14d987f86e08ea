import { render, screen } from '@testing-library/svelte';
import userEvent from '@testing-library/user-event';
import { describe, expect, it, vi } from 'vitest';
import EventList from '$lib/components/replay/EventList.svelte';
import { brokenRow, chord, press, sessionOf } from '../replay/factories';

// `events` is also a mount option's name, so props go under `props`.
describe('EventList', () => {
	it('marks the causing event as the current one for assistive technology', () => {
		const session = sessionOf(chord(), [{ t: 1100, midi: [0xb0, 7, 90], input: null }]);
		render(EventList, {
			props: { events: session.events, mapping: brokenRow(), current: 3, causing: 3, onSeek: () => {} }
		});
		const causing = screen.getByTestId('causing-event');
		expect(causing).toHaveAttribute('aria-current', 'true');
		expect(causing).toHaveTextContent('1.500 s');
		expect(causing).toHaveTextContent('release');
		expect(causing).toHaveTextContent('Pad 13');
		expect(screen.getAllByRole('button')).toHaveLength(5);
		expect(screen.getByText('unmapped')).toBeInTheDocument();
	});

	it('shows the raw MIDI bytes in hex', () => {
		const events = [{ t: 5, midi: [0x90, 48, 100], input: { input: 'pad-13', type: 'press' as const } }];
		render(EventList, { props: { events, mapping: brokenRow(), current: 0, causing: null, onSeek: () => {} } });
		expect(screen.getByTestId('event')).toHaveTextContent('90 30 64');
	});

	it('draws only the events around the cursor of a long session', () => {
		const long = sessionOf(Array.from({ length: 500 }, (_, i) => press(i * 10, 'pad-13')));
		render(EventList, {
			props: { events: long.events, mapping: brokenRow(), current: 250, causing: null, onSeek: () => {}, around: 3 }
		});
		const shown = screen.getAllByRole('button').map((b) => Number(b.dataset.index));
		expect(shown).toEqual([247, 248, 249, 250, 251, 252, 253]);
	});

	it('moves the cursor to an event when it is clicked', async () => {
		const onSeek = vi.fn();
		render(EventList, {
			props: { events: sessionOf(chord()).events, mapping: brokenRow(), current: -1, causing: null, onSeek }
		});
		await userEvent.click(screen.getAllByRole('button')[2]);
		expect(onSeek).toHaveBeenCalledWith(1500.25);
	});
});
