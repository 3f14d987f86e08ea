// The engine's shared vocabulary (DESIGN.md §2, §4). Every layer — engine, midi, audio, UI,
// server — speaks these types; the zod schema in mapping.ts produces exactly these shapes.

export const DECK_IDS = ['A', 'B', 'C', 'D'] as const;
export type DeckId = (typeof DECK_IDS)[number];

/** A mapping declares 1–8 racks; each rack's chain holds 1–4 effect positions of 3 parameters. */
export const MAX_RACKS = 8;
export const CHAIN_MAX = 4;
export const PARAM_COUNT = 3;

export const EFFECT_IDS = [
	'echo',
	'ping-pong',
	'tape-echo',
	'reverb',
	'filter',
	'stutter',
	'gate',
	'bitcrush',
	'flanger',
	'phaser'
] as const;
export type EffectId = (typeof EFFECT_IDS)[number];

export const ACTIONS = ['momentary', 'toggle', 'set', 'count-up', 'count-down', 'reset'] as const;
export type Action = (typeof ACTIONS)[number];

export const PHASES = ['press', 'release'] as const;
export type Phase = (typeof PHASES)[number];

export const INTENTS = ['while-held', 'latched'] as const;
export type Intent = (typeof INTENTS)[number];

export const QUANTIZE = ['off', '1/4', '1/8', '1/16'] as const;
export type Quantize = (typeof QUANTIZE)[number];

export const INPUT_KINDS = ['pad', 'knob', 'fader', 'button'] as const;
export type InputKind = (typeof INPUT_KINDS)[number];

/** What a step changes. Rack, position and parameter numbers are 1-based, as people count them. */
export type Target =
	| { kind: 'rack-on'; rack: number }
	| { kind: 'rack-mix'; rack: number }
	| { kind: 'rack-route'; rack: number; deck: DeckId }
	| { kind: 'chain'; rack: number }
	| { kind: 'effect'; rack: number; position: number }
	| { kind: 'effect-on'; rack: number; position: number }
	| { kind: 'effect-param'; rack: number; position: number; param: number }
	| { kind: 'deck-play'; deck: DeckId }
	| { kind: 'counter'; counter: string };

export type TargetKind = Target['kind'];

export type GuardOp = '=' | '!=' | '<' | '<=' | '>' | '>=';
export interface Guard {
	counter: string;
	op: GuardOp;
	value: number;
}

/**
 * `value` meaning by target: chain → the effect ids to load, 1–4 (every position on, parameters at
 * their defaults, positions past the list emptied); effect → an EffectId, or null to empty the
 * position; rack-mix, effect-param → 0..1; on/route/play targets → 0 | 1; counter (`set`) → an
 * integer.
 */
export type StepValue = number | EffectId | EffectId[] | null;

export interface Step {
	target: Target;
	action: Action;
	value?: StepValue;
	phase?: Phase;
	guards?: Guard[];
}

export interface ControllerInput {
	id: string;
	kind: InputKind;
	label?: string;
	channel: number; // 1–16
	note?: number; // 0–127, pads and buttons sent as notes
	cc?: number; // 0–127, knobs, faders and CC buttons
	row?: number; // grid position of pads, 0-based from the top
	col?: number;
	led?: { note: number; on?: number; off?: number }; // light feedback velocities
}

export interface ControllerProfile {
	name: string;
	rows?: number;
	cols?: number;
	inputs: ControllerInput[];
}

export interface Counter {
	id: string;
	label?: string;
	max: number; // default 15
	rest: number; // value when no pad of its group is held, default 0
}

export interface Binding {
	input: string; // ControllerInput.id
	label?: string;
	intent?: Intent;
	deck?: DeckId; // target deck
	group?: string; // hold group id
	quantize?: Quantize; // press and release wait for the grid line (DESIGN.md §4.5)
	releaseAtOnce?: boolean; // with quantize: the release acts at once instead of on the grid
	takeover?: boolean; // allowed to take over a rack a latched pad holds (a kill pad): no finding
	steps: Step[];
}

/** A rack the mapping declares; steps address it by its 1-based place in `Mapping.racks`. */
export interface RackDecl {
	id: string;
	label: string;
}

/** The mapping document, version 2 (our own format). Version 1 documents are upgraded on read. */
export interface Mapping {
	version: 2;
	name: string;
	decks: 2 | 4;
	tempo?: number; // default rig tempo in BPM
	profile: ControllerProfile;
	racks: RackDecl[]; // 1–8
	counters: Counter[];
	bindings: Binding[];
}

/** An input event after decoding (DESIGN.md §4.1); time in ms on the session clock. */
export interface InputEvent {
	t: number;
	input: string;
	type: 'press' | 'release' | 'turn';
	value?: number; // turn: 0..1
}

/** One place in a rack's chain. An empty position (effect null) is always silent. */
export interface PositionState {
	effect: EffectId | null;
	on: boolean;
	params: number[]; // PARAM_COUNT values, 0..1
}

export interface RackState {
	on: boolean;
	mix: number;
	routes: Record<DeckId, boolean>;
	chain: PositionState[]; // CHAIN_MAX entries; a loaded chain fills the first ones
}

export interface DeckState {
	playing: boolean;
}

export interface RigState {
	racks: RackState[]; // one per declared rack, index 0 is rack 1
	decks: Record<DeckId, DeckState>;
	counters: Record<string, number>;
	held: string[]; // input ids held down, in press order
}

/** One change to the rig, as the audio layer and the UI follow it. */
export interface RigChange {
	t: number;
	event: number; // index of the causing input event
	path: string; // e.g. 'racks.0.on', 'racks.1.routes.B', 'racks.0.chain.2.effect', 'counters.held'
	from: unknown;
	to: unknown;
}

// ---- Additions (issue 3). Everything above is unchanged; these are the engine's outputs. ----

/** A count step that hit 0 or its counter's max (DESIGN.md §4.3): recorded, never silent. */
export interface Clamp {
	t: number;
	event: number;
	counter: string;
	binding: number; // index into mapping.bindings
	step: number; // index into that binding's steps
	attempted: number; // the value the step asked for
	value: number; // the value it got
}

/** What `applyEvent` returns: the next state (structurally shared) and what changed. */
export interface StepResult {
	state: RigState;
	changes: RigChange[];
	clamps: Clamp[];
	/** Bit per rack (0-based) that a press or release ran a step on: that binding set the rack up now. */
	setUp: number;
}

/** One stretch of time in which a rack is audible on a deck (DESIGN.md §4.4). */
export interface AudibleInterval {
	rack: number; // 1-based
	deck: DeckId;
	start: number;
	end: number | null; // null: still audible when the events run out
	startEvent: number;
	endEvent: number | null;
}

export interface Timeline {
	changes: RigChange[];
	audible: AudibleInterval[];
	clamps: Clamp[];
	final: RigState;
	/** Event indexes in the order they were applied (quantized presses can land later). */
	order: number[];
}

export const FINDING_KINDS = [
	'dropout',
	'stuck-on',
	'bleed',
	'clash',
	'count-left-over',
	'count-overflow',
	'takeover'
] as const;
export type FindingKind = (typeof FINDING_KINDS)[number];

export interface Finding {
	kind: FindingKind;
	start: number;
	end: number | null; // null: still going when the events run out
	event: number; // index of the causing input event
	binding: number | null; // index into mapping.bindings
	input: string | null;
	deck: DeckId | null;
	rack: number | null; // 1-based
	counter: string | null;
	message: string;
}

/** A recorded rehearsal (our own format, version 2). Times are ms from `startedAt`. */
export interface SessionEvent {
	t: number;
	midi?: number[]; // the raw message bytes, when it came from a device
	input: { input: string; type: 'press' | 'release' | 'turn'; value?: number } | null; // null: unmapped
}

/** The beat clock a take was played on: ms of beat 0 and every tempo change (DESIGN.md §4.5). */
export interface SessionClock {
	zero: number;
	tempos: { at: number; bpm: number }[];
}

/** The rig as it stood when recording began, so replay starts where the take did. */
export interface SessionStart {
	held: string[];
	counters: Record<string, number>;
	racks: RackState[];
	decks: Record<DeckId, DeckState>;
}

/**
 * Version 2 adds the beat clock and the starting rig. A version 1 document still parses: its
 * clock is beat 0 at time 0 at its constant tempo, and it starts from the mapping's starting rig.
 */
export interface SessionDocument {
	version: 2;
	tempo: number; // the tempo when recording began
	startedAt: string; // ISO 8601
	mapping?: string;
	clock: SessionClock;
	initial?: SessionStart;
	events: SessionEvent[];
}
