import { ZxcvbnFactory } from '@zxcvbn-ts/core';
import * as common from '@zxcvbn-ts/language-common';

export const MIN_PASSWORD = 10;
export const MAX_PASSWORD = 128;

/**
 * zxcvbn's score 3 means "safely unguessable: moderate protection from an offline slow-hash
 * scenario" (< 10^10 guesses) — the level its authors recommend as the least to accept
 * (zxcvbn-ts documentation, "score"; Wheeler, "zxcvbn", USENIX Security 2016).
 */
export const MIN_SCORE = 3;

let estimator: ZxcvbnFactory | undefined;

function strength(password: string, userInputs: string[]) {
	// The dictionaries are large; load them on first use, not at start.
	estimator ??= new ZxcvbnFactory({ dictionary: { ...common.dictionary }, graphs: common.adjacencyGraphs });
	return estimator.check(password, userInputs);
}

/** Words of this app that a password must not lean on, besides the person's own name and email. */
const APP_WORDS = ['padproof', 'mixlab'];

/** Why a new password is refused, in plain words, or null when it is fine. */
export function passwordProblem(password: string, personal: unknown[] = []): string | null {
	if (typeof password !== 'string') return 'Choose a password.';
	if (password.length < MIN_PASSWORD) return `Use at least ${MIN_PASSWORD} characters for the password.`;
	if (password.length > MAX_PASSWORD) return `Use at most ${MAX_PASSWORD} characters for the password.`;
	const inputs = [
		...APP_WORDS,
		...personal
			.flatMap((p) => (typeof p === 'string' ? p : '').toLowerCase().split(/[\s@.+_-]+/))
			.filter((w) => w.length > 2)
	];
	const result = strength(password, inputs);
	if (result.score >= MIN_SCORE) return null;
	const leansOnYou = result.sequence.some((s) => s.pattern === 'dictionary' && s.dictionaryName === 'userInputs');
	return leansOnYou
		? 'This password is too easy to guess: it is built on your name, your email or this app’s name. Add a few unrelated words.'
		: 'This password is too easy to guess: it is a common password or close to one. Try three or four unrelated words.';
}
