// Each glossary term carries its one line where it first appears on a screen: the studio's hold
// group field, the hold-group row dialog, the doctor's hold groups heading, and every finding badge
// on the replay page (a badge sits inside a button, so it carries the line without a second link).
import { beforeAll, describe, expect, it, vi } from 'vitest';
import { render, screen, within } from '@testing-library/svelte';
import BindingSettings from '$lib/components/studio/BindingSettings.svelte';
import DoctorPanel from '$lib/components/studio/DoctorPanel.svelte';
import HoldRowDialog from '$lib/components/studio/HoldRowDialog.svelte';
import FindingsList from '$lib/components/replay/FindingsList.svelte';
import { demoMapping } from '$lib/engine/demo';
import { FINDING_INFO, type Finding } from '$lib/engine';
import { glossaryEntry } from '$lib/glossary';
import { VerifyClient } from '$lib/verify/verify-client.svelte';

const HOLD_GROUP = glossaryEntry('hold group')!.line;

beforeAll(() => {
	// jsdom has <dialog> but not its modal methods.
	HTMLDialogElement.prototype.showModal ??= function (this: HTMLDialogElement) {
		this.open = true;
	};
	HTMLDialogElement.prototype.close ??= function (this: HTMLDialogElement) {
		this.open = false;
	};
});

/** The glossary link a term makes, checked for its anchor and its one-line description. */
function expectTermLink(name: string | RegExp, line: string) {
	const link = screen.getByRole('link', { name });
	expect(link).toHaveAttribute('href', '/help#hold-group');
	expect(link).toHaveAccessibleDescription(line);
	// The studio keeps unsaved work: the glossary opens beside it.
	expect(link).toHaveAttribute('target', '_blank');
	return link;
}

describe('hold group in the studio', () => {
	const mapping = demoMapping('two-deck');

	it('the binding settings label carries the line and still names its field', () => {
		render(BindingSettings, { binding: mapping.bindings[0], decks: 2, onchange: () => [] });
		expectTermLink('Hold group', HOLD_GROUP);
		expect(screen.getByRole('textbox', { name: /^Hold group/ })).toHaveAttribute('maxlength', '64');
	});

	it('the hold-group row dialog explains the term at its name field', () => {
		render(HoldRowDialog, { open: true, mapping, onwrite: vi.fn(() => []), onclose: vi.fn() });
		expectTermLink('Hold group', HOLD_GROUP);
		expect(screen.getByRole('textbox', { name: /^Hold group.* name$/ })).toBeInstanceOf(HTMLInputElement);
	});

	it('the doctor panel heading explains hold groups', () => {
		render(DoctorPanel, {
			mapping,
			verifier: new VerifyClient(() => {
				throw new Error('no proof is asked for here');
			}),
			onstep: vi.fn(),
			onreplay: vi.fn(),
			replaying: false
		});
		const heading = screen.getByRole('heading', { name: /Hold groups/ });
		expect(within(heading).getByRole('tooltip', { hidden: true })).toHaveTextContent(HOLD_GROUP);
		expectTermLink('Hold groups', HOLD_GROUP);
	});
});

describe('finding badges on the replay page', () => {
	const at = (kind: Finding['kind'], start: number): Finding => ({
		kind,
		start,
		end: start + 100,
		event: 0,
		binding: 0,
		input: 'pad-1',
		rack: 1,
		deck: 'A',
		counter: null,
		message: `something at ${start}`
	});

	it('each badge carries its kind’s glossary line, as the description of its button, with no link inside', () => {
		const kinds = Object.keys(FINDING_INFO) as Finding['kind'][];
		render(FindingsList, {
			title: 'Take',
			subtitle: 'v2',
			findings: kinds.map((k, i) => at(k, i * 1000)),
			selected: null,
			onSelect: () => {},
			testid: 'findings-original'
		});
		const buttons = screen.getAllByTestId('finding');
		expect(buttons).toHaveLength(kinds.length);
		buttons.forEach((button, i) => {
			const line = glossaryEntry(kinds[i])!.line;
			const term = within(button).getByTestId('term');
			expect(term).toHaveAttribute('data-term', glossaryEntry(kinds[i])!.id);
			expect(within(term).getByRole('tooltip', { hidden: true })).toHaveTextContent(line);
			expect(button).toHaveAccessibleDescription(line);
			expect(within(button).queryByRole('link')).toBeNull();
		});
	});
});
