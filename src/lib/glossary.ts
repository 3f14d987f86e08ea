// Every term a user meets in Padproof, with one plain line each (DESIGN.md §2). The glossary page
// lists them; the Term component shows a line where a term first appears on a screen.

export interface GlossaryEntry {
	/** Anchor on the glossary page: /help#hold-group. */
	id: string;
	term: string;
	line: string;
	group: GlossaryGroup;
}

export type GlossaryGroup = 'mapping' | 'rig' | 'recording' | 'findings' | 'teaching' | 'midi';

export const GLOSSARY_GROUPS: { id: GlossaryGroup; title: string }[] = [
	{ id: 'mapping', title: 'Your mapping' },
	{ id: 'rig', title: 'The rig you hear' },
	{ id: 'recording', title: 'Recording and replay' },
	{ id: 'findings', title: 'What can go wrong on stage' },
	{ id: 'teaching', title: 'Classes' },
	{ id: 'midi', title: 'MIDI and sound words' }
];

const entries: [GlossaryGroup, string, string][] = [
	[
		'mapping',
		'mapping',
		'The whole plan for one controller: which pad does what, its counters and how many decks it drives.'
	],
	[
		'mapping',
		'controller profile',
		'The controller’s physical pads, knobs and buttons, with the MIDI message each one sends and where it sits.'
	],
	['mapping', 'binding', 'One pad, knob or button and the list of steps it runs.'],
	['mapping', 'step', 'One change a binding makes to the rig, such as “switch rack 1 on” or “route rack 1 to deck A”.'],
	[
		'mapping',
		'action',
		'How a step changes its target: on while held, flip, set a value, count up, count down or reset.'
	],
	['mapping', 'phase', 'Whether a step runs when the pad goes down (press) or when it comes up (release).'],
	[
		'mapping',
		'guard',
		'A condition on a counter that must hold for a step to run, such as “only when no pad is held”.'
	],
	[
		'mapping',
		'counter',
		'A whole number the mapping keeps, often counting how many fingers are down on a row of pads.'
	],
	[
		'mapping',
		'hold group',
		'Pads that share one effect and one held-pad counter, so the effect stays on until the last finger lifts.'
	],
	[
		'mapping',
		'intent',
		'What a pad is meant to do to its effect: on only while held, latched on until pressed again, or neither.'
	],
	[
		'mapping',
		'one-press pad',
		'A pad that sets up a whole rack on its own — effect, parameters, mix, routing — and switches it on.'
	],
	['rig', 'rig', 'The simulated setup a mapping plays: decks, racks, counters and the master output.'],
	['rig', 'deck', 'A player (A–D) looping a demo track at the rig’s tempo.'],
	[
		'rig',
		'rack',
		'A place for effects that the mapping declares: on or off, a dry/wet mix, which decks it reaches, and its chain.'
	],
	[
		'rig',
		'chain',
		'The effects inside a rack, one to four in order, each with its own on switch and three parameters.'
	],
	['rig', 'routing', 'Which decks a rack’s effect is applied to.'],
	['rig', 'ready', 'A deck whose loop is chosen and waiting: it plays as soon as sound is started.'],
	['rig', 'master', 'The final output all decks pass through, with a limiter that keeps peaks below −1 dBFS.'],
	['recording', 'session', 'One recorded rehearsal: every press and release with its time, and optionally the audio.'],
	['recording', 'take', 'One run of the record button, from Record to Stop; it becomes a session.'],
	[
		'recording',
		'unfinished session',
		'A recording that never got its Stop (the page closed, say); its events are kept and you can close it.'
	],
	[
		'recording',
		'replay',
		'Running a session’s presses through a mapping again to see and hear what happened, press by press.'
	],
	[
		'recording',
		'finding',
		'Something in a mapping or a session that would go wrong on stage, with the press that caused it.'
	],
	[
		'recording',
		'verifier',
		'A check that tries every order of pressing and releasing a group of pads and proves none of them breaks.'
	],
	['recording', 'trash', 'Where deleted mappings and sessions wait for 30 days, so you can restore them.'],
	['findings', 'dropout', 'A pad is held but its effect is not heard on the deck it should reach.'],
	['findings', 'stuck on', 'An effect is still heard after the last pad of its group was released.'],
	['findings', 'bleed', 'An effect is heard on a deck it should not reach.'],
	['findings', 'clash', 'Two bindings answer the same MIDI message, so one press does two things.'],
	[
		'findings',
		'count left over',
		'A counter is not back at rest when no pad of its group is held, so the next press starts wrong.'
	],
	['findings', 'count overflow', 'A counter was asked to go past its limit (or below zero) and stopped there.'],
	['findings', 'takeover', 'Another pad changes or cuts a rack while a latched effect is still on in it.'],
	['teaching', 'class', 'A teacher’s group of students who get the same drills.'],
	[
		'teaching',
		'drill',
		'A practice exercise: which pads to play on which beats, at what tempo, and what counts as a pass.'
	],
	['teaching', 'assignment', 'A drill given to a class with a due date.'],
	[
		'teaching',
		'submission',
		'A student’s recorded session handed in for an assignment, scored for timing and mistakes.'
	],
	['midi', 'MIDI', 'The standard language controllers use to tell a computer which pad went down, how hard, and when.'],
	['midi', 'note', 'The MIDI message most pads send: a number for the pad, “on” when pressed and “off” when released.'],
	['midi', 'CC', 'Control Change: the MIDI message knobs, faders and some buttons send, with a value from 0 to 127.'],
	['midi', 'channel', 'One of MIDI’s 16 lanes; a controller’s messages carry the channel they were sent on.'],
	['midi', 'velocity', 'How hard a pad was hit, 1–127; a note with velocity 0 counts as a release.'],
	['midi', 'MIDI learn', 'Teaching Padproof a controller by pressing its pads one after another.'],
	['midi', 'MIDI monitor', 'A live list of every message a controller sends, for checking what a pad really does.'],
	['midi', 'BPM', 'Beats per minute: the tempo the decks and beat-synced effects follow.'],
	[
		'midi',
		'quantize',
		'Holding a pad’s change until the next line of the beat grid (1/4, 1/8, 1/16), so it lands in time.'
	],
	['midi', 'dry/wet', 'How much of the effect you hear against the untouched sound: 0 is all dry, 1 is all effect.'],
	['midi', 'limiter', 'A safety stage on the master that stops peaks from getting louder than a set ceiling.'],
	[
		'midi',
		'Standard MIDI File',
		'A .mid file: the common file format for recorded MIDI, which Padproof imports as a session.'
	]
];

const slug = (term: string) =>
	term
		.toLowerCase()
		.replace(/[^a-z0-9]+/g, '-')
		.replace(/^-|-$/g, '');

export const GLOSSARY: GlossaryEntry[] = entries.map(([group, term, line]) => ({ id: slug(term), term, line, group }));

const byId = new Map(GLOSSARY.map((e) => [e.id, e]));

/** Other names the code uses for a glossary term (finding kinds, the builder's `legatoRow`). */
const ALIASES: Record<string, string> = {
	stuck: 'stuck-on',
	leak: 'bleed',
	drift: 'count-left-over',
	clamp: 'count-overflow',
	'legato-row': 'hold-group',
	legato: 'hold-group',
	group: 'hold-group'
};

/** The entry for an anchor id (`hold-group`), a term as written (`Hold group`) or a code name (`leak`). */
export function glossaryEntry(idOrTerm: string): GlossaryEntry | undefined {
	const id = slug(idOrTerm);
	return byId.get(idOrTerm) ?? byId.get(id) ?? byId.get(ALIASES[id] ?? '');
}
