// Version 1 mapping documents upgrade to version 2 with the same audible timeline and findings
// (DESIGN.md §4, "Documents carry a version"). The version 1 engine is kept in ./v1-oracle as it
// stood before the change; both sides share the version 2 schedule, so only step semantics differ.
import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { analyze, clockFor, parseMapping, replay, scheduleEvents, type InputEvent, type Mapping } from '$lib/engine';
import { upgradeNotes, type MappingV1 } from '$lib/engine/upgrade';
import { analyze as analyzeV1 } from './v1-oracle/analyze';
import { replay as replayV1 } from './v1-oracle/replay';
import type { Mapping as OracleMapping } from './v1-oracle/types';

const demos = JSON.parse(readFileSync(new URL('./fixtures/v1-demos.json', import.meta.url), 'utf8')) as Record<
	string,
	MappingV1
>;

function upgraded(v1: MappingV1): Mapping {
	const r = parseMapping(v1);
	if (!r.ok) throw new Error(`upgrade refused: ${JSON.stringify(r.problems.slice(0, 3))}`);
	return r.mapping;
}

const schedule = (m: Mapping) => (events: readonly InputEvent[]) => scheduleEvents(m, events, clockFor(m));

// Finding kinds were renamed to plain words with version 2; the oracle speaks the old names.
const KIND: Record<string, string> = {
	leak: 'bleed',
	drift: 'count-left-over',
	clamp: 'count-overflow',
	stuck: 'stuck-on'
};
const plainKind = (k: string) => KIND[k] ?? k;

function compare(v1: MappingV1, events: InputEvent[], withFindings = true) {
	const v2 = upgraded(v1);
	const old = replayV1(v1 as unknown as OracleMapping, events, { schedule: schedule(v2) });
	const now = replay(v2, events);
	expect(now.audible).toEqual(old.audible);
	// Steps move when the upgrade rewrites them, so a clamp names its step in the new document.
	const where = ({ step: _s, ...rest }: { step: number }) => rest;
	expect(now.clamps.map(where)).toEqual(old.clamps.map(where));
	for (const c of now.clamps)
		expect(v2.bindings[c.binding].steps[c.step].target).toEqual({ kind: 'counter', counter: c.counter });
	expect(now.order).toEqual(old.order);
	expect(now.final.counters).toEqual(old.final.counters);
	expect(now.final.held).toEqual(old.final.held);
	if (!withFindings) return;
	const f1 = analyzeV1(v1 as unknown as OracleMapping, events, { schedule: schedule(v2) }).map((f) => ({
		kind: plainKind(f.kind),
		start: f.start,
		end: f.end,
		event: f.event,
		rack: f.rack,
		deck: f.deck
	}));
	// Takeover is a finding version 2 added (DESIGN §4.6: another pad changes or cuts a rack a latched
	// pad holds on); the version 1 rules had no such finding, so it is compared apart from the rest:
	// each one must be about a rack that a latched pad of the document drives.
	const all = analyze(v2, events);
	const latchedRacks = new Set(
		v2.bindings
			.filter((b) => b.intent === 'latched')
			.flatMap((b) => b.steps.flatMap((st) => ('rack' in st.target ? [st.target.rack] : [])))
	);
	for (const t of all.filter((f) => f.kind === 'takeover')) expect(latchedRacks).toContain(t.rack);
	const f2 = all
		.filter((f) => f.kind !== 'takeover')
		.map((f) => ({
			kind: plainKind(f.kind),
			start: f.start,
			end: f.end,
			event: f.event,
			rack: f.rack,
			deck: f.deck
		}));
	expect(f2).toEqual(f1);
}

// A take on the demo grid: fingers on and off several pads, overlapping.
function take(pads: string[], seed: number): InputEvent[] {
	const events: InputEvent[] = [];
	let t = 0;
	let x = seed;
	const next = () => (x = (x * 1103515245 + 12345) % 2147483648) / 2147483648;
	const held = new Set<string>();
	for (let i = 0; i < 200; i++) {
		t += Math.round(next() * 180);
		const pad = pads[Math.floor(next() * pads.length)];
		const type = held.has(pad) ? 'release' : 'press';
		if (type === 'press') held.add(pad);
		else held.delete(pad);
		events.push({ t, input: pad, type });
	}
	return events;
}

describe('version 1 demo mappings', () => {
	it.each(Object.keys(demos))(
		'%s upgrades to a valid version 2 document with one declared rack per old rack',
		(slug) => {
			const v2 = upgraded(demos[slug]);
			expect(v2.version).toBe(2);
			expect(v2.racks).toHaveLength(4);
			expect(upgradeNotes(demos[slug])).toEqual([]);
		}
	);

	it.each(Object.keys(demos))("%s: the builders' one-press pads load their chain in one step", (slug) => {
		const v2 = upgraded(demos[slug]);
		for (const b of v2.bindings) expect(b.steps.filter((s) => s.target.kind === 'chain')).toHaveLength(1);
	});

	it.each(Object.keys(demos))('%s replays a long take with the same audible timeline and findings', (slug) => {
		const pads = demos[slug].profile.inputs.map((i) => i.id);
		for (const seed of [1, 2, 3]) compare(demos[slug], take(pads, seed));
	});

	it('keeps the broken row broken: the dropout is found at the same press', () => {
		const ev: InputEvent[] = [
			{ t: 0, input: 'pad-13', type: 'press' },
			{ t: 100, input: 'pad-14', type: 'press' },
			{ t: 200, input: 'pad-13', type: 'release' }
		];
		const v2 = upgraded(demos['broken-row']);
		const dropout = analyze(v2, ev).find((f) => f.kind === 'dropout');
		expect(dropout).toMatchObject({ start: 200, event: 2 });
		compare(demos['broken-row'], ev);
	});
});

// ---- random version 1 documents inside the upgrade's contract (upgrade.ts header) ----

const PADS = ['p1', 'p2', 'p3', 'p4'];
const EFFECTS = ['echo', 'reverb', 'filter', 'stutter', 'gate'] as const;
const guard = fc.option(
	fc.record({
		counter: fc.constantFrom('c1', 'c2'),
		op: fc.constantFrom('=', '!=', '<', '>='),
		value: fc.integer({ min: 0, max: 2 })
	}),
	{ nil: undefined }
);
const phase = fc.constantFrom(undefined, 'press', 'release');

/** Steps for a rack used in one style: chain (any slot, never focus) or focus (slot 1 only). */
function stepFor(style: 'chain' | 'focus', rack: number) {
	const slot = style === 'focus' ? fc.constant(1) : fc.integer({ min: 1, max: 3 });
	const sw = fc.constantFrom(
		{ action: 'momentary' },
		{ action: 'toggle' },
		{ action: 'set', value: 1 },
		{ action: 'set', value: 0 }
	);
	const target = fc.oneof(
		sw.map((a) => ({ target: { kind: 'rack-on', rack }, ...a })),
		fc.constantFrom(0, 0.5, 1).map((value) => ({ target: { kind: 'rack-mix', rack }, action: 'set', value })),
		fc.tuple(fc.constantFrom('A', 'B'), sw).map(([deck, a]) => ({ target: { kind: 'rack-route', rack, deck }, ...a })),
		(style === 'focus' ? fc.constantFrom('focus', 'chain') : fc.constant('chain')).map((value) => ({
			target: { kind: 'rack-mode', rack },
			action: 'set',
			value
		})),
		fc
			.tuple(slot, fc.constantFrom(...EFFECTS, null))
			.map(([s, value]) => ({ target: { kind: 'slot-effect', rack, slot: s }, action: 'set', value })),
		fc.tuple(slot, sw).map(([s, a]) => ({ target: { kind: 'slot-on', rack, slot: s }, ...a })),
		fc
			.tuple(slot, fc.constantFrom(0.2, 0.8))
			.map(([s, value]) => ({ target: { kind: 'slot-amount', rack, slot: s }, action: 'set', value })),
		fc
			.tuple(fc.integer({ min: 1, max: 3 }), fc.constantFrom(0.1, 0.9))
			.map(([param, value]) => ({ target: { kind: 'focus-param', rack, param }, action: 'set', value })),
		fc.constantFrom(
			{ target: { kind: 'counter', counter: 'c1' }, action: 'count-up' },
			{ target: { kind: 'counter', counter: 'c1' }, action: 'count-down' },
			{ target: { kind: 'counter', counter: 'c2' }, action: 'reset' },
			{ target: { kind: 'deck-play', deck: 'B' }, action: 'toggle' }
		)
	);
	return fc.tuple(target, phase, guard).map(([s, ph, g]) => {
		const step: Record<string, unknown> = { ...s };
		// Momentary and toggle ignore phase; count and set steps honour it.
		if (ph && s.action !== 'momentary' && s.action !== 'toggle') step.phase = ph;
		if (g) step.guards = [g];
		return step;
	});
}

/** The focus pattern the version 1 builders wrote, so the chain-load rewrite is exercised too. */
const focusPad = (rack: number) =>
	fc.constantFrom(...EFFECTS).map((fx) => [
		{ target: { kind: 'rack-mode', rack }, action: 'set', value: 'focus' },
		{ target: { kind: 'slot-effect', rack, slot: 1 }, action: 'set', value: fx },
		{ target: { kind: 'slot-on', rack, slot: 1 }, action: 'set', value: 1 },
		{ target: { kind: 'rack-on', rack }, action: 'momentary' }
	]);

const styles = fc.tuple(fc.constantFrom('chain', 'focus'), fc.constantFrom('chain', 'focus'));

const mappingV1 = styles.chain(([s1, s2]) => {
	const steps = fc.oneof(stepFor(s1, 1), stepFor(s2, 2));
	const padSteps = fc.oneof(
		{ weight: 4, arbitrary: fc.array(steps, { minLength: 1, maxLength: 6 }) },
		{
			weight: 1,
			arbitrary:
				s1 === 'focus'
					? fc.tuple(focusPad(1), fc.array(steps, { maxLength: 2 })).map(([a, b]) => [...a, ...b])
					: fc.array(steps, { minLength: 1, maxLength: 3 })
		}
	);
	return fc
		.tuple(
			fc.array(padSteps, { minLength: 4, maxLength: 4 }),
			fc.array(fc.constantFrom(undefined, 'while-held', 'latched'), { minLength: 4, maxLength: 4 }),
			fc.array(fc.constantFrom(undefined, 'A', 'B'), { minLength: 4, maxLength: 4 }),
			fc.array(fc.constantFrom(undefined, 'off', '1/16'), { minLength: 4, maxLength: 4 }),
			fc.constantFrom(
				{ kind: 'rack-mix', rack: 1 },
				{ kind: 'slot-amount', rack: 2, slot: 1 },
				{ kind: 'focus-param', rack: 1, param: 2 }
			)
		)
		.map(
			([stepLists, intents, decks, quantize, knob]): MappingV1 =>
				({
					version: 1,
					name: 'random',
					decks: 2,
					tempo: 120,
					profile: {
						name: 'grid',
						inputs: [
							...PADS.map((id, i) => ({ id, kind: 'pad', channel: 1, note: 36 + i })),
							{ id: 'k1', kind: 'knob', channel: 1, cc: 20 }
						]
					},
					counters: [
						{ id: 'c1', max: 3, rest: 0 },
						{ id: 'c2', max: 15, rest: 0 }
					],
					bindings: [
						...PADS.map((input, i) => ({
							input,
							...(intents[i] && { intent: intents[i] }),
							...(decks[i] && { deck: decks[i] }),
							...(quantize[i] && { quantize: quantize[i] }),
							...(i < 2 && { group: 'g' }),
							steps: stepLists[i]
						})),
						{ input: 'k1', steps: [{ target: knob, action: 'set' }] }
					]
				}) as unknown as MappingV1
		);
});

const events = fc
	.array(
		fc.tuple(
			fc.integer({ min: 0, max: 400 }),
			fc.constantFrom(...PADS, 'k1'),
			fc.boolean(),
			fc.constantFrom(0, 0.4, 1)
		),
		{ maxLength: 30 }
	)
	.map((list) => {
		let t = 0;
		return list.map(([dt, input, down, value]): InputEvent => {
			t += dt;
			if (input === 'k1') return { t, input, type: 'turn', value };
			return { t, input, type: down ? 'press' : 'release' };
		});
	});

describe('random version 1 documents', () => {
	it('upgrade to valid version 2 documents with the same audible timeline, counters and clamps', () => {
		fc.assert(
			fc.property(mappingV1, events, (m, ev) => {
				fc.pre(upgradeNotes(m).length === 0);
				compare(m, ev, false);
			}),
			{ numRuns: 3000 }
		);
	}, 300_000);

	// Knob turns and latched pads included. The oracle already reads rack ownership as version 2 does
	// (DESIGN §4.6: a turn changes values, never who owns a rack; see v1-oracle/rig.ts), so a turn
	// may neither hide nor end a finding on either side; the one difference by design, takeover, is
	// set apart in compare().
	it('upgrade with the same findings, knob turns and latched pads included', () => {
		fc.assert(
			fc.property(mappingV1, events, (m, ev) => {
				fc.pre(upgradeNotes(m).length === 0);
				compare(m, ev);
			}),
			{ numRuns: 2000 }
		);
	}, 300_000);

	it('a knob turn on a rack left stuck on neither hides nor ends the finding, before and after the upgrade', () => {
		const m = {
			version: 1,
			name: 'knob on a stuck rack',
			decks: 2,
			tempo: 120,
			profile: {
				name: 'grid',
				inputs: [
					{ id: 'p1', kind: 'pad', channel: 1, note: 36 },
					{ id: 'k1', kind: 'knob', channel: 1, cc: 20 }
				]
			},
			counters: [],
			bindings: [
				{
					input: 'p1',
					intent: 'while-held',
					deck: 'A',
					steps: [
						{ target: { kind: 'rack-mode', rack: 1 }, action: 'set', value: 'focus' },
						{ target: { kind: 'slot-effect', rack: 1, slot: 1 }, action: 'set', value: 'echo' },
						{ target: { kind: 'slot-on', rack: 1, slot: 1 }, action: 'set', value: 1 },
						{ target: { kind: 'rack-route', rack: 1, deck: 'A' }, action: 'set', value: 1 },
						{ target: { kind: 'rack-mix', rack: 1 }, action: 'set', value: 1 },
						// Switched on at the press and never off: stuck on once the pad lifts.
						{ target: { kind: 'rack-on', rack: 1 }, action: 'set', value: 1 }
					]
				},
				{ input: 'k1', steps: [{ target: { kind: 'rack-mix', rack: 1 }, action: 'set' }] }
			]
		} as unknown as MappingV1;
		const ev: InputEvent[] = [
			{ t: 0, input: 'p1', type: 'press' },
			{ t: 100, input: 'p1', type: 'release' },
			{ t: 200, input: 'k1', type: 'turn', value: 0.8 },
			{ t: 300, input: 'k1', type: 'turn', value: 0 },
			{ t: 400, input: 'k1', type: 'turn', value: 1 }
		];
		compare(m, ev);
		// Only the mix at 0 silences it: the turns to 0.8 and 1 leave the rack owned by p1.
		expect(analyze(upgraded(m), ev).map((f) => [f.kind, f.start, f.end])).toEqual([
			['stuck-on', 100, 300],
			['stuck-on', 400, null]
		]);
	});

	it('a latched pad taken over is the one finding version 1 did not have', () => {
		const m = {
			version: 1,
			name: 'latched and taken over',
			decks: 2,
			tempo: 120,
			profile: {
				name: 'grid',
				inputs: [
					{ id: 'p1', kind: 'pad', channel: 1, note: 36 },
					{ id: 'p2', kind: 'pad', channel: 1, note: 37 }
				]
			},
			counters: [],
			bindings: [
				{
					input: 'p1',
					intent: 'latched',
					deck: 'A',
					steps: [
						{ target: { kind: 'rack-mode', rack: 1 }, action: 'set', value: 'focus' },
						{ target: { kind: 'slot-effect', rack: 1, slot: 1 }, action: 'set', value: 'echo' },
						{ target: { kind: 'slot-on', rack: 1, slot: 1 }, action: 'set', value: 1 },
						{ target: { kind: 'rack-route', rack: 1, deck: 'A' }, action: 'set', value: 1 },
						{ target: { kind: 'rack-mix', rack: 1 }, action: 'set', value: 1 },
						{ target: { kind: 'rack-on', rack: 1 }, action: 'toggle' }
					]
				},
				{ input: 'p2', deck: 'A', steps: [{ target: { kind: 'rack-on', rack: 1 }, action: 'set', value: 0 }] }
			]
		} as unknown as MappingV1;
		const ev: InputEvent[] = [
			{ t: 0, input: 'p1', type: 'press' },
			{ t: 50, input: 'p1', type: 'release' },
			{ t: 200, input: 'p2', type: 'press' },
			{ t: 250, input: 'p2', type: 'release' }
		];
		compare(m, ev);
		expect(analyze(upgraded(m), ev).map((f) => [f.kind, f.rack, f.event])).toEqual([['takeover', 1, 2]]);
	});

	it('names the racks whose upgrade is outside the contract', () => {
		const m = demos['two-deck'];
		const mixed: MappingV1 = {
			...m,
			bindings: [
				...m.bindings,
				{
					input: 'pad-1',
					steps: [{ target: { kind: 'slot-on', rack: 1, slot: 3 }, action: 'set', value: 1 }]
				}
			]
		};
		expect(upgradeNotes(mixed)).toEqual([expect.stringContaining('Rack 1 played only its first effect')]);
	});
});
