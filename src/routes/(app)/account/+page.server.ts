import { passwordChangedMail, sendCourtesyMail } from '$lib/server/account-mail';
import { attemptSucceeded, authCode, refuseAttempt } from '$lib/server/attempts';
import { auth } from '$lib/server/auth';
import { passwordProblem } from '$lib/server/passwords';
import { requireArea } from '$lib/server/roles';
import { currentPassword, formObject, password, validate, type FieldErrors } from '$lib/server/validate';
import { fail, redirect } from '@sveltejs/kit';
import { APIError } from 'better-auth/api';
import { z } from 'zod';
import type { Actions } from './$types';

const ChangePassword = z
	.object({ currentPassword, newPassword: password, confirm: z.string() })
	.refine((v) => v.newPassword === v.confirm, { path: ['confirm'], error: 'The two new passwords differ.' });

const DeleteAccount = z.object({
	password: currentPassword,
	confirm: z.literal('on', { error: 'Tick the box to confirm that everything is deleted.' })
});

export const actions: Actions = {
	password: async (event) => {
		const { request, locals } = event;
		const user = requireArea(locals, 'app');
		const parsed = validate(ChangePassword, formObject(await request.formData()));
		if (!parsed.ok) return fail(400, { action: 'password', errors: parsed.errors, message: parsed.message });
		const personal = passwordProblem(parsed.data.newPassword, [user.name, user.email]);
		if (personal)
			return fail(400, { action: 'password', errors: { newPassword: personal } as FieldErrors, message: personal });
		const refused = await refuseAttempt(event, 'password', user.email);
		if (refused) return fail(429, { action: 'password', errors: {} as FieldErrors, message: refused });
		try {
			await auth.api.changePassword({
				body: {
					currentPassword: parsed.data.currentPassword,
					newPassword: parsed.data.newPassword,
					revokeOtherSessions: true
				},
				headers: request.headers
			});
		} catch (e) {
			if (e instanceof APIError) {
				const message = authCode(e) === 'INVALID_PASSWORD' ? 'Your current password is not right.' : e.message;
				return fail(400, { action: 'password', errors: { currentPassword: message } as FieldErrors, message });
			}
			throw e;
		}
		await attemptSucceeded(user.email);
		await sendCourtesyMail({ to: user.email, ...passwordChangedMail(user.name) });
		return { action: 'password', changed: true };
	},

	delete: async (event) => {
		const { request, locals } = event;
		const user = requireArea(locals, 'app');
		const parsed = validate(DeleteAccount, formObject(await request.formData()));
		if (!parsed.ok) return fail(400, { action: 'delete', errors: parsed.errors, message: parsed.message });
		const refused = await refuseAttempt(event, 'delete', user.email);
		if (refused) return fail(429, { action: 'delete', errors: {} as FieldErrors, message: refused });
		try {
			await auth.api.deleteUser({ body: { password: parsed.data.password }, headers: request.headers });
		} catch (e) {
			if (e instanceof APIError) {
				const wrong = authCode(e) === 'INVALID_PASSWORD';
				const message = wrong ? 'That is not your password.' : e.message;
				return fail(400, { action: 'delete', errors: (wrong ? { password: message } : {}) as FieldErrors, message });
			}
			throw e;
		}
		redirect(303, '/signin?done=deleted');
	}
};
