import { describe, expect, it, vi } from 'vitest';
import { fireEvent, render, screen } from '@testing-library/svelte';
import PadGrid from '$lib/components/midi/PadGrid.svelte';
import { GENERIC_4X4 } from '$lib/midi/profiles';
import { InputHub } from '$lib/midi/input-hub.svelte';

function setup(props: Record<string, unknown> = {}) {
	const onpress = vi.fn();
	const onrelease = vi.fn();
	const view = render(PadGrid, { profile: GENERIC_4X4, onpress, onrelease, ...props });
	const pad = (id: string) => screen.getByTestId(`pad-${id}`);
	return { onpress, onrelease, pad, view };
}

const down = (el: Element, pointerId: number) =>
	fireEvent.pointerDown(el, { pointerId, pointerType: 'touch', button: 0 });
const up = (pointerId: number) => fireEvent.pointerUp(window, { pointerId, pointerType: 'touch' });

describe('PadGrid', () => {
	it('shows one button per pad, named by what it does and its key', () => {
		setup({ labels: { 'pad-1': 'Echo A' } });
		expect(screen.getAllByRole('button')).toHaveLength(16);
		// Key block: the bottom-left pad takes Z (row 4 of 1234 / QWER / ASDF / ZXCV).
		expect(screen.getByRole('button', { name: 'Echo A, key Z' })).toBeInTheDocument();
		expect(screen.getByRole('button', { name: 'Pad 13, key 1' })).toBeInTheDocument();
	});

	it('shows held pads as pressed and lit pads as lit', () => {
		const { pad } = setup({ held: new Set(['pad-2']), lit: new Set(['pad-3']) });
		expect(pad('pad-2')).toHaveAttribute('aria-pressed', 'true');
		expect(pad('pad-1')).toHaveAttribute('aria-pressed', 'false');
		expect(pad('pad-3')).toHaveAttribute('data-lit', 'true');
		expect(pad('pad-2')).toHaveAttribute('data-lit', 'false');
	});

	it('presses a pad on pointer down and releases it when that pointer lifts', async () => {
		const { onpress, onrelease, pad } = setup();
		await down(pad('pad-1'), 1);
		expect(onpress).toHaveBeenCalledWith('pad-1', 'screen', expect.any(Number));
		expect(onrelease).not.toHaveBeenCalled();
		await up(1);
		expect(onrelease).toHaveBeenCalledWith('pad-1', 'screen', expect.any(Number));
	});

	it('holds several pads with several fingers and lets go of each on its own', async () => {
		const { onpress, onrelease, pad } = setup();
		await down(pad('pad-1'), 11);
		await down(pad('pad-2'), 12);
		await down(pad('pad-3'), 13);
		expect(onpress.mock.calls.map((c) => c[0])).toEqual(['pad-1', 'pad-2', 'pad-3']);
		await up(12);
		expect(onrelease.mock.calls.map((c) => c[0])).toEqual(['pad-2']);
		await up(11);
		await up(13);
		expect(onrelease.mock.calls.map((c) => c[0])).toEqual(['pad-2', 'pad-1', 'pad-3']);
	});

	it('counts two fingers on one pad as one press until both lift', async () => {
		const { onpress, onrelease, pad } = setup();
		await down(pad('pad-5'), 1);
		await down(pad('pad-5'), 2);
		await up(1);
		expect(onpress).toHaveBeenCalledTimes(1);
		expect(onrelease).not.toHaveBeenCalled();
		await up(2);
		expect(onrelease).toHaveBeenCalledTimes(1);
	});

	it('releases a pad whose pointer is cancelled', async () => {
		const { onrelease, pad } = setup();
		await down(pad('pad-4'), 7);
		await fireEvent.pointerCancel(window, { pointerId: 7 });
		expect(onrelease).toHaveBeenCalledWith('pad-4', 'screen', expect.any(Number));
	});

	it('plays pads from the computer keyboard, ignoring auto-repeat', async () => {
		const { onpress, onrelease } = setup();
		await fireEvent.keyDown(window, { code: 'KeyZ', key: 'z' });
		await fireEvent.keyDown(window, { code: 'KeyZ', key: 'z', repeat: true });
		expect(onpress.mock.calls).toEqual([['pad-1', 'keyboard', expect.any(Number)]]);
		await fireEvent.keyUp(window, { code: 'KeyZ', key: 'z' });
		expect(onrelease.mock.calls).toEqual([['pad-1', 'keyboard', expect.any(Number)]]);
	});

	it('leaves keys alone while the user types in a field', async () => {
		const { onpress } = setup();
		const field = document.createElement('input');
		document.body.append(field);
		await fireEvent.keyDown(field, { code: 'KeyQ', key: 'q' });
		expect(onpress).not.toHaveBeenCalled();
		field.remove();
	});

	it('lets go of held keys when the window loses focus, so no pad sticks', async () => {
		const { onrelease } = setup();
		await fireEvent.keyDown(window, { code: 'KeyA', key: 'a' });
		await fireEvent.blur(window);
		// A is the first key of the third row of the block: pad-5 on the generic grid.
		expect(onrelease).toHaveBeenCalledWith('pad-5', 'keyboard', expect.any(Number));
	});

	it('plays a focused pad with Space', async () => {
		const { onpress, onrelease, pad } = setup();
		await fireEvent.keyDown(pad('pad-16'), { key: ' ', code: 'Space' });
		expect(onpress).toHaveBeenCalledWith('pad-16', 'keyboard', expect.any(Number));
		await fireEvent.keyUp(pad('pad-16'), { key: ' ', code: 'Space' });
		expect(onrelease).toHaveBeenCalledWith('pad-16', 'keyboard', expect.any(Number));
	});

	it('takes no keys when the keyboard is turned off', async () => {
		const { onpress } = setup({ keys: null });
		await fireEvent.keyDown(window, { code: 'KeyZ', key: 'z' });
		expect(onpress).not.toHaveBeenCalled();
		expect(screen.getByRole('button', { name: 'Pad 1' })).toBeInTheDocument();
	});

	it('sends its presses through the same hub as MIDI, so a pad held on both is one press', async () => {
		const hub = new InputHub(GENERIC_4X4);
		const events: string[] = [];
		hub.subscribe((e) => events.push(`${e.type} ${e.input} ${e.source}`));
		const { pad } = setup({
			onpress: (input: string, source: string, t: number) => hub.press(source, input, t),
			onrelease: (input: string, source: string, t: number) => hub.release(source, input, t)
		});
		await down(pad('pad-1'), 1);
		hub.receiveMidi('midi:x', [0x90, 36, 100]); // MIDI 1.0 Note On ch 1, note 36 = pad-1
		await up(1);
		hub.receiveMidi('midi:x', [0x80, 36, 0]);
		expect(events).toEqual(['press pad-1 screen', 'release pad-1 midi:x']);
	});
});
