// The MIDI learn wizard's state: one prompt at a time, answered by messages from one port.
import type { ControllerInput, ControllerProfile } from '$lib/engine/types';
import type { MidiMessage } from './decode';
import { answerPrompt, learnedProfile, learnPrompts, type LearnPlan, type LearnPrompt } from './learn';

export class MidiLearn {
	readonly plan: LearnPlan;
	readonly prompts: LearnPrompt[];
	step = $state(0);
	learned = $state.raw<ControllerInput[]>([]);
	notice = $state('');

	constructor(plan: LearnPlan) {
		this.plan = plan;
		this.prompts = learnPrompts(plan);
	}

	get current(): LearnPrompt | null {
		return this.prompts[this.step] ?? null;
	}

	get done(): boolean {
		return this.step >= this.prompts.length;
	}

	/** Feeds one message; true when it answered the current prompt. */
	hear(message: MidiMessage): boolean {
		const prompt = this.current;
		if (!prompt) return false;
		const answer = answerPrompt(prompt, message, this.learned);
		if (!answer.ok) {
			if (answer.reason === 'taken') this.notice = `That one is already ${answer.takenBy}. ${prompt.text}.`;
			return false;
		}
		this.learned = [...this.learned.filter((l) => l.id !== prompt.id), answer.input];
		this.notice = '';
		this.step++;
		return true;
	}

	skip(): void {
		if (!this.done) this.step++;
		this.notice = '';
	}

	back(): void {
		if (this.step === 0) return;
		this.step--;
		const id = this.prompts[this.step].id;
		this.learned = this.learned.filter((l) => l.id !== id);
		this.notice = '';
	}

	profile(): ControllerProfile {
		return learnedProfile(this.plan, this.learned);
	}
}
