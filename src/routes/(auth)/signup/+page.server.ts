import { auth } from '$lib/server/auth';
import { sendMail } from '$lib/server/mail';
import { safeNext } from '$lib/server/next';
import { email, formObject, password, validate, type FieldErrors } from '$lib/server/validate';
import { fail, redirect } from '@sveltejs/kit';
import { APIError } from 'better-auth/api';
import { z } from 'zod';
import type { Actions } from './$types';

const SignUp = z
	.object({
		name: z
			.string()
			.trim()
			.min(1, { error: 'Tell us your name.' })
			.max(80, { error: 'Keep the name under 80 characters.' }),
		email,
		password,
		confirm: z.string()
	})
	.refine((v) => v.password === v.confirm, { path: ['confirm'], error: 'The two passwords differ.' });

export const actions: Actions = {
	default: async ({ request, url }) => {
		const fields = formObject(await request.formData());
		const parsed = validate(SignUp, fields);
		const values = { name: fields.name ?? '', email: fields.email ?? '' };
		if (!parsed.ok) return fail(400, { ...values, errors: parsed.errors, message: parsed.message });
		const { name, email: address, password: secret } = parsed.data;
		try {
			await auth.api.signUpEmail({ body: { name, email: address, password: secret }, headers: request.headers });
		} catch (e) {
			if (e instanceof APIError) {
				const taken = /exist/i.test(e.message);
				const message = taken ? 'An account with this email exists already. Sign in instead.' : e.message;
				return fail(400, { ...values, errors: (taken ? { email: message } : {}) as FieldErrors, message });
			}
			throw e;
		}
		await sendMail({
			to: address,
			subject: 'Welcome to Padproof',
			text: `Hello ${name},\n\nyour Padproof account is ready. Sign in at ${url.origin}/signin to rehearse your pads.\n`
		});
		redirect(303, safeNext(url.searchParams.get('next')));
	}
};
