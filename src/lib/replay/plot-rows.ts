// The plot's rows, top to bottom: findings, one lane per input touched, one audible lane per
// rack × deck, one step lane per counter. Heights are fixed per kind so the plot reads the same
// from session to session.
import type { ReplayModel } from './model';

export type RowKind = 'findings' | 'pad' | 'audible' | 'counter';

export interface PlotRow {
	kind: RowKind;
	key: string;
	label: string;
	detail: string | null;
	y: number;
	height: number;
	/** The first row of a group draws the group's heading above it. */
	heading: string | null;
}

export const AXIS_HEIGHT = 24;
export const BAR_ROW_HEIGHT = 18;
const HEIGHT: Record<RowKind, number> = { findings: 30, pad: 26, audible: 22, counter: 40 };
const GROUP_GAP = 18;

export function plotRows(model: ReplayModel): { rows: PlotRow[]; height: number } {
	const rows: PlotRow[] = [];
	let y = AXIS_HEIGHT;
	const add = (kind: RowKind, key: string, label: string, detail: string | null, heading: string | null) => {
		if (heading) y += GROUP_GAP;
		rows.push({ kind, key, label, detail, y, height: HEIGHT[kind], heading });
		y += HEIGHT[kind];
	};
	if (model.mapping) add('findings', 'findings', 'Findings', `${model.findings.length}`, null);
	model.pads.forEach((p, i) => add('pad', `pad:${p.input}`, p.label, p.detail, i === 0 ? 'Pads held' : null));
	model.audible.forEach((a, i) =>
		add('audible', `audible:${a.key}`, `Rack ${a.rack} → deck ${a.deck}`, null, i === 0 ? 'Audible' : null)
	);
	model.counters.forEach((c, i) =>
		add('counter', `counter:${c.id}`, c.label, `peak ${c.peak}`, i === 0 ? 'Counters' : null)
	);
	return { rows, height: y + BAR_ROW_HEIGHT };
}
