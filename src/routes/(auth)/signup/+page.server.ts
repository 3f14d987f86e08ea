import { welcomeMail, sendCourtesyMail } from '$lib/server/account-mail';
import { authCode, refuseAttempt } from '$lib/server/attempts';
import { auth } from '$lib/server/auth';
import { joinAfterSignIn } from '$lib/server/classes';
import { db } from '$lib/server/db';
import { safeNext } from '$lib/server/next';
import { passwordProblem } from '$lib/server/passwords';
import { email, formObject, newPasswordText, personName, validate, type FieldErrors } from '$lib/server/validate';
import { fail, redirect } from '@sveltejs/kit';
import { APIError } from 'better-auth/api';
import { z } from 'zod';
import type { Actions } from './$types';

const SignUp = z
	.object({ name: personName, email, password: newPasswordText, confirm: z.string() })
	.superRefine((v, ctx) => {
		const problem = passwordProblem(v.password, [v.name, v.email]);
		if (problem) ctx.addIssue({ code: 'custom', path: ['password'], message: problem });
		if (v.password !== v.confirm)
			ctx.addIssue({ code: 'custom', path: ['confirm'], message: 'The two passwords differ.' });
	});

export const actions: Actions = {
	default: async (event) => {
		const { request, url } = event;
		const next = safeNext(url.searchParams.get('next'));
		const fields = formObject(await request.formData());
		const parsed = validate(SignUp, fields);
		const values = { name: fields.name ?? '', email: fields.email ?? '', taken: false };
		if (!parsed.ok) return fail(400, { ...values, errors: parsed.errors, message: parsed.message });
		const { name, email: address, password: secret } = parsed.data;
		const refused = await refuseAttempt(event, 'sign-up');
		if (refused) return fail(429, { ...values, errors: {} as FieldErrors, message: refused });
		let who;
		try {
			({ user: who } = await auth.api.signUpEmail({
				body: { name, email: address, password: secret },
				headers: request.headers
			}));
		} catch (e) {
			if (e instanceof APIError) {
				if (authCode(e).startsWith('USER_ALREADY_EXISTS')) {
					const message = 'An account with this email exists already.';
					return fail(400, { ...values, taken: true, errors: { email: message } as FieldErrors, message });
				}
				return fail(400, { ...values, errors: {} as FieldErrors, message: e.message });
			}
			throw e;
		}
		// The account exists and the person is signed in: a mail that cannot go out is no reason to fail.
		await sendCourtesyMail({ to: address, ...welcomeMail(name) });
		// From an invitation link to this address: joined at once, no second click.
		redirect(303, await joinAfterSignIn(db, who, next));
	}
};
