// The rehearsal room's deck card: "Ready" while the sound is off, then Playing or Stopped; what the
// rig does to the deck (stopped by the mapping, the racks heard on it, or dry); and its controls.
import type { ComponentProps } from 'svelte';
import { describe, expect, it, vi } from 'vitest';
import { render, screen, within } from '@testing-library/svelte';
import userEvent from '@testing-library/user-event';
import DeckCard from '$lib/components/rehearse/DeckCard.svelte';

const loops = [
	{ id: 'groove', name: 'Groove', style: 'house' },
	{ id: 'breaks', name: 'Breaks', style: 'breakbeat' }
];

function card(props: Partial<ComponentProps<typeof DeckCard>> = {}) {
	const onplaying = vi.fn();
	const onloop = vi.fn();
	const view = render(DeckCard, {
		deck: 'A',
		rigPlaying: true,
		audibleRacks: [],
		loop: 'groove',
		playing: true,
		soundOn: false,
		loops,
		onloop,
		onplaying,
		...props
	});
	const button = () => screen.getByTestId('deck-A-play');
	const effects = () => screen.getByTestId('deck-A-effects');
	return { ...view, onplaying, onloop, button, effects };
}

describe('DeckCard', () => {
	it('says "Ready" for a playing deck until the sound starts, then "Playing"', async () => {
		const { button, rerender } = card();
		expect(button()).toHaveTextContent('Ready');
		expect(button()).toHaveAttribute('data-state', 'ready');
		expect(button()).toHaveAttribute('aria-pressed', 'true');
		expect(button()).toHaveAttribute('title', 'Starts playing when you start the sound');
		await rerender({ soundOn: true });
		expect(button()).toHaveTextContent('Playing');
		expect(button()).toHaveAttribute('data-state', 'playing');
		expect(button()).not.toHaveAttribute('title');
	});

	it('says "Stopped" for a stopped deck, sound on or off, and the button starts it', async () => {
		const { button, rerender, onplaying } = card({ playing: false });
		expect(button()).toHaveTextContent('Stopped');
		expect(button()).toHaveAttribute('aria-pressed', 'false');
		await rerender({ soundOn: true });
		expect(button()).toHaveTextContent('Stopped');
		await userEvent.click(button());
		expect(onplaying).toHaveBeenCalledWith(true);
	});

	it('the button stops a playing deck', async () => {
		const { button, onplaying } = card({ soundOn: true });
		await userEvent.click(button());
		expect(onplaying).toHaveBeenCalledWith(false);
	});

	it('names a deck the mapping stopped, even while its racks would sound', () => {
		const { effects } = card({ soundOn: true, rigPlaying: false, audibleRacks: [1] });
		expect(effects()).toHaveTextContent('stopped by the mapping');
		expect(effects()).not.toHaveTextContent('audible');
	});

	it('lists the racks heard on the deck and marks the card, or says the deck is dry', async () => {
		const { effects, rerender } = card({ soundOn: true, audibleRacks: [1, 3] });
		expect(effects()).toHaveTextContent('rack 1 + 3 audible');
		expect(screen.getByRole('region', { name: 'Deck A' })).toHaveClass('border-live-500');
		await rerender({ audibleRacks: [] });
		expect(effects()).toHaveTextContent(/^\s*dry\s*$/);
		expect(screen.getByRole('region', { name: 'Deck A' })).not.toHaveClass('border-live-500');
	});

	it('chooses a loop, or none', async () => {
		const { onloop } = card();
		const select = within(screen.getByRole('region', { name: 'Deck A' })).getByRole('combobox');
		expect(select).toHaveValue('groove');
		await userEvent.selectOptions(select, 'breaks');
		expect(onloop).toHaveBeenLastCalledWith('breaks');
		await userEvent.selectOptions(select, '');
		expect(onloop).toHaveBeenLastCalledWith(null);
	});
});
