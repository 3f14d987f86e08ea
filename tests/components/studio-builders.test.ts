import { beforeAll, describe, expect, it, vi } from 'vitest';
import { render, screen, within } from '@testing-library/svelte';
import userEvent from '@testing-library/user-event';
import HoldRowDialog from '$lib/components/studio/HoldRowDialog.svelte';
import OnePressDialog from '$lib/components/studio/OnePressDialog.svelte';
import { legatoRow, onePressEffect, padGridProfile, paramForDivision, type Mapping } from '$lib/engine';

// Typing through user-event is slow in jsdom on a shared machine.
vi.setConfig({ testTimeout: 20_000 });

// jsdom has <dialog> but not its modal methods.
beforeAll(() => {
	HTMLDialogElement.prototype.showModal ??= function (this: HTMLDialogElement) {
		this.open = true;
	};
	HTMLDialogElement.prototype.close ??= function (this: HTMLDialogElement) {
		this.open = false;
	};
});

const empty: Mapping = {
	version: 2,
	name: 'Empty',
	decks: 2,
	profile: padGridProfile(),
	racks: [
		{ id: 'one', label: 'One' },
		{ id: 'two', label: 'Two' }
	],
	counters: [],
	bindings: []
};

describe('OnePressDialog', () => {
	it('previews the sentences it will write and writes the builder’s binding', async () => {
		const onwrite = vi.fn(() => []);
		const onclose = vi.fn();
		render(OnePressDialog, { open: true, mapping: empty, input: 'pad-1', onwrite, onclose });
		const user = userEvent.setup();
		await user.selectOptions(screen.getByLabelText('Rack'), '2');
		await user.selectOptions(screen.getByLabelText('Effect 1: Echo time'), '1/8');
		await user.type(screen.getByLabelText('Label'), 'Echo A');
		expect(within(screen.getByTestId('builder-preview')).getByTestId('lane-press')).toHaveTextContent(
			'load Echo 1/8 into rack 2mix 80 %route to deck A onlyswitch on'
		);
		await user.click(screen.getByRole('button', { name: 'Write the steps' }));
		expect(onwrite).toHaveBeenCalledWith(
			onePressEffect({
				input: 'pad-1',
				label: 'Echo A',
				rack: 2,
				chain: ['echo'],
				params: [[paramForDivision('echo', 1, '1/8')]],
				mix: 0.8,
				deck: 'A',
				decks: 2,
				intent: 'while-held'
			})
		);
		expect(onclose).toHaveBeenCalled();
	});

	it('keeps the dialog open with the problems when the mapping refuses the binding', async () => {
		const onwrite = vi.fn(() => [{ path: 'bindings[0].label', message: 'label must be at most 64 characters' }]);
		const onclose = vi.fn();
		render(OnePressDialog, { open: true, mapping: empty, input: 'pad-2', onwrite, onclose });
		await userEvent.setup().click(screen.getByRole('button', { name: 'Write the steps' }));
		expect(screen.getByRole('alert')).toHaveTextContent('label must be at most 64 characters');
		expect(onclose).not.toHaveBeenCalled();
	});
});

describe('HoldRowDialog', () => {
	it('writes a four-pad stutter row with one division per pad and its counter', async () => {
		const onwrite = vi.fn(() => []);
		render(HoldRowDialog, { open: true, mapping: empty, onwrite, onclose: vi.fn() });
		const user = userEvent.setup();
		expect(screen.getByRole('button', { name: 'Write the row' })).toBeDisabled();
		for (const n of [13, 14, 15, 16]) await user.click(screen.getByLabelText(`Pad ${n}`));
		await user.selectOptions(screen.getByLabelText('Rack'), '2');
		const preview = screen.getByTestId('builder-preview');
		expect(within(preview).getAllByTestId('lane-press')).toHaveLength(4);
		expect(preview).toHaveTextContent('Stutter 1/32');
		await user.click(screen.getByRole('button', { name: 'Write the row' }));
		expect(onwrite).toHaveBeenCalledWith(
			legatoRow({
				pads: ['pad-13', 'pad-14', 'pad-15', 'pad-16'],
				rack: 2,
				effect: 'stutter',
				variants: ['1/4', '1/8', '1/16', '1/32'],
				labels: ['Stutter 1/4', 'Stutter 1/8', 'Stutter 1/16', 'Stutter 1/32'],
				counter: 'held',
				group: 'row',
				deck: 'A',
				decks: 2,
				mix: 1
			})
		);
	});
});
