import { refuseAttempt } from '$lib/server/attempts';
import { auth } from '$lib/server/auth';
import { email, formObject, validate, type FieldErrors } from '$lib/server/validate';
import { fail } from '@sveltejs/kit';
import { z } from 'zod';
import type { Actions } from './$types';

const Forgot = z.object({ email });

export const actions: Actions = {
	default: async (event) => {
		const fields = formObject(await event.request.formData());
		const parsed = validate(Forgot, fields);
		if (!parsed.ok) return fail(400, { email: fields.email ?? '', errors: parsed.errors, message: parsed.message });
		const values = { email: parsed.data.email, errors: {} as FieldErrors };
		const refused = await refuseAttempt(event, 'reset-request', parsed.data.email);
		if (refused) return fail(429, { ...values, message: refused });
		try {
			await auth.api.requestPasswordReset({ body: { email: parsed.data.email }, headers: event.request.headers });
		} catch (e) {
			console.error('A reset link could not be sent:', e);
			return fail(503, {
				...values,
				message:
					'The reset mail could not be sent just now. Please try again in a few minutes, or ask your school’s admin.'
			});
		}
		// The same answer whether or not an account uses this address, so nobody can probe for accounts.
		return { sent: true, email: parsed.data.email };
	}
};
