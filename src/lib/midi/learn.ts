// MIDI learn: build a controller profile by asking for one input at a time ("press the pad at
// row 2, column 3") and recording the address of the message that answers.
import type { ControllerInput, ControllerProfile } from '$lib/engine/types';
import type { MidiMessage } from './decode';

export interface LearnPlan {
	name: string;
	rows: number;
	cols: number;
	knobs: number;
}

export interface LearnPrompt {
	id: string;
	kind: 'pad' | 'knob';
	row?: number; // 0-based from the top
	col?: number;
	text: string;
}

export function learnPrompts(plan: LearnPlan): LearnPrompt[] {
	const prompts: LearnPrompt[] = [];
	for (let row = 0; row < plan.rows; row++) {
		for (let col = 0; col < plan.cols; col++) {
			prompts.push({
				id: `pad-${row * plan.cols + col + 1}`,
				kind: 'pad',
				row,
				col,
				text: `Press the pad at row ${row + 1}, column ${col + 1}`
			});
		}
	}
	for (let k = 0; k < plan.knobs; k++) {
		prompts.push({ id: `knob-${k + 1}`, kind: 'knob', text: `Turn knob ${k + 1}` });
	}
	return prompts;
}

export type LearnAnswer =
	{ ok: true; input: ControllerInput } | { ok: false; reason: 'ignored' | 'taken'; takenBy?: string };

const address = (i: Pick<ControllerInput, 'channel' | 'note' | 'cc'>) =>
	i.note !== undefined ? `note ${i.channel}:${i.note}` : `cc ${i.channel}:${i.cc}`;

/**
 * What a message means for the current prompt. Releases and messages of the wrong sort are
 * ignored (a pad's own Note Off arrives after every press); an address already learned is refused.
 */
export function answerPrompt(
	prompt: LearnPrompt,
	message: MidiMessage,
	learned: readonly ControllerInput[]
): LearnAnswer {
	const channel = message.channel;
	if (channel === undefined || message.data1 === undefined) return { ok: false, reason: 'ignored' };
	let input: ControllerInput;
	if (prompt.kind === 'pad') {
		if (message.kind === 'note-on' && (message.data2 ?? 0) > 0) {
			input = {
				id: prompt.id,
				kind: 'pad',
				channel,
				note: message.data1,
				led: { note: message.data1, on: 127, off: 0 }
			};
		} else if (message.kind === 'cc' && (message.data2 ?? 0) >= 64) {
			input = { id: prompt.id, kind: 'pad', channel, cc: message.data1 };
		} else return { ok: false, reason: 'ignored' };
		input.row = prompt.row;
		input.col = prompt.col;
		input.label = `Pad ${prompt.row! + 1}·${prompt.col! + 1}`;
	} else {
		if (message.kind !== 'cc') return { ok: false, reason: 'ignored' };
		input = { id: prompt.id, kind: 'knob', label: prompt.text.replace('Turn k', 'K'), channel, cc: message.data1 };
	}
	const clash = learned.find((l) => l.id !== input.id && address(l) === address(input));
	if (clash) return { ok: false, reason: 'taken', takenBy: clash.label ?? clash.id };
	return { ok: true, input };
}

export function learnedProfile(plan: LearnPlan, learned: readonly ControllerInput[]): ControllerProfile {
	return { name: plan.name.trim() || 'Learned controller', rows: plan.rows, cols: plan.cols, inputs: [...learned] };
}
