import { authCode, refuseAttempt } from '$lib/server/attempts';
import { auth } from '$lib/server/auth';
import { formObject, password, validate, type FieldErrors } from '$lib/server/validate';
import { fail, redirect } from '@sveltejs/kit';
import { APIError } from 'better-auth/api';
import { z } from 'zod';
import type { Actions, PageServerLoad } from './$types';

const Token = z.string().min(1).max(256);

/** Whether a reset token is still unused and unexpired (better-auth keeps it as a verification value). */
async function tokenValid(token: string): Promise<boolean> {
	const { internalAdapter } = await auth.$context;
	const row = await internalAdapter.findVerificationValue(`reset-password:${token}`);
	return Boolean(row && new Date(row.expiresAt) > new Date());
}

export const load: PageServerLoad = async ({ url }) => {
	const token = Token.safeParse(url.searchParams.get('token'));
	return { token: token.success ? token.data : '', valid: token.success && (await tokenValid(token.data)) };
};

const Reset = z
	.object({ token: Token, password, confirm: z.string() })
	.refine((v) => v.password === v.confirm, { path: ['confirm'], error: 'The two passwords differ.' });

const EXPIRED = 'This link has expired or was used already. Ask for a new one.';

export const actions: Actions = {
	default: async (event) => {
		const parsed = validate(Reset, formObject(await event.request.formData()));
		if (!parsed.ok) return fail(400, { errors: parsed.errors, message: parsed.message, expired: false });
		const refused = await refuseAttempt(event, 'reset');
		if (refused) return fail(429, { errors: {} as FieldErrors, message: refused, expired: false });
		try {
			await auth.api.resetPassword({ body: { token: parsed.data.token, newPassword: parsed.data.password } });
		} catch (e) {
			if (e instanceof APIError) {
				const expired = authCode(e) === 'INVALID_TOKEN' || authCode(e) === 'USER_NOT_FOUND';
				return fail(400, { errors: {} as FieldErrors, message: expired ? EXPIRED : e.message, expired });
			}
			throw e;
		}
		redirect(303, '/signin?done=reset');
	}
};
