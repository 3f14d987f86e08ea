import { describe, expect, it, vi } from 'vitest';
import { render, screen } from '@testing-library/svelte';
import userEvent from '@testing-library/user-event';
import StepEditor from '$lib/components/studio/StepEditor.svelte';
import type { Problem, Step } from '$lib/engine';

// Typing through user-event is slow in jsdom on a shared machine.
vi.setConfig({ testTimeout: 20_000 });

const mapping = {
	decks: 2 as const,
	racks: [
		{ id: 'pads', label: 'Pads' },
		{ id: 'row', label: 'Row' }
	],
	counters: [{ id: 'held', max: 15, rest: 0 }]
};

function setup(step: Step, onsave = vi.fn((): Problem[] => [])) {
	const oncancel = vi.fn();
	render(StepEditor, { step, number: 3, mapping, onsave, oncancel });
	return { onsave, oncancel, user: userEvent.setup() };
}

describe('StepEditor', () => {
	it('edits a step into a rack-mix step and saves the value as 0..1', async () => {
		const { onsave, user } = setup({ target: { kind: 'rack-on', rack: 1 }, action: 'momentary' });
		await user.selectOptions(screen.getByLabelText('What it changes'), 'rack-mix');
		await user.selectOptions(screen.getByLabelText('Rack'), '2');
		const value = screen.getByLabelText('Value (percent)');
		await user.clear(value);
		await user.type(value, '45');
		expect(screen.getByTestId('step-preview')).toHaveTextContent('Reads: mix of rack 2 45 %');
		await user.click(screen.getByRole('button', { name: 'Save step' }));
		expect(onsave).toHaveBeenCalledWith({ target: { kind: 'rack-mix', rack: 2 }, action: 'set', value: 0.45 });
	});

	it('offers only the actions that fit the target', async () => {
		const { user } = setup({ target: { kind: 'counter', counter: 'held' }, action: 'count-up' });
		const actions = () => [...(screen.getByLabelText('Action') as HTMLSelectElement).options].map((o) => o.value);
		expect(actions()).toEqual(['count-up', 'count-down', 'reset', 'set']);
		await user.selectOptions(screen.getByLabelText('What it changes'), 'chain');
		expect(actions()).toEqual(['set']);
	});

	it('adds a guard on a declared counter and a release phase', async () => {
		const { onsave, user } = setup({ target: { kind: 'rack-on', rack: 1 }, action: 'set', value: 0 });
		await user.selectOptions(screen.getByLabelText('When'), 'release');
		await user.click(screen.getByRole('button', { name: 'Add a guard' }));
		await user.clear(screen.getByLabelText('Value of guard 1'));
		await user.type(screen.getByLabelText('Value of guard 1'), '1');
		await user.click(screen.getByRole('button', { name: 'Save step' }));
		expect(onsave).toHaveBeenCalledWith({
			target: { kind: 'rack-on', rack: 1 },
			action: 'set',
			value: 0,
			phase: 'release',
			guards: [{ counter: 'held', op: '=', value: 1 }]
		});
	});

	it('shows the problems the mapping check answers and keeps the form open', async () => {
		const onsave = vi.fn((): Problem[] => [{ path: 'bindings[0].steps[2]', message: 'rack 2 isn’t declared' }]);
		const { user } = setup({ target: { kind: 'rack-on', rack: 1 }, action: 'toggle' }, onsave);
		await user.click(screen.getByRole('button', { name: 'Save step' }));
		expect(screen.getByTestId('step-problems')).toHaveTextContent('rack 2 isn’t declared');
		expect(screen.getByTestId('step-editor')).toBeInTheDocument();
	});

	it('builds a chain of up to four effects', async () => {
		const { onsave, user } = setup({ target: { kind: 'chain', rack: 1 }, action: 'set', value: ['echo'] });
		await user.click(screen.getByRole('button', { name: 'Add a position' }));
		await user.selectOptions(screen.getByLabelText('Position 2'), 'reverb');
		await user.click(screen.getByRole('button', { name: 'Add a position' }));
		await user.click(screen.getByRole('button', { name: 'Add a position' }));
		expect(screen.queryByRole('button', { name: 'Add a position' })).not.toBeInTheDocument();
		await user.click(screen.getByRole('button', { name: 'Save step' }));
		expect(onsave).toHaveBeenCalledWith({
			target: { kind: 'chain', rack: 1 },
			action: 'set',
			value: ['echo', 'reverb', 'echo', 'echo']
		});
	});
});
