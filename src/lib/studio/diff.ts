// The difference between two versions of a mapping, in plain words, by pad and by step. Pure: the
// server answers `GET /api/mappings/[id]/diff` with it and tests read it directly.
import type { Binding, Mapping } from '$lib/engine';
import { describeBinding, describeStepIn, padName } from './describe';

export interface DiffEntry {
	/** What the change is about: "the mapping", "racks", or a pad's name. */
	about: string;
	text: string;
}

const same = (a: unknown, b: unknown) => JSON.stringify(a) === JSON.stringify(b);

const SETTINGS: { key: keyof Binding; name: string }[] = [
	{ key: 'label', name: 'label' },
	{ key: 'intent', name: 'intent' },
	{ key: 'deck', name: 'target deck' },
	{ key: 'group', name: 'hold group' },
	{ key: 'quantize', name: 'quantize' },
	{ key: 'releaseAtOnce', name: 'release at once' },
	{ key: 'takeover', name: 'may take over' }
];

const shown = (v: unknown) => (v === undefined || v === '' ? 'none' : String(v));

function stepsDiff(about: string, a: Binding, b: Binding, out: DiffEntry[]) {
	const n = Math.max(a.steps.length, b.steps.length);
	for (let i = 0; i < n; i++) {
		const was = a.steps[i];
		const now = b.steps[i];
		if (was && now && same(was, now)) continue;
		if (!was) out.push({ about, text: `step ${i + 1} added: ${describeStepIn(b.steps, i)}` });
		else if (!now) out.push({ about, text: `step ${i + 1} removed: ${describeStepIn(a.steps, i)}` });
		else
			out.push({
				about,
				text: `step ${i + 1} changed from “${describeStepIn(a.steps, i)}” to “${describeStepIn(b.steps, i)}”`
			});
	}
}

export function diffMappings(from: Mapping, to: Mapping): DiffEntry[] {
	const out: DiffEntry[] = [];
	const doc = 'the mapping';
	if (from.name !== to.name) out.push({ about: doc, text: `renamed from “${from.name}” to “${to.name}”` });
	if (from.decks !== to.decks) out.push({ about: doc, text: `decks changed from ${from.decks} to ${to.decks}` });
	if (from.tempo !== to.tempo)
		out.push({ about: doc, text: `tempo changed from ${shown(from.tempo)} to ${shown(to.tempo)}` });
	if (!same(from.profile, to.profile)) out.push({ about: doc, text: `controller layout changed (${to.profile.name})` });
	const racks = Math.max(from.racks.length, to.racks.length);
	for (let r = 0; r < racks; r++) {
		const a = from.racks[r];
		const b = to.racks[r];
		if (!a) out.push({ about: 'racks', text: `rack ${r + 1} added: ${b.label}` });
		else if (!b) out.push({ about: 'racks', text: `rack ${r + 1} removed: ${a.label}` });
		else if (!same(a, b)) out.push({ about: 'racks', text: `rack ${r + 1} renamed from “${a.label}” to “${b.label}”` });
	}
	for (const c of to.counters) {
		const old = from.counters.find((x) => x.id === c.id);
		if (!old) out.push({ about: 'counters', text: `counter ${c.id} added (0 to ${c.max})` });
		else if (!same(old, c))
			out.push({ about: 'counters', text: `counter ${c.id} changed (0 to ${c.max}, rests at ${c.rest})` });
	}
	for (const c of from.counters)
		if (!to.counters.some((x) => x.id === c.id)) out.push({ about: 'counters', text: `counter ${c.id} removed` });
	const inputs = [...new Set([...from.bindings.map((b) => b.input), ...to.bindings.map((b) => b.input)])];
	for (const input of inputs) {
		const a = from.bindings.find((b) => b.input === input);
		const b = to.bindings.find((x) => x.input === input);
		const about = padName(b ? to : from, input);
		if (!a && b) out.push({ about, text: `now set up: ${describeBinding(b, to).text}` });
		else if (a && !b) out.push({ about, text: `cleared (was: ${describeBinding(a, from).text})` });
		else if (a && b && !same(a, b)) {
			for (const { key, name } of SETTINGS)
				if (!same(a[key], b[key]))
					out.push({ about, text: `${name} changed from ${shown(a[key])} to ${shown(b[key])}` });
			stepsDiff(about, a, b, out);
		}
	}
	return out;
}
