import { describe, expect, it, vi } from 'vitest';
import { fireEvent, render, screen } from '@testing-library/svelte';
import SessionTitle from '$lib/components/sessions/SessionTitle.svelte';
import UnfinishedSession from '$lib/components/sessions/UnfinishedSession.svelte';

describe('SessionTitle', () => {
	it('renames the session with the name typed in', async () => {
		const onrename = vi.fn().mockResolvedValue(undefined);
		render(SessionTitle, { name: 'Two-deck pad set · 2026-12-02 15:00', onrename });
		await fireEvent.click(screen.getByTestId('rename'));
		const input = screen.getByTestId('rename-input');
		expect(input).toHaveValue('Two-deck pad set · 2026-12-02 15:00');
		await fireEvent.input(input, { target: { value: '  Friday warm-up  ' } });
		await fireEvent.click(screen.getByTestId('rename-save'));
		expect(onrename).toHaveBeenCalledWith('Friday warm-up');
		expect(await screen.findByTestId('session-name')).toBeInTheDocument();
	});

	it('refuses an empty name without asking the server', async () => {
		const onrename = vi.fn();
		render(SessionTitle, { name: 'Take 1', onrename });
		await fireEvent.click(screen.getByTestId('rename'));
		await fireEvent.input(screen.getByTestId('rename-input'), { target: { value: '   ' } });
		await fireEvent.click(screen.getByTestId('rename-save'));
		expect(onrename).not.toHaveBeenCalled();
		expect(screen.getByRole('alert')).toHaveTextContent('Give the session a name.');
	});

	it('keeps the field open with the server’s reason when saving fails', async () => {
		const onrename = vi.fn().mockRejectedValue(new Error('Padproof’s server cannot be reached.'));
		render(SessionTitle, { name: 'Take 1', onrename });
		await fireEvent.click(screen.getByTestId('rename'));
		await fireEvent.input(screen.getByTestId('rename-input'), { target: { value: 'Take 2' } });
		await fireEvent.click(screen.getByTestId('rename-save'));
		expect(await screen.findByRole('alert')).toHaveTextContent('cannot be reached');
		expect(screen.getByTestId('rename-input')).toHaveValue('Take 2');
	});
});

describe('UnfinishedSession', () => {
	it('says what happened and closes the session on request', async () => {
		const onclose = vi.fn().mockResolvedValue(undefined);
		render(UnfinishedSession, { props: { events: 42, onclose } });
		expect(screen.getByTestId('unfinished')).toHaveTextContent('All 42 events that reached the server are here.');
		await fireEvent.click(screen.getByTestId('close-session'));
		expect(onclose).toHaveBeenCalledOnce();
	});

	it('shows why closing failed', async () => {
		const onclose = vi.fn().mockRejectedValue(new Error('That session does not exist, or it belongs to someone else.'));
		render(UnfinishedSession, { props: { events: 3, onclose } });
		await fireEvent.click(screen.getByTestId('close-session'));
		expect(await screen.findByRole('alert')).toHaveTextContent('does not exist');
	});
});
