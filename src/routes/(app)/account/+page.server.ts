import { auth } from '$lib/server/auth';
import { sendMail } from '$lib/server/mail';
import { requireArea } from '$lib/server/roles';
import { formObject, password, validate, type FieldErrors } from '$lib/server/validate';
import { fail } from '@sveltejs/kit';
import { APIError } from 'better-auth/api';
import { z } from 'zod';
import type { Actions } from './$types';

const ChangePassword = z
	.object({
		currentPassword: z.string().min(1, { error: 'Enter your current password.' }),
		newPassword: password,
		confirm: z.string()
	})
	.refine((v) => v.newPassword === v.confirm, { path: ['confirm'], error: 'The two new passwords differ.' });

export const actions: Actions = {
	password: async ({ request, locals }) => {
		const user = requireArea(locals, 'app');
		const parsed = validate(ChangePassword, formObject(await request.formData()));
		if (!parsed.ok) return fail(400, { errors: parsed.errors, message: parsed.message });
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
				const message = /invalid password/i.test(e.message) ? 'Your current password is not right.' : e.message;
				return fail(400, { errors: { currentPassword: message } as FieldErrors, message });
			}
			throw e;
		}
		await sendMail({
			to: user.email,
			subject: 'Your Padproof password was changed',
			text: 'If this was not you, tell your school admin at once.\n'
		});
		return { changed: true };
	}
};
