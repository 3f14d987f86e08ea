import { render, screen } from '@testing-library/svelte';
import userEvent from '@testing-library/user-event';
import { describe, expect, it, vi } from 'vitest';
import FindingsList from '$lib/components/replay/FindingsList.svelte';
import { buildReplay } from '$lib/replay/model';
import { brokenRow, chord, sessionOf } from '../replay/factories';

const findings = () => buildReplay(brokenRow(), sessionOf(chord())).findings;

describe('FindingsList', () => {
	it('says plainly when there are no findings', () => {
		render(FindingsList, {
			title: 'Two-deck pad set',
			subtitle: 'v1',
			findings: [],
			selected: null,
			onSelect: () => {},
			testid: 'findings-against'
		});
		expect(screen.getByTestId('no-findings')).toHaveTextContent('No findings');
		expect(screen.queryAllByTestId('finding')).toHaveLength(0);
		expect(screen.getByTestId('finding-count')).toHaveTextContent('0');
	});

	it('lists each finding in plain words with its time, and reports a click', async () => {
		const onSelect = vi.fn();
		render(FindingsList, {
			title: 'Broken stutter row',
			subtitle: 'v1',
			findings: findings(),
			selected: null,
			onSelect,
			testid: 'findings-original'
		});
		const item = screen.getByTestId('finding');
		expect(item).toHaveTextContent('Dropout');
		expect(item).toHaveTextContent('1.500 s');
		expect(item).toHaveTextContent('release of Pad 13 at 1.500 s turned rack 2 off while Pad 14 was held');
		await userEvent.click(item);
		expect(onSelect).toHaveBeenCalledWith(0);
	});

	it('marks the selected finding as pressed', () => {
		render(FindingsList, {
			title: 'Broken stutter row',
			subtitle: 'v1',
			findings: findings(),
			selected: 0,
			onSelect: () => {},
			testid: 'f'
		});
		expect(screen.getByTestId('finding')).toHaveAttribute('aria-pressed', 'true');
	});
});
