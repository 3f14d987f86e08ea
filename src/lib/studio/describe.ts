// Plain sentences for bindings and steps ("Press: load Echo 1/8 into rack 2, mix 80 %, route to
// deck A only, switch on. Release: switch off."). Pure and UI-free: the pad cards, the builders'
// previews, the printable sheet and the version diff all read a mapping through this module.
// Each phrase keeps the indexes of the steps it speaks for, so a view can link a phrase to a step.
import { DECK_IDS, EFFECTS, divisionFromValue, type Binding, type Guard, type Mapping, type Step } from '$lib/engine';

export interface Phrase {
	text: string;
	steps: number[];
}

export interface BindingDescription {
	press: Phrase[];
	release: Phrase[];
	/** Both lanes as one paragraph. */
	text: string;
}

/** What the describer needs of the mapping around a binding. */
export type Context = Pick<Mapping, 'decks'> & Partial<Pick<Mapping, 'racks' | 'counters'>>;

const pct = (v: number) => `${Math.round(v * 100)} %`;
const phaseOf = (s: Step) => s.phase ?? 'press';

function guardText(guards: Guard[] | undefined): string {
	if (!guards?.length) return '';
	return ` when ${guards.map((g) => `${g.counter} ${g.op === '!=' ? '≠' : g.op} ${g.value}`).join(' and ')}`;
}

/** A parameter value as a person reads it: a note division for beat-synced ones, else a percentage. */
export function paramText(effect: string | null | undefined, param: number, value: number | undefined): string {
	const spec = effect && effect in EFFECTS ? EFFECTS[effect as keyof typeof EFFECTS].params[param - 1] : undefined;
	const v = value ?? spec?.default;
	if (v === undefined) return 'follows the knob';
	if (spec?.divisions) return divisionFromValue(spec.divisions, v);
	return pct(v);
}

function paramLabel(effect: string | null | undefined, param: number): string {
	const spec = effect && effect in EFFECTS ? EFFECTS[effect as keyof typeof EFFECTS].params[param - 1] : undefined;
	return spec ? spec.label.toLowerCase() : `parameter ${param}`;
}

const effectLabel = (e: string) => (e in EFFECTS ? EFFECTS[e as keyof typeof EFFECTS].label : e);

/** One step on its own, naming its rack: "set the mix of rack 2 to 80 %". */
export function describeStep(step: Step, effects: (string | null)[] = []): string {
	return stepText(step, effects, null) + guardText(step.guards) + (phaseOf(step) === 'release' ? ' (on release)' : '');
}

function rackOf(step: Step): number | null {
	return 'rack' in step.target ? step.target.rack : null;
}

/** The words for a step; `rack` omits "rack N" when the sentence is already about that rack. */
function stepText(step: Step, effects: (string | null)[], rack: number | null): string {
	const t = step.target;
	const v = step.value;
	const of = (r: number) => (r === rack ? '' : ` of rack ${r}`);
	const on = step.action === 'momentary' || (step.action === 'set' && v === 1);
	switch (t.kind) {
		case 'chain': {
			const list = Array.isArray(v) ? v.map(effectLabel).join(' → ') : 'the knob’s choice';
			return `load ${list} into rack ${t.rack}`;
		}
		case 'rack-on': {
			const word = step.action === 'toggle' ? 'on or off (toggle)' : on ? 'on' : 'off';
			return rack === t.rack ? `switch ${word}` : `switch rack ${t.rack} ${word}`;
		}
		case 'rack-mix':
			return v === undefined ? `mix${of(t.rack)} follows the knob` : `mix${of(t.rack)} ${pct(v as number)}`;
		case 'rack-route':
			if (step.action === 'toggle') return `toggle the route${of(t.rack)} to deck ${t.deck}`;
			return on ? `route${of(t.rack)} to deck ${t.deck}` : `route${of(t.rack)} away from deck ${t.deck}`;
		case 'effect':
			return v === null || v === undefined
				? `empty position ${t.position}${of(t.rack)}`
				: `put ${effectLabel(String(v))} in position ${t.position}${of(t.rack)}`;
		case 'effect-on':
			if (step.action === 'toggle') return `toggle position ${t.position}${of(t.rack)}`;
			return `switch position ${t.position}${of(t.rack)} ${on ? 'on' : 'off'}`;
		case 'effect-param': {
			const fx = effects[t.position - 1];
			const name = fx ? `${effectLabel(fx)} ${paramLabel(fx, t.param)}` : `position ${t.position} parameter ${t.param}`;
			const value = typeof v === 'number' ? paramText(fx, t.param, v) : 'the knob';
			return `${name}${of(t.rack)} ${typeof v === 'number' ? value : 'follows the knob'}`;
		}
		case 'deck-play':
			if (step.action === 'momentary') return `play deck ${t.deck} while held`;
			if (step.action === 'toggle') return `start or stop deck ${t.deck}`;
			return `${on ? 'start' : 'stop'} deck ${t.deck}`;
		case 'counter':
			if (step.action === 'count-up') return `count ${t.counter} up`;
			if (step.action === 'count-down') return `count ${t.counter} down`;
			if (step.action === 'reset') return `reset ${t.counter}`;
			return `set ${t.counter} to ${v}`;
	}
}

/** Chains loaded by the binding's own steps, per rack, so parameter steps can name the effect. */
function chainsIn(steps: Step[]): Map<number, (string | null)[]> {
	const out = new Map<number, (string | null)[]>();
	for (const s of steps)
		if (s.target.kind === 'chain' && Array.isArray(s.value)) out.set(s.target.rack, [...s.value]);
		else if (s.target.kind === 'effect') {
			const list = out.get(s.target.rack) ?? [];
			list[s.target.position - 1] = typeof s.value === 'string' ? s.value : null;
			out.set(s.target.rack, list);
		}
	return out;
}

/** Step `index` of a binding on its own, naming effects its own chain loads ("Stutter slice 1/4"). */
export function describeStepIn(steps: Step[], index: number): string {
	const step = steps[index];
	const rack = rackOf(step);
	return describeStep(step, rack === null ? [] : (chainsIn(steps).get(rack) ?? []));
}

const sameGuards = (a: Step, b: Step) => JSON.stringify(a.guards ?? []) === JSON.stringify(b.guards ?? []);

/** Phrases for one lane: chain loads absorb their parameters, route steps of a rack fold together. */
function lane(
	steps: Step[],
	indexes: number[],
	decks: 2 | 4,
	releaseOfMomentary: boolean,
	context: { rack: number | null }
): Phrase[] {
	const chains = chainsIn(steps);
	const out: Phrase[] = [];
	const used = new Set<number>();
	let rack = context.rack;
	for (const i of indexes) {
		if (used.has(i)) continue;
		const s = steps[i];
		const r = rackOf(s);
		used.add(i);
		const covered = [i];
		let text: string;
		if (s.target.kind === 'chain' && Array.isArray(s.value)) {
			const chainRack = s.target.rack;
			const parts = s.value.map((fx, p) => {
				const params = indexes.filter((j) => {
					const o = steps[j].target;
					return (
						!used.has(j) &&
						o.kind === 'effect-param' &&
						o.rack === chainRack &&
						o.position === p + 1 &&
						typeof steps[j].value === 'number' &&
						sameGuards(steps[j], s)
					);
				});
				const words = params.map((j) => {
					used.add(j);
					covered.push(j);
					const o = steps[j].target as { param: number };
					const value = paramText(fx, o.param, steps[j].value as number);
					return o.param === 1 && EFFECTS[fx as keyof typeof EFFECTS]?.params[0].divisions
						? value
						: `${paramLabel(fx, o.param)} ${value}`;
				});
				return [effectLabel(fx), ...words].join(' ');
			});
			text = `load ${parts.join(' → ')} into rack ${chainRack}`;
		} else if (s.target.kind === 'rack-route' && s.action === 'set') {
			const routeRack = s.target.rack;
			const group = indexes.filter((j) => {
				const o = steps[j];
				return (
					!used.has(j) &&
					o.target.kind === 'rack-route' &&
					o.target.rack === routeRack &&
					o.action === 'set' &&
					sameGuards(o, s)
				);
			});
			group.forEach((j) => (used.add(j), covered.push(j)));
			const all = [i, ...group].map((j) => steps[j]);
			const to = all.filter((o) => o.value === 1).map((o) => (o.target as { deck: string }).deck);
			const away = all.filter((o) => o.value === 0).map((o) => (o.target as { deck: string }).deck);
			const others = DECK_IDS.slice(0, decks).filter((d) => !to.includes(d));
			const where = routeRack === rack ? '' : ` rack ${routeRack}`;
			if (to.length === 1 && others.every((d) => away.includes(d))) text = `route${where} to deck ${to[0]} only`;
			else {
				const bits = [];
				if (to.length) bits.push(`to deck ${to.join(' and ')}`);
				if (away.length) bits.push(`away from deck ${away.join(' and ')}`);
				text = `route${where} ${bits.join(' and ')}`;
			}
		} else if (releaseOfMomentary) {
			text = stepText({ ...s, action: 'set', value: 0 }, chains.get(r ?? 0) ?? [], rack);
			if (s.target.kind === 'deck-play') text = `stop deck ${s.target.deck}`;
		} else text = stepText(s, chains.get(r ?? 0) ?? [], rack);
		out.push({ text: text + guardText(s.guards), steps: covered.sort((a, b) => a - b) });
		if (r !== null) rack = context.rack = r;
	}
	return out;
}

export function describeBinding(
	binding: Pick<Binding, 'steps' | 'quantize' | 'releaseAtOnce'>,
	context: Context
): BindingDescription {
	const steps = binding.steps;
	const pressIdx = steps.flatMap((s, i) => (phaseOf(s) === 'press' ? [i] : []));
	const momentary = steps.flatMap((s, i) => (s.action === 'momentary' ? [i] : []));
	const releaseIdx = steps.flatMap((s, i) => (phaseOf(s) === 'release' && s.action !== 'momentary' ? [i] : []));
	// The sentence stays "about" the last rack it named, across lanes, so "switch off" needs no rack.
	const about = { rack: null as number | null };
	const press = lane(steps, pressIdx, context.decks, false, about);
	// A momentary step switches off again on release: say so in the release lane.
	const release = [
		...lane(steps, momentary, context.decks, true, about),
		...lane(steps, releaseIdx, context.decks, false, about)
	];
	const grid = binding.quantize && binding.quantize !== 'off' ? ` on the next ${binding.quantize} grid line` : '';
	const releaseGrid = grid && !binding.releaseAtOnce ? grid : '';
	const sentence = (name: string, phrases: Phrase[], when: string) =>
		phrases.length ? `${name}${when}: ${phrases.map((p) => p.text).join(', ')}.` : '';
	const text =
		[sentence('Press', press, grid), sentence('Release', release, releaseGrid)].filter(Boolean).join(' ') ||
		'Does nothing yet.';
	return { press, release, text };
}

/** A pad's name as a person sees it: the binding's label, else the input's label, else its id. */
export function padName(mapping: Pick<Mapping, 'profile' | 'bindings'>, input: string): string {
	const binding = mapping.bindings.find((b) => b.input === input);
	const control = mapping.profile.inputs.find((i) => i.id === input);
	const own = control?.label ?? input;
	return binding?.label ? `${binding.label} (${own})` : own;
}
