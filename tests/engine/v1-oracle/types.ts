// The version 1 engine as it stood before the rack model changed, kept only as the test oracle for
// upgrade.test.ts: version 1 replay must equal the replay of the upgraded version 2 document.
// The engine's shared vocabulary (DESIGN.md §2, §4). Every layer — engine, midi, audio, UI,
// server — speaks these types; the zod schema in mapping.ts produces exactly these shapes.

export const DECK_IDS = ['A', 'B', 'C', 'D'] as const;
export type DeckId = (typeof DECK_IDS)[number];

export const RACK_COUNT = 4;
export const SLOT_COUNT = 3;
export const PARAM_COUNT = 3;

export const RACK_MODES = ['chain', 'focus'] as const;
export type RackMode = (typeof RACK_MODES)[number];

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

/** What a step changes. Rack and slot numbers are 1-based, as people count them. */
export type Target =
	| { kind: 'rack-on'; rack: number }
	| { kind: 'rack-mode'; rack: number }
	| { kind: 'rack-mix'; rack: number }
	| { kind: 'rack-route'; rack: number; deck: DeckId }
	| { kind: 'slot-effect'; rack: number; slot: number }
	| { kind: 'slot-on'; rack: number; slot: number }
	| { kind: 'slot-amount'; rack: number; slot: number }
	| { kind: 'focus-param'; rack: number; param: number }
	| { kind: 'deck-play'; deck: DeckId }
	| { kind: 'counter'; counter: string };

export type GuardOp = '=' | '!=' | '<' | '<=' | '>' | '>=';
export interface Guard {
	counter: string;
	op: GuardOp;
	value: number;
}

/**
 * `value` meaning by target: rack-mode → 'chain' | 'focus'; slot-effect → an EffectId or null
 * (empty slot); rack-mix, slot-amount, focus-param → 0..1; on/route/play targets → 0 | 1;
 * counter (`set`) → an integer.
 */
export type StepValue = number | RackMode | EffectId | null;

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
	group?: string; // legato group id
	quantize?: Quantize;
	steps: Step[];
}

export interface Mapping {
	version: 1;
	name: string;
	decks: 2 | 4;
	tempo?: number; // default rig tempo in BPM
	profile: ControllerProfile;
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

export interface SlotState {
	effect: EffectId | null;
	on: boolean;
	amount: number;
}

export interface RackState {
	on: boolean;
	mix: number;
	mode: RackMode;
	slots: SlotState[]; // SLOT_COUNT entries
	params: number[]; // PARAM_COUNT focus parameters, 0..1; the focus effect is slot 1's
	routes: Record<DeckId, boolean>;
}

export interface DeckState {
	playing: boolean;
}

export interface RigState {
	racks: RackState[]; // RACK_COUNT entries, index 0 is rack 1
	decks: Record<DeckId, DeckState>;
	counters: Record<string, number>;
	held: string[]; // input ids held down, in press order
}

/** One change to the rig, as the audio layer and the UI follow it. */
export interface RigChange {
	t: number;
	event: number; // index of the causing input event
	path: string; // e.g. 'racks.0.on', 'racks.1.routes.B', 'racks.0.slots.2.effect', 'counters.held'
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

export const FINDING_KINDS = ['dropout', 'stuck', 'leak', 'clash', 'drift', 'clamp'] as const;
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

/** A recorded rehearsal (our own format, version 1). Times are ms from `startedAt`. */
export interface SessionEvent {
	t: number;
	midi?: number[]; // the raw message bytes, when it came from a device
	input: { input: string; type: 'press' | 'release' | 'turn'; value?: number } | null; // null: unmapped
}

export interface SessionDocument {
	version: 1;
	tempo: number;
	startedAt: string; // ISO 8601
	mapping?: string;
	events: SessionEvent[];
}
