// Findings as they happen. The engine decides what a finding is: after each event lands, the
// watch rules (watch.ts) say which conditions hold now; only when that set changes — or a count
// clamps, or a pad on a clashing address sounds — is `analyze` run again over the events that
// have landed so far, and its findings are shown. So the room never re-states a finding rule and
// shows exactly what a replay of the same events would.
import { analyze, type Finding, type InputEvent, type Mapping, type RigChangesEmitted } from '$lib/engine';
import {
	conditions,
	initialWatch,
	inputName,
	observe,
	rackBits,
	rulesFor,
	takeovers,
	type WatchState
} from '$lib/engine/watch';

/** The room's beat clock as the live findings read it: a constant tempo from `origin`. */
export interface RoomTempo {
	tempo: number;
	origin: number;
}

export interface LiveFinding extends Finding {
	/** Who the finding is about, in the mapping's words: the binding's label, else the pad's. */
	pad: string | null;
}

export class LiveFindings {
	all = $state.raw<LiveFinding[]>([]);
	readonly #mapping: Mapping;
	#watch: WatchState;
	#keys = '';
	#analyses = 0;

	constructor(mapping: Mapping) {
		this.#mapping = mapping;
		this.#watch = initialWatch(rulesFor(mapping));
	}

	/** Still going: the condition holds after the latest event. */
	get open(): LiveFinding[] {
		return this.all.filter((f) => f.end === null);
	}

	get closed(): LiveFinding[] {
		return this.all.filter((f) => f.end !== null);
	}

	/** How often `analyze` ran (the cheap watch check skips the rest); for tests. */
	get analyses(): number {
		return this.#analyses;
	}

	/** Follows one landed event; `landed` are the events applied so far, in their received order. */
	follow(emitted: RigChangesEmitted, event: InputEvent, landed: () => readonly InputEvent[], clock: RoomTempo): void {
		const rules = rulesFor(this.#mapping);
		const bits = rackBits(emitted.changes);
		const took = takeovers(rules, this.#watch, event.input, event.type, bits.reshaped).length > 0;
		this.#watch = observe(rules, this.#watch, event.input, event.type, emitted.setUp, emitted.state, bits.reshaped);
		const keys = conditions(rules, emitted.state, this.#watch)
			.map((c) => c.key)
			.join('\n');
		const clash = event.type === 'press' && rules.clashInputs.has(event.input);
		if (keys === this.#keys && !emitted.clamps.length && !clash && !took) return;
		this.#keys = keys;
		this.#analyses++;
		this.all = analyze(this.#mapping, landed(), { tempo: clock.tempo, origin: clock.origin }).map((f) => ({
			...f,
			pad: this.#name(f)
		}));
	}

	reset(): void {
		this.#watch = initialWatch(rulesFor(this.#mapping));
		this.#keys = '';
		this.all = [];
	}

	#name(f: Finding): string | null {
		const b = f.binding !== null && f.binding >= 0 ? this.#mapping.bindings[f.binding] : null;
		if (b) {
			const pad = inputName(this.#mapping, b.input);
			return b.label && b.label !== pad ? `${b.label} (${pad})` : pad;
		}
		return f.input ? inputName(this.#mapping, f.input) : null;
	}
}
