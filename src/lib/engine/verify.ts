// The verifier (DESIGN.md §4.7): breadth-first search over every press/release interleaving of a
// group of inputs, from the starting rig, checking the finding rules of watch.ts at every state.
// Breadth first means the first broken state found is reached by a shortest event sequence, which
// comes back as a counterexample ready to load into replay: with quantize on, its events sit on
// grid lines of the mapping's tempo, so replay lands them in the same order and finds the same.
// States are deduplicated on what the finding rules and future steps can read: on/off switches,
// routes, "mix above 0", "position has an effect", decks playing, counters, pads played, what the
// rules read of whoever last set up each rack (its deck, whether it latches, which units its pad
// belongs to) and which latched pad holds a rack. Parameter values never change what a step does
// (steps write constants; guards read counters only), so states differing only there behave alike.
// Interchangeable pads — bindings equal up to parameter values and labels — are folded: the key
// counts how many of each kind are held, and only the first free pad of a kind is pressed and the
// first held one released, so a 64-pad hold group costs about what a 4-pad one does. The answer
// never depends on the order the inputs are listed in.
import { analyze } from './analyze';
import { compileMapping } from './compile';
import { divisionMs } from './effects';
import { applyEvent, initialRigState } from './rig';
import { DEFAULT_TEMPO } from './schedule';
import { conditions, initialWatch, observe, rackBits, rulesFor, takeovers, type Rules, type WatchState } from './watch';
import { DECK_IDS, type Binding, type Finding, type InputEvent, type Mapping, type RigState } from './types';

export interface VerifyProgress {
	statesExplored: number;
	depth: number;
	frontier: number;
}

export interface VerifyOptions {
	onProgress?: (p: VerifyProgress) => void;
	signal?: AbortSignal;
	maxStates?: number; // default 2,000,000: past it the answer is "unknown", not a proof
	gapMs?: number; // least spacing of counterexample events, default 250 ms
	chunk?: number; // states explored between progress reports (and yields), default 20,000
	fold?: boolean; // fold interchangeable pads (default true); off gives the plain search
}

/** What a proof covers, in words a person can check. */
export const PROOF_SCOPE = 'this group, from the starting rig';

export interface VerifyResult {
	ok: boolean;
	status: 'proved' | 'broken' | 'cancelled' | 'too-big';
	statesExplored: number;
	padsFolded: number; // pads the search did not tell apart from another pad of the group
	scope: string; // PROOF_SCOPE
	counterexample?: InputEvent[];
	finding?: Finding; // what analyze reports on the counterexample's last event
}

const CHUNK = 20000;

/** Bindings of one input with labels and parameter values left out: equal means interchangeable. */
function kindOf(bindings: Binding[]): string | null {
	if (!bindings.length || bindings.some((b) => b.intent === 'latched')) return null;
	return JSON.stringify(
		bindings.map(({ steps, label: _label, input: _input, ...rest }) => ({
			...rest,
			steps: steps.map((s) => (s.target.kind === 'effect-param' ? { ...s, value: 'any' } : s))
		}))
	);
}

class Search {
	readonly rules: Rules;
	readonly states: RigState[] = [];
	readonly watches: WatchState[] = [];
	readonly parent: number[] = [];
	readonly move: number[] = []; // input index × 2 + (1 when release)
	readonly depthOf: number[] = [];
	readonly seen = new Set<string>();
	readonly clashing: boolean[];
	/** Per input: its kind; a kind of one pad is its own. */
	readonly kind: number[];
	readonly kindSize: number[];
	readonly padsFolded: number;
	head = 0;
	found = -1;
	readonly codes: number[] = [];

	constructor(
		readonly mapping: Mapping,
		readonly inputs: string[],
		fold: boolean
	) {
		this.rules = rulesFor(mapping);
		this.clashing = inputs.map((i) => this.rules.clashInputs.has(i));
		const kinds = new Map<string, number>();
		this.kind = inputs.map((input, k) => {
			const sig = fold && !this.clashing[k] ? kindOf(mapping.bindings.filter((b) => b.input === input)) : null;
			if (sig === null) return kinds.set(`#${k}`, kinds.size).get(`#${k}`)!;
			return kinds.get(sig) ?? kinds.set(sig, kinds.size).get(sig)!;
		});
		this.kindSize = new Array(kinds.size).fill(0);
		for (const c of this.kind) this.kindSize[c]++;
		this.padsFolded = this.kindSize.reduce((n, size) => n + size - 1, 0);
		const s = initialRigState(mapping);
		const w = initialWatch(this.rules);
		this.push(s, w, -1, -1, 0);
		this.seen.add(this.key(s, w));
	}

	push(s: RigState, w: WatchState, parent: number, move: number, depth: number) {
		this.states.push(s);
		this.watches.push(w);
		this.parent.push(parent);
		this.move.push(move);
		this.depthOf.push(depth);
	}

	key(s: RigState, w: WatchState): string {
		const codes = this.codes;
		codes.length = 0;
		const counts = new Array(this.kindSize.length).fill(0);
		let held = 0;
		let bit = 0;
		for (let k = 0; k < this.inputs.length; k++) {
			const c = this.kind[k];
			const down = s.held.includes(this.inputs[k]);
			if (this.kindSize[c] > 1) {
				if (down) counts[c]++;
				continue;
			}
			if (down) held |= 1 << bit;
			if (++bit === 16) {
				codes.push(held);
				held = bit = 0;
			}
		}
		codes.push(held, ...counts);
		const owner = this.rules.ownerCode;
		for (let i = 0; i < s.racks.length; i++) {
			const r = s.racks[i];
			let x = (r.on ? 1 : 0) | (r.mix > 0 ? 2 : 0);
			for (let k = 0; k < r.chain.length; k++)
				x |= ((r.chain[k].effect !== null ? 1 : 0) | (r.chain[k].on ? 2 : 0)) << (2 + 2 * k);
			for (let k = 0; k < DECK_IDS.length; k++) x |= (r.routes[DECK_IDS[k]] ? 1 : 0) << (10 + k);
			const t = w.toucher[i];
			codes.push(x, t < 0 ? 0 : owner[t], w.latched[i] + 1);
		}
		let decks = 0;
		for (let k = 0; k < DECK_IDS.length; k++) decks |= (s.decks[DECK_IDS[k]].playing ? 1 : 0) << k;
		codes.push(decks);
		for (const c of this.mapping.counters) codes.push(s.counters[c.id] ?? 0);
		let used = 0;
		for (let i = 0; i < w.used.length; i++) {
			if (w.used[i]) used |= 1 << (i % 16);
			if (i % 16 === 15) {
				codes.push(used);
				used = 0;
			}
		}
		codes.push(used);
		return String.fromCharCode.apply(null, codes);
	}

	/** Explore up to `budget` states; true when the search is over. */
	run(budget: number, maxStates: number): boolean {
		const n = this.inputs.length;
		const tried = new Uint8Array(this.kindSize.length * 2);
		for (let spent = 0; spent < budget; spent++) {
			if (this.head >= this.states.length) return true;
			const i = this.head++;
			const s = this.states[i];
			const depth = this.depthOf[i] + 1;
			tried.fill(0);
			for (let k = 0; k < n; k++) {
				const input = this.inputs[k];
				const type = s.held.includes(input) ? 'release' : 'press';
				// Of a folded kind, only the first free pad is pressed and the first held one released.
				const slot = this.kind[k] * 2 + (type === 'release' ? 1 : 0);
				if (tried[slot]) continue;
				tried[slot] = 1;
				const r = applyEvent(this.mapping, s, { t: depth, input, type }, depth - 1);
				const bits = rackBits(r.changes);
				const before = this.watches[i];
				const w = observe(this.rules, before, input, type, r.setUp, r.state, bits.reshaped);
				const broken =
					r.clamps.length > 0 ||
					(type === 'press' && this.clashing[k]) ||
					takeovers(this.rules, before, input, type, bits.reshaped).length > 0 ||
					conditions(this.rules, r.state, w).length > 0;
				const move = k * 2 + (type === 'release' ? 1 : 0);
				if (broken) {
					this.push(r.state, w, i, move, depth);
					this.found = this.states.length - 1;
					return true;
				}
				const key = this.key(r.state, w);
				if (this.seen.has(key)) continue;
				this.seen.add(key);
				this.push(r.state, w, i, move, depth);
			}
			if (this.states.length > maxStates) return true;
		}
		return false;
	}

	/** Event spacing: at least `gap`, and a whole number of the coarsest quantize grid in the group. */
	spacing(gap: number): number {
		const quantize = compileMapping(this.mapping).quantizeByInput;
		const tempo = this.mapping.tempo ?? DEFAULT_TEMPO;
		let line = 0;
		for (const input of this.inputs) {
			const q = quantize.get(input);
			if (q) line = Math.max(line, divisionMs(q, tempo));
		}
		return line ? Math.max(1, Math.ceil(gap / line - 1e-9)) * line : gap;
	}

	path(gap: number): InputEvent[] {
		const moves: number[] = [];
		for (let i = this.found; this.parent[i] >= 0; i = this.parent[i]) moves.push(this.move[i]);
		const step = this.spacing(gap);
		return moves.reverse().map((m, j) => ({
			t: (j + 1) * step,
			input: this.inputs[m >> 1],
			type: m & 1 ? 'release' : 'press'
		}));
	}

	result(status: VerifyResult['status'], gap: number): VerifyResult {
		const base = { statesExplored: this.head, padsFolded: this.padsFolded, scope: PROOF_SCOPE };
		if (status !== 'broken') return { ok: status === 'proved', status, ...base };
		const counterexample = this.path(gap);
		const last = counterexample.length - 1;
		const finding = analyze(this.mapping, counterexample).find((f) => f.event === last);
		return { ok: false, status, ...base, counterexample, ...(finding && { finding }) };
	}

	get status(): VerifyResult['status'] {
		return this.found >= 0 ? 'broken' : this.head >= this.states.length ? 'proved' : 'too-big';
	}
}

function check(mapping: Mapping, inputIds: string[]): string[] {
	const known = new Set(mapping.profile.inputs.map((i) => i.id));
	const missing = inputIds.filter((i) => !known.has(i));
	if (missing.length) throw new Error(`no input called ${missing.join(', ')} in this mapping`);
	return [...new Set(inputIds)];
}

/** The same search without yielding: for tools and tests that can wait. */
export function verifyGroupSync(mapping: Mapping, inputIds: string[], options: VerifyOptions = {}): VerifyResult {
	const search = new Search(mapping, check(mapping, inputIds), options.fold ?? true);
	const max = options.maxStates ?? 2_000_000;
	while (!search.run(options.chunk ?? CHUNK, max)) options.onProgress?.(progress(search));
	return search.result(search.status, options.gapMs ?? 250);
}

function progress(s: Search): VerifyProgress {
	return { statesExplored: s.head, depth: s.depthOf[Math.max(0, s.head - 1)] ?? 0, frontier: s.states.length - s.head };
}

/** Explore every press/release order of `inputIds`; yields to the event loop between chunks. */
export async function verifyGroup(
	mapping: Mapping,
	inputIds: string[],
	options: VerifyOptions = {}
): Promise<VerifyResult> {
	const search = new Search(mapping, check(mapping, inputIds), options.fold ?? true);
	const max = options.maxStates ?? 2_000_000;
	for (;;) {
		if (options.signal?.aborted) return search.result('cancelled', 0);
		if (search.run(options.chunk ?? CHUNK, max)) break;
		options.onProgress?.(progress(search));
		await new Promise((resolve) => setTimeout(resolve, 0));
	}
	return search.result(search.status, options.gapMs ?? 250);
}

/** Inputs of a hold group, in binding order. */
export function groupInputs(mapping: Mapping, group: string): string[] {
	return [...new Set(mapping.bindings.filter((b) => b.group === group).map((b) => b.input))];
}

export function groupIds(mapping: Mapping): string[] {
	return [...new Set(mapping.bindings.flatMap((b) => (b.group ? [b.group] : [])))];
}
