import { auth } from '$lib/server/auth';
import { safeNext } from '$lib/server/next';
import { email, formObject, validate, type FieldErrors } from '$lib/server/validate';
import { fail, redirect } from '@sveltejs/kit';
import { APIError } from 'better-auth/api';
import { z } from 'zod';
import type { Actions } from './$types';

const SignIn = z.object({
	email,
	password: z.string().min(1, { error: 'Enter your password.' })
});

export const actions: Actions = {
	default: async ({ request, url }) => {
		const fields = formObject(await request.formData());
		const parsed = validate(SignIn, fields);
		if (!parsed.ok) return fail(400, { email: fields.email ?? '', errors: parsed.errors, message: parsed.message });
		try {
			await auth.api.signInEmail({ body: parsed.data, headers: request.headers });
		} catch (e) {
			if (e instanceof APIError) {
				return fail(400, {
					email: parsed.data.email,
					errors: {} as FieldErrors,
					message: 'That email and password do not match an account.'
				});
			}
			throw e;
		}
		redirect(303, safeNext(url.searchParams.get('next')));
	}
};
