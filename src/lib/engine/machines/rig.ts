// The live rig actor (xstate 5). It holds the rig state between MIDI messages and handles what has
// a lifecycle around the step semantics: the running event index, the beat clock, and quantized
// engage — a press on a quantized binding waits for its grid line as an xstate delayed event. What
// a step does is decided only by `applyEvent` (rig.ts) and when it lands only by `engageAt`
// (schedule.ts), the very functions replay uses, so live play and replay cannot disagree.
// Each applied event is announced with an emitted `changes` event (subscribe with `actor.on`).
import { enqueueActions, setup } from 'xstate';
import { applyEvent, initialRigState } from '../rig';
import { constantClock, withTempo } from '../clock';
import { clockFor, engageAt, type Clock } from '../schedule';
import type { Clamp, InputEvent, Mapping, RigChange, RigState } from '../types';

interface Pending {
	event: InputEvent;
	index: number;
	at: number;
}

export interface RigContext {
	mapping: Mapping;
	state: RigState;
	clock: Clock;
	nextIndex: number;
	pending: Pending[]; // by landing time, then index
	lastPressAt: Record<string, number>;
}

export type RigActorEvent =
	| { type: 'input'; event: InputEvent; index?: number }
	| { type: 'engage'; at: number }
	// With `at`: the tempo changes at that time, the beat kept where it is (a tempo history the
	// recorder stores). Without: a constant clock from beat 0 at `origin` (default: where it was).
	| { type: 'tempo'; bpm: number; origin?: number; at?: number }
	| { type: 'reset' };

export interface RigChangesEmitted {
	type: 'changes';
	index: number;
	at: number;
	changes: RigChange[];
	clamps: Clamp[];
	setUp: number; // racks this event set up (StepResult.setUp)
	state: RigState;
}

export interface RigActorInput {
	mapping: Mapping;
	tempo?: number;
	origin?: number; // session time of the beat clock's first beat
	clock?: Clock; // a whole beat clock, tempo changes included (wins over tempo and origin)
	from?: RigState; // the rig to start from (a replay of a take that began mid-play)
}

type Emit = (e: RigChangesEmitted) => void;

/** Apply every waiting event due by `now`, in landing order. */
function landDue(ctx: RigContext, now: number, emit: Emit): { state: RigState; pending: Pending[] } {
	let state = ctx.state;
	let k = 0;
	for (; k < ctx.pending.length && ctx.pending[k].at <= now; k++) {
		const p = ctx.pending[k];
		state = land(ctx.mapping, state, p, emit);
	}
	return { state, pending: k ? ctx.pending.slice(k) : ctx.pending };
}

function land(mapping: Mapping, state: RigState, p: Pending, emit: Emit): RigState {
	const e = p.at === p.event.t ? p.event : { ...p.event, t: p.at };
	const r = applyEvent(mapping, state, e, p.index);
	emit({
		type: 'changes',
		index: p.index,
		at: p.at,
		changes: r.changes,
		clamps: r.clamps,
		setUp: r.setUp,
		state: r.state
	});
	return r.state;
}

function insert(list: Pending[], p: Pending): Pending[] {
	const out = list.slice();
	let i = out.length;
	while (i > 0 && (out[i - 1].at > p.at || (out[i - 1].at === p.at && out[i - 1].index > p.index))) i--;
	out.splice(i, 0, p);
	return out;
}

export const rigMachine = setup({
	types: {
		context: {} as RigContext,
		events: {} as RigActorEvent,
		input: {} as RigActorInput,
		emitted: {} as RigChangesEmitted
	},
	actions: {
		receive: enqueueActions(({ context, event, enqueue }) => {
			if (event.type !== 'input') return;
			const e = event.event;
			const emits: RigChangesEmitted[] = [];
			const due = landDue(context, e.t, (x) => emits.push(x));
			const index = event.index ?? context.nextIndex;
			const at = engageAt(context.mapping, e, context.clock, context.lastPressAt[e.input]);
			const lastPressAt = e.type === 'press' ? { ...context.lastPressAt, [e.input]: at } : context.lastPressAt;
			let { state, pending } = due;
			if (at > e.t) {
				pending = insert(pending, { event: e, index, at });
				enqueue.raise({ type: 'engage', at }, { delay: at - e.t });
			} else state = land(context.mapping, state, { event: e, index, at }, (x) => emits.push(x));
			enqueue.assign({ state, pending, lastPressAt, nextIndex: Math.max(context.nextIndex, index + 1) });
			for (const x of emits) enqueue.emit(x);
		}),
		engage: enqueueActions(({ context, event, enqueue }) => {
			if (event.type !== 'engage') return;
			const emits: RigChangesEmitted[] = [];
			const { state, pending } = landDue(context, event.at, (x) => emits.push(x));
			enqueue.assign({ state, pending });
			for (const x of emits) enqueue.emit(x);
		}),
		retime: enqueueActions(({ context, event, enqueue }) => {
			if (event.type !== 'tempo') return;
			const clock =
				event.at !== undefined
					? withTempo(context.clock, event.bpm, event.at)
					: constantClock(event.bpm, event.origin ?? context.clock.zero);
			enqueue.assign({ clock });
		}),
		reset: enqueueActions(({ context, enqueue }) => {
			enqueue.assign({ state: initialRigState(context.mapping), pending: [], lastPressAt: {}, nextIndex: 0 });
		})
	}
}).createMachine({
	id: 'rig',
	context: ({ input }) => ({
		mapping: input.mapping,
		state: input.from ?? initialRigState(input.mapping),
		clock: input.clock ?? clockFor(input.mapping, input.tempo, input.origin),
		nextIndex: 0,
		pending: [],
		lastPressAt: {}
	}),
	initial: 'live',
	states: {
		live: {
			on: {
				input: { actions: 'receive' },
				engage: { actions: 'engage' },
				tempo: { actions: 'retime' },
				reset: { actions: 'reset' }
			}
		}
	}
});
