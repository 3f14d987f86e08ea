import { attemptSucceeded, authCode, refuseAttempt } from '$lib/server/attempts';
import { auth } from '$lib/server/auth';
import { joinAfterSignIn } from '$lib/server/classes';
import { db } from '$lib/server/db';
import { safeNext } from '$lib/server/next';
import { currentPassword, email, formObject, validate, type FieldErrors } from '$lib/server/validate';
import { fail, redirect } from '@sveltejs/kit';
import { APIError } from 'better-auth/api';
import { z } from 'zod';
import type { Actions } from './$types';

const SignIn = z.object({ email, password: currentPassword });

export const actions: Actions = {
	default: async (event) => {
		const { request, url } = event;
		// Decided before signing in, so a bad `next` can never fail the request after the cookie is set.
		const next = safeNext(url.searchParams.get('next'));
		const fields = formObject(await request.formData());
		const parsed = validate(SignIn, fields);
		if (!parsed.ok) return fail(400, { email: fields.email ?? '', errors: parsed.errors, message: parsed.message });
		const values = { email: parsed.data.email, errors: {} as FieldErrors };
		const refused = await refuseAttempt(event, 'sign-in', parsed.data.email);
		if (refused) return fail(429, { ...values, message: refused });
		let who;
		try {
			({ user: who } = await auth.api.signInEmail({ body: parsed.data, headers: request.headers }));
		} catch (e) {
			if (authCode(e) === 'BANNED_USER') {
				return fail(403, {
					...values,
					message: 'This account is disabled. Ask your school’s admin to enable it again.'
				});
			}
			if (e instanceof APIError) {
				return fail(400, { ...values, message: 'That email and password do not match an account.' });
			}
			throw e;
		}
		await attemptSucceeded(parsed.data.email);
		// From an invitation link to this address: joined at once, no second click.
		redirect(303, await joinAfterSignIn(db, who, next));
	}
};
