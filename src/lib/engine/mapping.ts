// The mapping document, version 2 (our own format). `parseMapping` is the only way an outside
// mapping enters the engine: it returns the typed Mapping or every problem at once, each with a
// readable path (`bindings[2].steps[0].target.rack`) and a sentence a performer can act on.
// Cross-field rules (inputs exist, counters exist, racks declared, decks within the deck count,
// the action fits the target, the value fits the target) live here so the engine can trust what
// it is given. A version 1 document is validated by its own schema and upgraded (upgrade.ts).
import { z } from 'zod';
import {
	ACTIONS,
	DECK_IDS,
	EFFECT_IDS,
	INPUT_KINDS,
	INTENTS,
	CHAIN_MAX,
	MAX_RACKS,
	PARAM_COUNT,
	PHASES,
	QUANTIZE,
	type Mapping,
	type Step
} from './types';
import { mappingV1Schema, upgradeMapping, upgradeNotes, type MappingV1 } from './upgrade';

export interface Problem {
	path: string;
	message: string;
}
export type ParseResult<T> = { ok: true; value: T } | { ok: false; problems: Problem[] };
export type MappingResult =
	| {
			ok: true;
			mapping: Mapping;
			/** Set when a version 1 document was upgraded: where the upgrade may not keep the exact timeline. */
			upgrade?: { from: 1; notes: string[] };
	  }
	| { ok: false; problems: Problem[] };

const whole = (min: number, max: number) => z.number().int().min(min).max(max);
const id = z.string().trim().min(1).max(64);
const deckId = z.enum(DECK_IDS);
const rack = whole(1, MAX_RACKS);
const position = whole(1, CHAIN_MAX);

export const targetSchema = z.discriminatedUnion('kind', [
	z.object({ kind: z.literal('rack-on'), rack }),
	z.object({ kind: z.literal('rack-mix'), rack }),
	z.object({ kind: z.literal('rack-route'), rack, deck: deckId }),
	z.object({ kind: z.literal('chain'), rack }),
	z.object({ kind: z.literal('effect'), rack, position }),
	z.object({ kind: z.literal('effect-on'), rack, position }),
	z.object({ kind: z.literal('effect-param'), rack, position, param: whole(1, PARAM_COUNT) }),
	z.object({ kind: z.literal('deck-play'), deck: deckId }),
	z.object({ kind: z.literal('counter'), counter: id })
]);

const guardSchema = z.object({
	counter: id,
	op: z.enum(['=', '!=', '<', '<=', '>', '>=']),
	value: z.number().int()
});

export const stepSchema = z.object({
	target: targetSchema,
	action: z.enum(ACTIONS),
	// Any number, word or null here; whether it fits the target is checked with the target in view.
	value: z.union([z.number(), z.string().max(32), z.array(z.string().max(32)).max(8), z.null()]).optional(),
	phase: z.enum(PHASES).optional(),
	guards: z.array(guardSchema).max(4).optional()
});

const inputSchema = z.object({
	id,
	kind: z.enum(INPUT_KINDS),
	label: z.string().max(64).optional(),
	channel: whole(1, 16),
	note: whole(0, 127).optional(),
	cc: whole(0, 127).optional(),
	row: whole(0, 63).optional(),
	col: whole(0, 63).optional(),
	led: z.object({ note: whole(0, 127), on: whole(0, 127).optional(), off: whole(0, 127).optional() }).optional()
});

const counterSchema = z.object({
	id,
	label: z.string().max(64).optional(),
	max: whole(1, 127).default(15),
	rest: whole(0, 127).default(0)
});

const bindingSchema = z.object({
	input: id,
	label: z.string().max(64).optional(),
	intent: z.enum(INTENTS).optional(),
	deck: deckId.optional(),
	group: id.optional(),
	quantize: z.enum(QUANTIZE).optional(),
	releaseAtOnce: z.boolean().optional(),
	takeover: z.boolean().optional(),
	steps: z.array(stepSchema).max(64)
});

const rackDeclSchema = z.object({ id, label: z.string().trim().min(1).max(64) });

export const profileSchema = z.object({
	name: z.string().trim().min(1).max(120),
	rows: whole(1, 64).optional(),
	cols: whole(1, 64).optional(),
	inputs: z.array(inputSchema).max(512)
});

export const mappingSchema = z
	.object({
		version: z.literal(2),
		name: z.string().trim().min(1).max(120),
		decks: z.literal([2, 4]),
		tempo: z.number().min(40).max(300).optional(),
		profile: profileSchema,
		racks: z.array(rackDeclSchema).min(1).max(MAX_RACKS),
		counters: z.array(counterSchema).max(64).default([]),
		bindings: z.array(bindingSchema).max(512)
	})
	.superRefine((m, ctx) => {
		for (const p of crossCheck(m)) ctx.addIssue({ code: 'custom', message: p.message, path: p.path });
	});

type Raw = z.output<typeof mappingSchema>;
type Path = (string | number)[];

/** Rules between fields that a per-field schema can't see. */
function crossCheck(m: Raw): { path: Path; message: string }[] {
	const out: { path: Path; message: string }[] = [];
	const decks = DECK_IDS.slice(0, m.decks) as readonly string[];
	const deckOk = (d: string, path: Path) => {
		if (!decks.includes(d)) out.push({ path, message: `deck ${d} doesn't exist in a ${m.decks}-deck mapping` });
	};
	const rackIds = new Set<string>();
	m.racks.forEach((r, i) => {
		if (rackIds.has(r.id)) out.push({ path: ['racks', i, 'id'], message: `another rack is already called "${r.id}"` });
		rackIds.add(r.id);
	});
	const rackOk = (r: number, path: Path) => {
		if (r > m.racks.length)
			out.push({ path, message: `rack ${r} isn't declared: this mapping has ${m.racks.length} rack(s)` });
	};
	const seen = new Set<string>();
	m.profile.inputs.forEach((input, i) => {
		if (seen.has(input.id))
			out.push({ path: ['profile', 'inputs', i, 'id'], message: `another input is already called "${input.id}"` });
		seen.add(input.id);
		if ((input.note === undefined) === (input.cc === undefined))
			out.push({
				path: ['profile', 'inputs', i],
				message: 'give the input either a note or a CC number (exactly one)'
			});
	});
	const counters = new Map<string, number>();
	m.counters.forEach((c, i) => {
		if (counters.has(c.id))
			out.push({ path: ['counters', i, 'id'], message: `another counter is already called "${c.id}"` });
		if (c.rest > c.max)
			out.push({ path: ['counters', i, 'rest'], message: `rest value ${c.rest} is above the counter's max ${c.max}` });
		counters.set(c.id, c.max);
	});
	const counterOk = (c: string, path: Path) => {
		if (!counters.has(c)) out.push({ path, message: `there is no counter called "${c}"` });
	};
	m.bindings.forEach((b, bi) => {
		const at: Path = ['bindings', bi];
		if (!seen.has(b.input))
			out.push({ path: [...at, 'input'], message: `there is no input called "${b.input}" in the controller profile` });
		if (b.deck) deckOk(b.deck, [...at, 'deck']);
		b.steps.forEach((s, si) => {
			const sp: Path = [...at, 'steps', si];
			if ('deck' in s.target) deckOk(s.target.deck, [...sp, 'target', 'deck']);
			if ('rack' in s.target) rackOk(s.target.rack, [...sp, 'target', 'rack']);
			if (s.target.kind === 'counter') counterOk(s.target.counter, [...sp, 'target', 'counter']);
			s.guards?.forEach((g, gi) => counterOk(g.counter, [...sp, 'guards', gi, 'counter']));
			const problem = stepProblem(s, counters);
			if (problem) out.push({ path: sp, message: problem });
		});
	});
	return out;
}

const SWITCHES = new Set(['rack-on', 'rack-route', 'effect-on', 'deck-play']);
const LEVELS = new Set(['rack-mix', 'effect-param']);
const isEffect = (v: unknown) => (EFFECT_IDS as readonly unknown[]).includes(v);

/** Whether the action fits the target and the value fits both; null when it does. */
function stepProblem(
	s: Pick<Step, 'target' | 'action'> & { value?: unknown },
	counters: Map<string, number>
): string | null {
	const { kind } = s.target;
	const v = s.value;
	if (s.action === 'momentary' || s.action === 'toggle') {
		if (!SWITCHES.has(kind)) return `${s.action} only works on something that switches on and off, not on ${kind}`;
		if (v !== undefined) return `${s.action} steps take no value`;
		return null;
	}
	if (s.action !== 'set') {
		if (kind !== 'counter') return `${s.action} only works on a counter`;
		if (v !== undefined) return `${s.action} steps take no value`;
		return null;
	}
	if (v === undefined) return knobOk(kind) ? null : 'a set step needs a value';
	if (kind === 'chain') {
		if (!Array.isArray(v) || v.length < 1 || v.length > CHAIN_MAX)
			return `a chain step loads a list of 1 to ${CHAIN_MAX} effects`;
		const bad = v.find((e) => !isEffect(e));
		return bad === undefined ? null : `"${String(bad)}" is not an effect`;
	}
	if (kind === 'effect') return v === null || isEffect(v) ? null : `"${String(v)}" is not an effect`;
	if (typeof v !== 'number') return `${kind} takes a number`;
	if (SWITCHES.has(kind)) return v === 0 || v === 1 ? null : `${kind} takes 0 (off) or 1 (on)`;
	if (LEVELS.has(kind)) return v >= 0 && v <= 1 ? null : `${kind} takes a value from 0 to 1`;
	if (s.target.kind === 'counter') {
		const max = counters.get(s.target.counter) ?? 0;
		return Number.isInteger(v) && v >= 0 && v <= max ? null : `counter value must be a whole number from 0 to ${max}`;
	}
	return null;
}

/** A set step without a value takes the knob's position, so only continuous targets allow it. */
function knobOk(kind: string): boolean {
	return LEVELS.has(kind);
}

function pathText(path: readonly PropertyKey[]): string {
	let out = '';
	for (const p of path) out += typeof p === 'number' ? `[${p}]` : out ? `.${String(p)}` : String(p);
	return out || '(document)';
}

function friendly(issue: z.core.$ZodIssue): string {
	switch (issue.code) {
		case 'invalid_type':
			if (issue.message.endsWith('received undefined')) return 'is required';
			return issue.expected === 'int' ? 'must be a whole number' : `must be ${article(issue.expected)}`;
		case 'too_small':
			if (issue.origin === 'array') return `needs at least ${issue.minimum} item(s)`;
			if (issue.origin === 'string') return 'must not be empty';
			return `must be ${issue.inclusive ? 'at least' : 'more than'} ${issue.minimum}`;
		case 'too_big':
			if (issue.origin === 'array') return `can have at most ${issue.maximum} item(s)`;
			if (issue.origin === 'string') return `must be at most ${issue.maximum} characters`;
			return `must be ${issue.inclusive ? 'at most' : 'less than'} ${issue.maximum}`;
		case 'invalid_value':
			return `must be ${issue.values.length === 1 ? '' : 'one of '}${issue.values.map((v) => JSON.stringify(v)).join(', ')}`;
		case 'invalid_union': {
			const options = (issue as { options?: unknown[] }).options;
			return options
				? `must be one of ${options.map((o) => JSON.stringify(o)).join(', ')}`
				: 'is not a value this field accepts';
		}
		default:
			return issue.message;
	}
}

const article = (word: string) => (/^[aeiou]/.test(word) ? `an ${word}` : `a ${word}`);

export function toProblems(error: z.ZodError): Problem[] {
	return error.issues.map((issue) => ({ path: pathText(issue.path), message: friendly(issue) }));
}

/** Reads a version 2 document, or a version 1 document upgraded to version 2. */
export function parseMapping(input: unknown): MappingResult {
	if (input && typeof input === 'object' && (input as { version?: unknown }).version === 1) {
		const old = mappingV1Schema.safeParse(input);
		if (!old.success) {
			// Name every problem at once: what the version 1 steps break, and what the rest of the document does.
			const rest = mappingSchema.safeParse({
				...input,
				version: 2,
				racks: [{ id: 'rack-1', label: 'Rack 1' }],
				bindings: []
			});
			const more = rest.success ? [] : toProblems(rest.error).filter((p) => !p.path.startsWith('racks'));
			return { ok: false, problems: [...toProblems(old.error), ...more] };
		}
		const v1 = old.data as unknown as MappingV1;
		const r = parseMapping(upgradeMapping(v1));
		return r.ok ? { ...r, upgrade: { from: 1, notes: upgradeNotes(v1) } } : r;
	}
	const r = mappingSchema.safeParse(input);
	if (!r.success) return { ok: false, problems: toProblems(r.error) };
	// The cross-field check has confirmed every step value fits its target, which is what narrows
	// the schema's loose `value` to StepValue.
	const mapping = r.data as Mapping;
	return { ok: true, mapping };
}

/** What to tell a person about a document that was upgraded on the way in: nothing for a version 2 document. */
export function upgradeSentences(input: unknown): string[] {
	if (!input || typeof input !== 'object' || (input as { version?: unknown }).version !== 1) return [];
	const r = parseMapping(input);
	return r.ok && r.upgrade ? r.upgrade.notes : [];
}

/** `JSON.parse` plus `parseMapping`, so a file that isn't JSON gets a problem, not a throw. */
export function parseMappingText(text: string): MappingResult {
	let data: unknown;
	try {
		data = JSON.parse(text);
	} catch (e) {
		return { ok: false, problems: [{ path: '(document)', message: `is not valid JSON: ${(e as Error).message}` }] };
	}
	return parseMapping(data);
}
