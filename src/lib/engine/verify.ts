// The verifier (DESIGN.md §4.7): breadth-first search over every press/release interleaving of a
// group of inputs, checking the finding rules of watch.ts at every state. Breadth first means the
// first broken state found is reached by a shortest event sequence, which comes back as a
// counterexample ready to load into replay. States are deduplicated on a projection of the rig to
// what the rules and future steps can observe: on/off switches, routes, "mix above 0", "slot has
// an effect", counters, held pads, pads played, and the target deck of whoever last set up each
// rack. Parameter values, amounts and which effect sits in a slot never change what a step does
// (steps write constants; guards read counters only), so states differing only there behave alike.
import { analyze } from './analyze';
import { applyEvent, initialRigState } from './rig';
import { conditions, initialWatch, observe, rulesFor, type Rules, type WatchState } from './watch';
import { DECK_IDS, type Finding, type InputEvent, type Mapping, type RigState } from './types';

export interface VerifyProgress {
	statesExplored: number;
	depth: number;
	frontier: number;
}

export interface VerifyOptions {
	onProgress?: (p: VerifyProgress) => void;
	signal?: AbortSignal;
	maxStates?: number; // default 2,000,000: past it the answer is "unknown", not a proof
	gapMs?: number; // spacing of counterexample events, default 250 ms
	chunk?: number; // states explored between progress reports (and yields), default 20,000
}

export interface VerifyResult {
	ok: boolean;
	status: 'proved' | 'broken' | 'cancelled' | 'too-big';
	statesExplored: number;
	counterexample?: InputEvent[];
	finding?: Finding; // what analyze reports on the counterexample's last event
}

const CHUNK = 20000;

class Search {
	readonly rules: Rules;
	readonly states: RigState[] = [];
	readonly watches: WatchState[] = [];
	readonly parent: number[] = [];
	readonly move: number[] = []; // input index × 2 + (1 when release)
	readonly depthOf: number[] = [];
	readonly seen = new Set<string>();
	readonly clashing: boolean[];
	head = 0;
	found = -1;
	readonly codes: number[] = [];
	/** What the key keeps of "who last set up a rack": its target deck and whether it latches. */
	readonly ownerCode: number[];

	constructor(
		readonly mapping: Mapping,
		readonly inputs: string[]
	) {
		this.rules = rulesFor(mapping);
		this.clashing = inputs.map((i) => this.rules.clashInputs.has(i));
		this.ownerCode = [
			0,
			...mapping.bindings.map((b) => 1 + (b.deck ? DECK_IDS.indexOf(b.deck) : 4) + (b.intent === 'latched' ? 8 : 0))
		];
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
		let held = 0;
		let bit = 0;
		for (let k = 0; k < this.inputs.length; k++) {
			if (s.held.includes(this.inputs[k])) held |= 1 << bit;
			if (++bit === 16) {
				codes.push(held);
				held = bit = 0;
			}
		}
		codes.push(held);
		for (let i = 0; i < s.racks.length; i++) {
			const r = s.racks[i];
			let x = (r.on ? 1 : 0) | (r.mix > 0 ? 2 : 0);
			for (let k = 0; k < r.chain.length; k++)
				x |= ((r.chain[k].effect !== null ? 1 : 0) | (r.chain[k].on ? 2 : 0)) << (2 + 2 * k);
			for (let k = 0; k < DECK_IDS.length; k++) x |= (r.routes[DECK_IDS[k]] ? 1 : 0) << (10 + k);
			codes.push(x, this.ownerCode[w.toucher[i] + 1]);
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
		for (let spent = 0; spent < budget; spent++) {
			if (this.head >= this.states.length) return true;
			const i = this.head++;
			const s = this.states[i];
			const depth = this.depthOf[i] + 1;
			for (let k = 0; k < n; k++) {
				const input = this.inputs[k];
				const type = s.held.includes(input) ? 'release' : 'press';
				const r = applyEvent(this.mapping, s, { t: depth, input, type }, depth - 1);
				const w = observe(this.rules, this.watches[i], input, type, r.setUp);
				const broken =
					r.clamps.length > 0 ||
					(type === 'press' && this.clashing[k]) ||
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

	path(gap: number): InputEvent[] {
		const moves: number[] = [];
		for (let i = this.found; this.parent[i] >= 0; i = this.parent[i]) moves.push(this.move[i]);
		return moves.reverse().map((m, j) => ({
			t: (j + 1) * gap,
			input: this.inputs[m >> 1],
			type: m & 1 ? 'release' : 'press'
		}));
	}

	result(status: VerifyResult['status'], gap: number): VerifyResult {
		const statesExplored = this.head;
		if (status !== 'broken') return { ok: status === 'proved', status, statesExplored };
		const counterexample = this.path(gap);
		const last = counterexample.length - 1;
		const finding = analyze(this.mapping, counterexample).find((f) => f.event === last);
		return { ok: false, status, statesExplored, counterexample, ...(finding && { finding }) };
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
	const search = new Search(mapping, check(mapping, inputIds));
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
	const search = new Search(mapping, check(mapping, inputIds));
	const max = options.maxStates ?? 2_000_000;
	for (;;) {
		if (options.signal?.aborted) return search.result('cancelled', 0);
		if (search.run(options.chunk ?? CHUNK, max)) break;
		options.onProgress?.(progress(search));
		await new Promise((resolve) => setTimeout(resolve, 0));
	}
	return search.result(search.status, options.gapMs ?? 250);
}

/** Inputs of a legato group, in binding order. */
export function groupInputs(mapping: Mapping, group: string): string[] {
	return [...new Set(mapping.bindings.filter((b) => b.group === group).map((b) => b.input))];
}

export function groupIds(mapping: Mapping): string[] {
	return [...new Set(mapping.bindings.flatMap((b) => (b.group ? [b.group] : [])))];
}
