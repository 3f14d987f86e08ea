import { passwordChangedMail, sendCourtesyMail } from '$lib/server/account-mail';
import {
	countTokens,
	expiresInSeconds,
	listTokens,
	newTokenForm,
	revokeTokenForm,
	TOKEN_NAME_MAX,
	TOKENS_PER_PERSON
} from '$lib/server/api-tokens';
import { attemptSucceeded, authCode, refuseAttempt } from '$lib/server/attempts';
import { auth } from '$lib/server/auth';
import { db } from '$lib/server/db';
import { passwordProblem } from '$lib/server/passwords';
import { requireArea } from '$lib/server/roles';
import { releaseClaim } from '$lib/server/users';
import { currentPassword, formObject, password, validate, type FieldErrors } from '$lib/server/validate';
import { fail, redirect } from '@sveltejs/kit';
import { APIError } from 'better-auth/api';
import { z } from 'zod';
import type { Actions, PageServerLoad } from './$types';

const ChangePassword = z
	.object({ currentPassword, newPassword: password, confirm: z.string() })
	.refine((v) => v.newPassword === v.confirm, { path: ['confirm'], error: 'The two new passwords differ.' });

const DeleteAccount = z.object({
	password: currentPassword,
	confirm: z.literal('on', { error: 'Tick the box to confirm that everything is deleted.' })
});

export const load: PageServerLoad = async ({ locals }) => {
	const user = requireArea(locals, 'app');
	return { tokens: await listTokens(db, user.id), tokenLimits: { nameMax: TOKEN_NAME_MAX, count: TOKENS_PER_PERSON } };
};

/** A token refusal better-auth words for developers, in words for a person. */
function tokenProblem(e: APIError): string {
	const code = authCode(e);
	if (code === 'INVALID_NAME_LENGTH') return `Keep the name to ${TOKEN_NAME_MAX} characters or fewer.`;
	if (code === 'NAME_REQUIRED') return 'Give the token a name.';
	if (code === 'KEY_NOT_FOUND') return 'That token is already revoked.';
	return 'The token could not be saved. Please try again.';
}

export const actions: Actions = {
	createToken: async ({ request, locals }) => {
		const user = requireArea(locals, 'app');
		const form = formObject(await request.formData());
		const parsed = validate(newTokenForm, form);
		if (!parsed.ok)
			return fail(400, { action: 'token', errors: parsed.errors, message: parsed.message, name: form.name ?? '' });
		if ((await countTokens(db, user.id)) >= TOKENS_PER_PERSON) {
			const message = `You have ${TOKENS_PER_PERSON} tokens, the most one person may hold. Revoke one you no longer use first.`;
			return fail(409, { action: 'token', errors: {} as FieldErrors, message, name: parsed.data.name });
		}
		try {
			const created = await auth.api.createApiKey({
				body: { name: parsed.data.name, expiresIn: expiresInSeconds(parsed.data.expires) ?? undefined },
				headers: request.headers
			});
			return {
				action: 'token',
				created: {
					id: created.id,
					name: created.name ?? parsed.data.name,
					key: created.key,
					expiresAt: created.expiresAt
				}
			};
		} catch (e) {
			if (e instanceof APIError) {
				const message = tokenProblem(e);
				return fail(400, {
					action: 'token',
					errors: { name: message } as FieldErrors,
					message,
					name: parsed.data.name
				});
			}
			throw e;
		}
	},

	revokeToken: async ({ request, locals }) => {
		requireArea(locals, 'app');
		const parsed = validate(revokeTokenForm, formObject(await request.formData()));
		if (!parsed.ok) return fail(400, { action: 'revoke', errors: parsed.errors, message: parsed.message });
		try {
			await auth.api.deleteApiKey({ body: { keyId: parsed.data.id }, headers: request.headers });
		} catch (e) {
			// Someone else's token answers like a missing one: NOT_FOUND.
			if (e instanceof APIError)
				return fail(404, { action: 'revoke', errors: {} as FieldErrors, message: tokenProblem(e) });
			throw e;
		}
		return { action: 'revoke', revoked: true };
	},

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
			// The last-admin check may have marked the account disabled just before the deletion failed.
			if (!(e instanceof APIError && authCode(e) === 'INVALID_PASSWORD')) await releaseClaim(db, user.id);
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
