import { describe, expect, it } from 'vitest';
import { fireEvent, render, screen } from '@testing-library/svelte';
import { applyEvents, demoMapping, lintMapping, type Finding } from '$lib/engine';
import LintPanel from '$lib/components/rehearse/LintPanel.svelte';
import LiveFindingsPanel from '$lib/components/rehearse/LiveFindingsPanel.svelte';
import RackCard from '$lib/components/rig/RackCard.svelte';

// Demo two-deck mapping (src/lib/engine/demo.ts): pad-5 is Echo B — rack 1 ("One-press pads")
// loads a chain of one echo at 1/8, feedback 0.45, tone 0.6, routed to deck B and away from A, mix 0.5.
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
	it('shows a rack live: label, on, mix, and the deck it is heard on', () => {
		const state = applyEvents(twoDeck, [{ t: 0, input: 'pad-5', type: 'press' }]);
		render(RackCard, { state, rack: 1, label: 'One-press pads', decks: 2 });
		expect(screen.getByTestId('rack-1')).toHaveAttribute('data-audible', 'B');
		expect(screen.getByRole('heading')).toHaveTextContent('One-press pads');
		expect(screen.getByTestId('rack-1-on')).toHaveTextContent('on');
		expect(screen.getByTestId('rack-1-mix')).toHaveTextContent('50%');
		expect(screen.getByTestId('rack-1-route-B')).toHaveAttribute('data-routed', 'true');
		expect(screen.getByTestId('rack-1-route-A')).toHaveAttribute('data-routed', 'false');
	});

	it("names each chain position's parameters with the catalog labels, units and divisions", () => {
		const state = applyEvents(twoDeck, [{ t: 0, input: 'pad-5', type: 'press' }]);
		render(RackCard, { state, rack: 1, label: 'One-press pads', decks: 2 });
		const echo = screen.getByTestId('rack-1-position-1');
		expect(echo).toHaveAttribute('data-effect', 'echo');
		expect(echo).toHaveTextContent('Echo');
		// engine/effects.ts: echo's parameters are Time (beat-synced), Feedback (0..1) and Tone,
		// 500 Hz–12 kHz exponential: 0.6 → 500 × 24^0.6 = 3.37 kHz.
		expect(echo).toHaveTextContent(/Time\s*1\/8/);
		expect(screen.getByTestId('rack-1-position-1-param-2')).toHaveTextContent('45 %');
		expect(screen.getByTestId('rack-1-position-1-param-3')).toHaveTextContent('3.4 kHz');
		expect(echo).toHaveTextContent('Feedback');
		expect(echo).toHaveTextContent('Tone');
		expect(screen.queryByTestId('rack-1-position-2')).toBeNull(); // a chain of one
	});

	it('shows a chain of several effects in order, an off position marked off', () => {
		const state = applyEvents(twoDeck, []);
		const rack = state.racks[0];
		const chain = [...rack.chain];
		chain[0] = { effect: 'filter', on: true, params: [0.5, 0.3, 0] };
		chain[1] = { effect: 'gate', on: false, params: [0.75, 1, 0.3] };
		const racks = [{ ...rack, chain }, state.racks[1]];
		render(RackCard, { state: { ...state, racks }, rack: 1, decks: 2 });
		expect(screen.getByRole('heading')).toHaveTextContent('Rack 1');
		expect(screen.getByTestId('rack-1-position-1')).toHaveTextContent('Cutoff');
		expect(screen.getByTestId('rack-1-position-1')).toHaveTextContent('Resonance');
		expect(screen.getByTestId('rack-1-position-2')).toHaveAttribute('data-on', 'false');
		expect(screen.getByTestId('rack-1-position-2')).toHaveTextContent('Gate · off');
		expect(screen.getByTestId('rack-1-position-2')).toHaveTextContent('Rate');
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
