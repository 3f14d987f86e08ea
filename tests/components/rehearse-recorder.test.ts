import { describe, expect, it, vi } from 'vitest';
import { fireEvent, render, screen } from '@testing-library/svelte';
import RecorderPanel from '$lib/components/rehearse/RecorderPanel.svelte';

const base = {
	status: 'idle' as const,
	sessionName: '',
	elapsedMs: 0,
	eventCount: 0,
	unsent: 0,
	offline: false,
	error: null,
	uploadProgress: null,
	countIn: true,
	beatsToGo: null,
	captureAudio: false,
	canCapture: false,
	saved: null,
	resumed: false
};

function setup(props: Record<string, unknown> = {}) {
	const handlers = { onrecord: vi.fn(), onstop: vi.fn(), ondiscard: vi.fn(), oncountin: vi.fn(), oncapture: vi.fn() };
	render(RecorderPanel, { ...base, ...handlers, ...props });
	return handlers;
}

describe('RecorderPanel', () => {
	it('starts a recording with the name typed in', async () => {
		const { onrecord } = setup();
		await fireEvent.input(screen.getByTestId('record-name'), { target: { value: 'Chord drill' } });
		await fireEvent.click(screen.getByTestId('record-start'));
		expect(onrecord).toHaveBeenCalledWith('Chord drill');
	});

	it('while recording shows the time, the events and what still waits for the server', () => {
		setup({ status: 'recording', elapsedMs: 83_400, eventCount: 42, unsent: 7, offline: true });
		expect(screen.getByTestId('record-elapsed')).toHaveTextContent('1:23.4');
		expect(screen.getByTestId('record-events')).toHaveTextContent('42');
		expect(screen.getByTestId('record-unsent')).toHaveTextContent('waiting to send: 7');
		expect(screen.getByTestId('record-offline')).toBeInTheDocument();
		expect(screen.getByTestId('record-stop')).toHaveTextContent('Stop');
		expect(screen.queryByTestId('record-start')).toBeNull();
	});

	it('counts in before recording, and the stop button then cancels', async () => {
		const { onstop } = setup({ beatsToGo: 3 });
		expect(screen.getByTestId('count-in')).toHaveTextContent('count-in 3');
		expect(screen.getByTestId('record-stop')).toHaveTextContent('Cancel');
		await fireEvent.click(screen.getByTestId('record-stop'));
		expect(onstop).toHaveBeenCalled();
	});

	it('offers audio capture only once sound runs', () => {
		setup();
		expect(screen.getByTestId('capture-audio')).toBeDisabled();
	});

	it('shows the upload progress of the captured audio', () => {
		setup({ uploadProgress: 0.25 });
		expect(screen.getByTestId('upload-progress')).toHaveAttribute('value', '0.25');
		expect(screen.getByText('25%')).toBeInTheDocument();
	});

	it('links a saved recording to its replay with its number of findings', () => {
		setup({ status: 'saved', sessionName: 'Chord drill', saved: { id: 'abc-123', findings: 2 } });
		expect(screen.getByTestId('record-saved')).toHaveTextContent('2 findings');
		expect(screen.getByTestId('record-replay-link')).toHaveAttribute('href', '/sessions/abc-123');
	});

	it('tells the performer when an unfinished recording was resumed', () => {
		setup({ status: 'recording', sessionName: 'Evening run', resumed: true });
		expect(screen.getByTestId('record-resumed')).toHaveTextContent('Evening run');
		expect(screen.getByTestId('record-name')).toHaveValue('Evening run');
	});

	it('asks before saving a take with no events, and can discard it', async () => {
		const { onstop, ondiscard } = setup({ status: 'recording', eventCount: 0 });
		await fireEvent.click(screen.getByTestId('record-stop'));
		expect(onstop).not.toHaveBeenCalled();
		expect(screen.getByRole('alertdialog')).toHaveTextContent('This take has no presses yet');
		await fireEvent.click(screen.getByTestId('empty-take-discard'));
		expect(ondiscard).toHaveBeenCalledOnce();
		expect(screen.queryByTestId('empty-take')).toBeNull();
	});

	it('saves an empty take when the performer says so', async () => {
		const { onstop } = setup({ status: 'recording', eventCount: 0 });
		await fireEvent.click(screen.getByTestId('record-stop'));
		await fireEvent.click(screen.getByTestId('empty-take-save'));
		expect(onstop).toHaveBeenCalledWith('');
	});

	it('stops a take with events without asking', async () => {
		const { onstop } = setup({ status: 'recording', eventCount: 3 });
		await fireEvent.click(screen.getByTestId('record-stop'));
		expect(onstop).toHaveBeenCalledOnce();
		expect(screen.queryByTestId('empty-take')).toBeNull();
	});
});
