import { z } from 'zod';
import { MAX_PASSWORD, passwordProblem } from './passwords';

export type FieldErrors = Record<string, string>;

export type Parsed<T> = { ok: true; data: T } | { ok: false; errors: FieldErrors; message: string };

/** Validates any input with a zod schema and returns the first problem per field, in plain words. */
export function validate<T>(schema: z.ZodType<T>, input: unknown): Parsed<T> {
	const result = schema.safeParse(input);
	if (result.success) return { ok: true, data: result.data };
	const errors: FieldErrors = {};
	for (const issue of result.error.issues) {
		const key = issue.path.join('.') || '_';
		errors[key] ??= issue.message;
	}
	return { ok: false, errors, message: Object.values(errors)[0] ?? 'Please check the form.' };
}

/** Reads a form's text fields into a plain object (files are left out). */
export function formObject(form: FormData): Record<string, string> {
	const out: Record<string, string> = {};
	for (const [key, value] of form) if (typeof value === 'string') out[key] = value;
	return out;
}

export const email = z
	.string({ error: 'Enter an email address like name@example.com.' })
	.trim()
	.toLowerCase()
	.max(254, { error: 'An email address has at most 254 characters.' }) // RFC 5321 §4.5.3.1 path limit
	.pipe(z.email({ error: 'Enter an email address like name@example.com.' }));

/** A new password: 10 to 128 characters and not a common one (see passwords.ts). */
export const password = z.string({ error: 'Choose a password.' }).superRefine((value, ctx) => {
	const problem = passwordProblem(value);
	if (problem) ctx.addIssue({ code: 'custom', message: problem });
});

/** A new password judged later together with the person's name and email (see passwordProblem). */
export const newPasswordText = z.string({ error: 'Choose a password.' });

/** A password being typed in to be checked: only bounded, never judged. */
export const currentPassword = z
	.string({ error: 'Enter your password.' })
	.min(1, { error: 'Enter your password.' })
	.max(MAX_PASSWORD, { error: 'That password is longer than any password here.' });

/** A person's display name, as the sign-up form and the auth API accept it. */
export const personName = z
	.string({ error: 'Tell us your name.' })
	.trim()
	.min(1, { error: 'Tell us your name.' })
	.max(80, { error: 'Keep the name under 80 characters.' });
