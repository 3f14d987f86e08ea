import { fireEvent, render, screen } from '@testing-library/svelte';
import { describe, expect, it } from 'vitest';
import DrillEditor from '$lib/components/drills/DrillEditor.svelte';
import { MAX_DRILL_BARS, parseDrill, type DrillDocument } from '$lib/engine';

const mappings = [
	{
		id: 'm1',
		name: 'Two-deck pad set',
		version: 2,
		tempo: 120,
		pads: [1, 2, 3, 4].map((n) => ({ id: `pad-${n}`, label: `Pad ${n}` })),
		versions: [
			{ id: 'v1', version: 1, createdAt: '2026-11-01T10:00:00.000Z' },
			{ id: 'v2', version: 2, createdAt: '2026-11-20T10:00:00.000Z' }
		]
	}
];
const long: DrillDocument = {
	version: 1,
	name: 'Long one',
	tempo: 120,
	countInBars: 1,
	lengthBars: MAX_DRILL_BARS,
	windowMs: 60,
	targets: [
		{ input: 'pad-1', beat: 0, beats: 1 },
		{ input: 'pad-1', beat: (MAX_DRILL_BARS - 1) * 4, beats: 1 }
	],
	pass: { hitRate: 0.9, findings: 0 }
};

describe('DrillEditor', () => {
	it('allows as many bars as a drill file may have, and no more', () => {
		expect(parseDrill({ ...long, lengthBars: MAX_DRILL_BARS }).ok).toBe(true);
		expect(parseDrill({ ...long, lengthBars: MAX_DRILL_BARS + 1 }).ok).toBe(false);
		render(DrillEditor, { mappings, problem: null, submitLabel: 'Create drill' });
		expect(screen.getByLabelText('Length (bars)')).toHaveAttribute('max', String(MAX_DRILL_BARS));
	});

	it('shows a long drill a page of bars at a time, to its last bar', async () => {
		render(DrillEditor, { mappings, initial: long, mappingId: 'm1', problem: null, submitLabel: 'Save drill' });
		expect(screen.getByLabelText('Bars')).toHaveDisplayValue('1–16');
		expect(screen.getByTestId('grid-pages')).toHaveTextContent(`of ${MAX_DRILL_BARS}`);
		expect(screen.getAllByTestId('drill-target')).toHaveLength(1);
		// 16 bars of half beats in the one lane used, less the press's own two cells.
		expect(screen.getAllByTestId('drill-cell')).toHaveLength(16 * 8 - 2);
		const later = screen.getByRole('button', { name: 'Later bars' });
		await fireEvent.click(later);
		expect(screen.getByLabelText('Bars')).toHaveDisplayValue('17–32');
		expect(screen.queryAllByTestId('drill-target')).toHaveLength(0);
		await fireEvent.change(screen.getByLabelText('Bars'), { target: { value: String(MAX_DRILL_BARS / 16 - 1) } });
		expect(screen.getByLabelText('Bars')).toHaveDisplayValue(`${MAX_DRILL_BARS - 15}–${MAX_DRILL_BARS}`);
		expect(later).toBeDisabled();
		expect(
			screen.getByRole('button', { name: `Pad 1 at beat ${(MAX_DRILL_BARS - 1) * 4 + 1}, 1 beats long` })
		).toBeTruthy();
		expect(screen.getByTestId('drill-summary')).toHaveTextContent(`2 target presses over ${MAX_DRILL_BARS} bars`);
	});
});
