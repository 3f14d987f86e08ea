import { fireEvent, render, screen } from '@testing-library/svelte';
import { beforeAll, describe, expect, it, vi } from 'vitest';
import TimelinePlot from '$lib/components/replay/TimelinePlot.svelte';
import { buildReplay } from '$lib/replay/model';
import { fullView } from '$lib/replay/plot-scale';
import { brokenRow, chord, sessionOf, twoDeck } from '../replay/factories';

beforeAll(() => {
	// jsdom has no layout: the plot's width binding needs a ResizeObserver that does nothing.
	vi.stubGlobal(
		'ResizeObserver',
		class {
			observe() {}
			unobserve() {}
			disconnect() {}
		}
	);
});

function props(model = buildReplay(brokenRow(), sessionOf(chord()))) {
	return {
		model,
		view: fullView(model.duration),
		cursor: 1200,
		selected: null,
		causing: null,
		onSeek: vi.fn(),
		onView: vi.fn(),
		onFinding: vi.fn()
	};
}

describe('TimelinePlot', () => {
	it('draws a lane per pad touched, an audible lane per rack and deck, and the finding', () => {
		render(TimelinePlot, props());
		expect(screen.getAllByTestId('pad-lane').map((l) => l.dataset.input)).toEqual(['pad-13', 'pad-14']);
		expect(screen.getAllByTestId('audible-lane').map((l) => `${l.dataset.rack}${l.dataset.deck}`)).toEqual(['2A']);
		const mark = screen.getByTestId('finding-mark');
		expect(mark.dataset.kind).toBe('dropout');
		expect(Number(mark.dataset.start)).toBe(1500.25);
		expect(screen.getByTestId('plot-cursor').dataset.t).toBe('1200');
	});

	it('draws the held counter of a legato row and no finding marks when there are none', () => {
		render(TimelinePlot, props(buildReplay(twoDeck(), sessionOf(chord()))));
		expect(screen.getByTestId('counter-lane').dataset.counter).toBe('held');
		expect(screen.queryAllByTestId('finding-mark')).toHaveLength(0);
	});

	it('hands a click on a finding mark back as that finding', async () => {
		const p = props();
		render(TimelinePlot, p);
		await fireEvent.click(screen.getByTestId('finding-mark'));
		expect(p.onFinding).toHaveBeenCalledWith(0);
	});

	it('marks the causing event on its pad lane', () => {
		render(TimelinePlot, { ...props(), causing: { t: 1500.25, input: 'pad-13' } });
		const mark = screen.getByTestId('causing-mark');
		expect(mark.dataset.t).toBe('1500.25');
		expect(mark.closest('[data-testid="pad-lane"]')).toHaveAttribute('data-input', 'pad-13');
	});
});
