import { describe, expect, it } from 'vitest';
import { fireEvent, render, screen } from '@testing-library/svelte';
import { applyEvents, demoMapping, lintMapping, type Finding } from '$lib/engine';
import LintPanel from '$lib/components/rehearse/LintPanel.svelte';
import LiveFindingsPanel from '$lib/components/rehearse/LiveFindingsPanel.svelte';
import RackCard from '$lib/components/rehearse/RackCard.svelte';

// Demo two-deck mapping (src/lib/engine/demo.ts): pad-5 is Echo B — rack 1 in focus mode, routed
// to deck B and away from A, mix 0.5.
const twoDeck = demoMapping('two-deck');

const dropout: Finding & { pad: string } = {
	kind: 'dropout',
	start: 250,
	end: null,
	event: 2,
	binding: 13,
	input: 'pad-14',
	deck: 'A',
	rack: 2,
	counter: null,
	message: 'release of Pad 13 at 0.250 s turned rack 2 off while Pad 14 was held',
	pad: 'Stutter 1/8 (Pad 14)'
};

describe('RackCard', () => {
	it('shows a rack live: on, mode, mix, and the deck it is heard on', () => {
		const state = applyEvents(twoDeck, [{ t: 0, input: 'pad-5', type: 'press' }]);
		render(RackCard, { state, rack: 1, decks: 2 });
		expect(screen.getByTestId('rack-1')).toHaveAttribute('data-audible', 'B');
		expect(screen.getByTestId('rack-1-on')).toHaveTextContent('on');
		expect(screen.getByTestId('rack-1-mode')).toHaveTextContent('focus');
		expect(screen.getByTestId('rack-1-mix')).toHaveTextContent('50%');
		expect(screen.getByTestId('rack-1-route-B')).toHaveAttribute('data-routed', 'true');
		expect(screen.getByTestId('rack-1-route-A')).toHaveAttribute('data-routed', 'false');
		expect(screen.getByText('echo')).toBeInTheDocument();
	});
});

describe('LiveFindingsPanel', () => {
	it('names the pad and deck of a dropout while it lasts', () => {
		render(LiveFindingsPanel, { open: [dropout], closed: [] });
		const item = screen.getByTestId('live-finding');
		expect(item).toHaveTextContent('dropout');
		expect(item).toHaveTextContent('Stutter 1/8 (Pad 14)');
		expect(item).toHaveTextContent('deck A');
		expect(item).toHaveTextContent(dropout.message);
	});

	it('moves an ended finding to the run’s history', () => {
		render(LiveFindingsPanel, { open: [], closed: [{ ...dropout, end: 400 }] });
		expect(screen.queryByTestId('live-finding')).toBeNull();
		expect(screen.getByTestId('no-live-finding')).toBeInTheDocument();
		expect(screen.getByTestId('findings-total')).toHaveTextContent('1 this run');
		expect(screen.getByTestId('past-finding')).toHaveTextContent('0.250 s–0.400 s');
	});
});

describe('LintPanel', () => {
	it('keeps the mapping check folded until opened', async () => {
		const findings = lintMapping(demoMapping('broken-row'));
		render(LintPanel, { findings });
		expect(screen.getByTestId('lint-count')).toHaveTextContent(String(findings.length));
		const panel = screen.getByTestId('lint-panel') as HTMLDetailsElement;
		expect(panel.open).toBe(false);
		await fireEvent.click(panel.querySelector('summary')!);
		expect(panel.open).toBe(true);
		expect(screen.getAllByTestId('lint-finding')[0]).toHaveTextContent('legato-without-counter');
	});
});
