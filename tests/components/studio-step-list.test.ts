// The step list inside the pad editor, driven against a real MappingEditor: duplicate, delete and
// reorder (keyboard and drag) change the saved document, not only the screen.
import { describe, expect, it, vi } from 'vitest';
import { fireEvent, render, screen, waitFor, within } from '@testing-library/svelte';
import userEvent from '@testing-library/user-event';
import PadEditor from '$lib/components/studio/PadEditor.svelte';
import { demoMapping, type Mapping, type Step } from '$lib/engine';
import { MappingEditor, type Saver } from '$lib/studio/mapping-editor.svelte';

vi.setConfig({ testTimeout: 20_000 });

const STEPS: Step[] = [
	{ target: { kind: 'rack-mix', rack: 1 }, action: 'set', value: 0.5 },
	{ target: { kind: 'rack-route', rack: 1, deck: 'A' }, action: 'set', value: 1 },
	{ target: { kind: 'rack-on', rack: 1 }, action: 'momentary' }
];
const MIX = 'mix of rack 1 50 %';
const ROUTE = 'route of rack 1 to deck A';
const ON = 'switch rack 1 on';

function setup() {
	const base = demoMapping('two-deck');
	const doc: Mapping = {
		...base,
		bindings: base.bindings.map((b) => (b.input === 'pad-1' ? { ...b, steps: structuredClone(STEPS) } : b))
	};
	const save: Saver = async (_d, v) => ({ ok: true, version: v + 1 });
	const editor = new MappingEditor(doc, 1, save, 60_000);
	const onstep = vi.fn();
	render(PadEditor, { editor, input: 'pad-1', step: null, onstep, onbuild: () => {} });
	const rows = () => screen.getAllByTestId('step-row');
	const texts = () => rows().map((r) => within(r).getAllByRole('button')[0].textContent);
	const saved = () => editor.binding('pad-1')!.steps;
	return { editor, onstep, rows, texts, saved, user: userEvent.setup() };
}

describe('the step list', () => {
	it('duplicates a step right after itself', async () => {
		const { rows, texts, saved, user, editor } = setup();
		await user.click(within(rows()[1]).getByRole('button', { name: /^Duplicate/ }));
		expect(texts()).toEqual([`Step 1: ${MIX}`, `Step 2: ${ROUTE}`, `Step 3: ${ROUTE}`, `Step 4: ${ON}`]);
		expect(saved()).toEqual([STEPS[0], STEPS[1], STEPS[1], STEPS[2]]);
		expect(editor.state).toBe('unsaved');
		editor.undo();
		expect(saved()).toEqual(STEPS);
	});

	it('deletes a step and closes the step form', async () => {
		const { rows, texts, saved, user, onstep } = setup();
		await user.click(within(rows()[0]).getByRole('button', { name: /^Delete/ }));
		expect(texts()).toEqual([`Step 1: ${ROUTE}`, `Step 2: ${ON}`]);
		expect(saved()).toEqual([STEPS[1], STEPS[2]]);
		expect(onstep).toHaveBeenLastCalledWith(null);
	});

	it('moves a step down with Alt+↓ and up with Alt+↑, keeping the keyboard on it', async () => {
		const { texts, saved, user } = setup();
		screen.getByRole('button', { name: `Step 1: ${MIX}` }).focus();
		await user.keyboard('{Alt>}{ArrowDown}{/Alt}');
		expect(texts()).toEqual([`Step 1: ${ROUTE}`, `Step 2: ${MIX}`, `Step 3: ${ON}`]);
		expect(saved()).toEqual([STEPS[1], STEPS[0], STEPS[2]]);
		expect(screen.getByText('Step 1 moved to place 2.')).toBeInTheDocument();
		await waitFor(() => expect(document.activeElement).toBe(screen.getByRole('button', { name: `Step 2: ${MIX}` })));

		await user.keyboard('{Alt>}{ArrowDown}{/Alt}');
		expect(saved()).toEqual([STEPS[1], STEPS[2], STEPS[0]]);
		// The last step goes no further down; without Alt the arrows do nothing.
		await waitFor(() => expect(document.activeElement).toBe(screen.getByRole('button', { name: `Step 3: ${MIX}` })));
		await user.keyboard('{Alt>}{ArrowDown}{/Alt}');
		await user.keyboard('{ArrowUp}');
		expect(saved()).toEqual([STEPS[1], STEPS[2], STEPS[0]]);
		await user.keyboard('{Alt>}{ArrowUp}{/Alt}');
		expect(saved()).toEqual([STEPS[1], STEPS[0], STEPS[2]]);
	});

	it('moves a step by dragging it onto another one', async () => {
		const { rows, texts, saved } = setup();
		await fireEvent.dragStart(rows()[2]);
		await fireEvent.dragOver(rows()[0]);
		expect(rows()[0].className).toContain('ring-2');
		await fireEvent.drop(rows()[0]);
		expect(texts()).toEqual([`Step 1: ${ON}`, `Step 2: ${MIX}`, `Step 3: ${ROUTE}`]);
		expect(saved()).toEqual([STEPS[2], STEPS[0], STEPS[1]]);
		expect(rows().some((r) => r.className.includes('ring-2'))).toBe(false);

		// A drop without a drag that started in the list changes nothing.
		await fireEvent.drop(rows()[1]);
		expect(saved()).toEqual([STEPS[2], STEPS[0], STEPS[1]]);
	});
});
