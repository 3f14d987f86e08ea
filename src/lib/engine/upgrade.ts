// Version 1 mapping documents (four fixed racks of three slots, each rack in a "chain" or "focus"
// mode) upgraded to version 2 (declared racks, each with a chain of positions, no modes).
// Contract: the upgraded document gives the same audible timeline and findings as the version 1
// rules gave, for every version 1 document in which no rack that is switched to focus mode has a
// step on its slots 2 or 3 (the way version 1 documents were built: the builders set focus mode
// with slot 1 only, chain mode without focus). `upgradeNotes` names the racks outside that contract.
// Step by step:
//   rack-mode focus  → effect-on positions 2 and 3 off (focus mode plays slot 1 alone)
//   rack-mode chain  → nothing (chain mode plays every slot that is on)
//   slot-effect s    → effect at position s;  slot-on s → effect-on position s
//   slot-amount s    → effect-param position s, the parameter the slot's amount knob turned
//   focus-param p    → effect-param position 1, parameter p
// and the pattern the version 1 builders wrote for one pad — focus mode, slot 1's effect, slot 1
// on — becomes one `chain` step loading that effect, which is what the pad meant.
import { z } from 'zod';
import { EFFECTS } from './effects';
import type { Binding, EffectId, Mapping, Step, Target } from './types';

const RACKS_V1 = 4;
const rack = z.number().int().min(1).max(RACKS_V1);
const slot = z.number().int().min(1).max(3);
const deck = z.enum(['A', 'B', 'C', 'D']);

const targetV1 = z.discriminatedUnion('kind', [
	z.object({ kind: z.literal('rack-on'), rack }),
	z.object({ kind: z.literal('rack-mode'), rack }),
	z.object({ kind: z.literal('rack-mix'), rack }),
	z.object({ kind: z.literal('rack-route'), rack, deck }),
	z.object({ kind: z.literal('slot-effect'), rack, slot }),
	z.object({ kind: z.literal('slot-on'), rack, slot }),
	z.object({ kind: z.literal('slot-amount'), rack, slot }),
	z.object({ kind: z.literal('focus-param'), rack, param: z.number().int().min(1).max(3) }),
	z.object({ kind: z.literal('deck-play'), deck }),
	z.object({ kind: z.literal('counter'), counter: z.string() })
]);
export type TargetV1 = z.output<typeof targetV1>;

const stepV1 = z.looseObject({ target: targetV1 }).superRefine((s, ctx) => {
	const v = (s as { value?: unknown }).value;
	if (s.target.kind === 'rack-mode' && v !== undefined && v !== 'chain' && v !== 'focus')
		ctx.addIssue({ code: 'custom', path: ['value'], message: 'rack mode must be "chain" or "focus"' });
});

/** Only what changed between the versions is checked here; the upgraded document is then checked whole. */
export const mappingV1Schema = z.looseObject({
	version: z.literal(1),
	bindings: z.array(z.looseObject({ steps: z.array(stepV1).max(64) })).max(512)
});

export interface StepV1 {
	target: TargetV1;
	action: Step['action'];
	value?: unknown;
	phase?: Step['phase'];
	guards?: Step['guards'];
}
export interface BindingV1 extends Omit<Binding, 'steps' | 'releaseAtOnce' | 'takeover'> {
	steps: StepV1[];
}
export interface MappingV1 extends Omit<Mapping, 'version' | 'racks' | 'bindings'> {
	version: 1;
	bindings: BindingV1[];
}

/** The catalog parameter (1–3) a version 1 chain slot's amount knob turned, by effect. */
const AMOUNT_PARAM: Record<EffectId, string> = {
	echo: 'feedback',
	'ping-pong': 'feedback',
	'tape-echo': 'feedback',
	reverb: 'size',
	filter: 'cutoff',
	stutter: 'slice',
	gate: 'depth',
	bitcrush: 'bits',
	flanger: 'depth',
	phaser: 'depth'
};

function amountParam(effect: EffectId | undefined): number {
	if (!effect) return 1;
	return EFFECTS[effect].params.findIndex((p) => p.id === AMOUNT_PARAM[effect]) + 1;
}

const sameRun = (a: StepV1, b: StepV1) =>
	(a.phase ?? 'press') === (b.phase ?? 'press') && JSON.stringify(a.guards ?? []) === JSON.stringify(b.guards ?? []);

/** Index of the steps a one-press pad of version 1 used to load slot 1 in focus mode, by the mode step. */
function focusLoads(steps: StepV1[]): Map<number, { effect: number; on: number }> {
	const out = new Map<number, { effect: number; on: number }>();
	steps.forEach((s, i) => {
		if (s.target.kind !== 'rack-mode' || s.action !== 'set' || s.value !== 'focus') return;
		const r = s.target.rack;
		const effect = steps.findIndex(
			(o, k) =>
				k > i &&
				o.target.kind === 'slot-effect' &&
				o.target.rack === r &&
				o.target.slot === 1 &&
				o.action === 'set' &&
				typeof o.value === 'string' &&
				sameRun(o, s)
		);
		const on = steps.findIndex(
			(o, k) =>
				k > effect &&
				o.target.kind === 'slot-on' &&
				o.target.rack === r &&
				o.target.slot === 1 &&
				o.action === 'set' &&
				o.value === 1 &&
				sameRun(o, s)
		);
		// Nothing between them may touch slot 1, or the load would change what the pad did.
		const between = steps.slice(i + 1, on).some((o, k) => {
			const at = i + 1 + k;
			if (at === effect) return false;
			const t = o.target;
			return 'slot' in t && t.rack === r && t.slot === 1;
		});
		if (effect > 0 && on > 0 && !between) out.set(i, { effect, on });
	});
	return out;
}

/** The effect every slot-effect step of the document puts in this rack's slot, when there is only one. */
function slotEffects(m: MappingV1): Map<string, EffectId | undefined> {
	const seen = new Map<string, EffectId | undefined>();
	for (const b of m.bindings)
		for (const s of b.steps) {
			if (s.target.kind !== 'slot-effect' || typeof s.value !== 'string') continue;
			const key = `${s.target.rack}|${s.target.slot}`;
			const v = s.value as EffectId;
			seen.set(key, seen.has(key) && seen.get(key) !== v ? undefined : v);
		}
	return seen;
}

function upgradeSteps(steps: StepV1[], effects: Map<string, EffectId | undefined>): Step[] {
	const out: Step[] = [];
	const loads = focusLoads(steps);
	const skip = new Set<number>();
	for (const { effect, on } of loads.values()) skip.add(effect).add(on);
	const keep = (s: StepV1, target: Target, value?: Step['value']): Step => {
		const step: Step = { target, action: s.action };
		if (value !== undefined) step.value = value;
		else if (s.value !== undefined) step.value = s.value as Step['value'];
		if (s.phase) step.phase = s.phase;
		if (s.guards) step.guards = s.guards;
		return step;
	};
	steps.forEach((s, i) => {
		if (skip.has(i)) return;
		const t = s.target;
		switch (t.kind) {
			case 'rack-mode': {
				const load = loads.get(i);
				if (load) out.push(keep(s, { kind: 'chain', rack: t.rack }, [steps[load.effect].value as EffectId]));
				else if (s.value === 'focus')
					for (const position of [2, 3]) out.push(keep(s, { kind: 'effect-on', rack: t.rack, position }, 0));
				return;
			}
			case 'slot-effect':
				return void out.push(keep(s, { kind: 'effect', rack: t.rack, position: t.slot }));
			case 'slot-on':
				return void out.push(keep(s, { kind: 'effect-on', rack: t.rack, position: t.slot }));
			case 'slot-amount': {
				const param = amountParam(effects.get(`${t.rack}|${t.slot}`));
				return void out.push(keep(s, { kind: 'effect-param', rack: t.rack, position: t.slot, param }));
			}
			case 'focus-param':
				return void out.push(keep(s, { kind: 'effect-param', rack: t.rack, position: 1, param: t.param }));
			default:
				out.push(keep(s, t));
		}
	});
	return out;
}

export function upgradeMapping(m: MappingV1): Mapping {
	const effects = slotEffects(m);
	const { version: _version, bindings, ...rest } = m;
	return {
		version: 2,
		...rest,
		racks: Array.from({ length: RACKS_V1 }, (_, i) => ({ id: `rack-${i + 1}`, label: `Rack ${i + 1}` })),
		bindings: bindings.map((b) => ({ ...b, steps: upgradeSteps(b.steps, effects) }))
	};
}

/**
 * Where a version 1 document's upgrade may not sound or find exactly as before (see the header), as
 * sentences a person reads after the upgrade: empty for documents inside the contract.
 */
export function upgradeNotes(m: MappingV1): string[] {
	const notes: string[] = [];
	for (let r = 1; r <= RACKS_V1; r++) {
		const steps = m.bindings.flatMap((b) => b.steps).filter((s) => 'rack' in s.target && s.target.rack === r);
		const focus = steps.some((s) => s.target.kind === 'rack-mode' && s.value === 'focus');
		const later = steps.some((s) => 'slot' in s.target && s.target.slot > 1);
		if (focus && later)
			notes.push(
				`Rack ${r} played only its first effect on some pads (version 1's focus mode) and its second or third effect on others. ` +
					`Version 2 has no modes, so these pads may not sound exactly as before: try rack ${r}'s pads before you play live.`
			);
	}
	// A mode step sets its rack up; when nothing else on that rack runs with it, version 2 has no step left to.
	m.bindings.forEach((b, i) => {
		const alone = b.steps.find((s) => {
			if (s.target.kind !== 'rack-mode' || s.value !== 'chain') return false;
			const rack = s.target.rack;
			return !b.steps.some(
				(o) => o !== s && 'rack' in o.target && o.target.rack === rack && o.target.kind !== 'rack-mode' && sameRun(o, s)
			);
		});
		if (alone && 'rack' in alone.target)
			notes.push(
				`Binding ${i + 1} (${b.label ?? b.input}) only switched rack ${alone.target.rack} back to playing several effects (version 1's chain mode). ` +
					`Version 2 has no modes, so that step was left out: check the pad still does what you meant.`
			);
	});
	return notes;
}
