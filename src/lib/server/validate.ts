import { z } from 'zod';

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

export const email = z.email({ error: 'Enter an email address like name@example.com.' }).trim().toLowerCase();
export const password = z
	.string()
	.min(8, { error: 'Use at least 8 characters for the password.' })
	.max(128, { error: 'Use at most 128 characters for the password.' });
