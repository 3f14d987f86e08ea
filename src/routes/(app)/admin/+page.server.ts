import { authCode, refuseAttempt } from '$lib/server/attempts';
import { auth } from '$lib/server/auth';
import { db } from '$lib/server/db';
import { requireArea, ROLES } from '$lib/server/roles';
import { changeRole, findUser, lastAdminProblem, listUsers, releaseClaim, RoleChangeError } from '$lib/server/users';
import { formObject, validate } from '$lib/server/validate';
import { fail } from '@sveltejs/kit';
import { APIError } from 'better-auth/api';
import { z } from 'zod';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, url }) => {
	const me = requireArea(locals, 'admin');
	const q = (url.searchParams.get('q') ?? '').slice(0, 200);
	return { q, me: me.id, users: await listUsers(db, q), showOutbox: !process.env.SMTP_URL };
};

const Target = z.object({ userId: z.string().min(1, { error: 'No account was chosen.' }).max(100) });
const SetRole = Target.extend({ role: z.enum(ROLES, { error: 'Choose admin, teacher or student.' }) });

type Done = { ok: true; userId: string; message: string };

/** Reads the chosen account; a refusal in plain words when it is missing or is the admin's own. */
async function target(request: Request, me: string, self: string) {
	const parsed = validate(Target, formObject(await request.formData()));
	if (!parsed.ok) return { refusal: fail(400, { ok: false, userId: '', message: parsed.message }) };
	const person = await findUser(db, parsed.data.userId);
	if (!person)
		return {
			refusal: fail(404, { ok: false, userId: parsed.data.userId, message: 'That account does not exist any more.' })
		};
	if (person.id === me) return { refusal: fail(400, { ok: false, userId: person.id, message: self }) };
	return { person };
}

function authRefusal(e: unknown, userId: string) {
	if (e instanceof APIError) return fail(400, { ok: false, userId, message: e.message });
	throw e;
}

export const actions: Actions = {
	setRole: async ({ request, locals }) => {
		requireArea(locals, 'admin');
		const parsed = validate(SetRole, formObject(await request.formData()));
		if (!parsed.ok) return fail(400, { ok: false, userId: '', message: parsed.message });
		try {
			const changed = await changeRole(db, parsed.data.userId, parsed.data.role);
			return { ok: true, userId: changed.id, message: `${changed.name} is now ${changed.role}.` } satisfies Done;
		} catch (e) {
			if (e instanceof RoleChangeError) return fail(409, { ok: false, userId: parsed.data.userId, message: e.message });
			throw e;
		}
	},

	disable: async ({ request, locals }) => {
		const me = requireArea(locals, 'admin');
		const { person, refusal } = await target(request, me.id, 'You cannot disable your own account.');
		if (refusal) return refusal;
		const lastAdmin = await lastAdminProblem(db, person.id, { claim: true });
		if (lastAdmin) return fail(409, { ok: false, userId: person.id, message: lastAdmin });
		try {
			await auth.api.banUser({ body: { userId: person.id }, headers: request.headers });
		} catch (e) {
			await releaseClaim(db, person.id);
			return authRefusal(e, person.id);
		}
		return {
			ok: true,
			userId: person.id,
			message: `${person.name} is disabled and signed out everywhere.`
		} satisfies Done;
	},

	enable: async ({ request, locals }) => {
		const me = requireArea(locals, 'admin');
		const { person, refusal } = await target(request, me.id, 'Your own account is enabled.');
		if (refusal) return refusal;
		try {
			await auth.api.unbanUser({ body: { userId: person.id }, headers: request.headers });
		} catch (e) {
			return authRefusal(e, person.id);
		}
		return { ok: true, userId: person.id, message: `${person.name} can sign in again.` } satisfies Done;
	},

	sendReset: async (event) => {
		const me = requireArea(event.locals, 'admin');
		const { person, refusal } = await target(event.request, me.id, 'Change your own password on your account page.');
		if (refusal) return refusal;
		const refused = await refuseAttempt(event, 'reset-request', person.email);
		if (refused) return fail(429, { ok: false, userId: person.id, message: refused });
		try {
			await auth.api.requestPasswordReset({ body: { email: person.email } });
		} catch (e) {
			console.error('A reset link could not be sent:', e);
			return fail(503, {
				ok: false,
				userId: person.id,
				message: `The mail to ${person.email} could not be sent just now.`
			});
		}
		return { ok: true, userId: person.id, message: `A reset link is on its way to ${person.email}.` } satisfies Done;
	},

	remove: async ({ request, locals }) => {
		const me = requireArea(locals, 'admin');
		const { person, refusal } = await target(request, me.id, 'Delete your own account on your account page.');
		if (refusal) return refusal;
		const lastAdmin = await lastAdminProblem(db, person.id, { claim: true });
		if (lastAdmin) return fail(409, { ok: false, userId: person.id, message: lastAdmin });
		try {
			await auth.api.removeUser({ body: { userId: person.id }, headers: request.headers });
		} catch (e) {
			await releaseClaim(db, person.id);
			if (authCode(e) === 'USER_NOT_FOUND')
				return fail(404, { ok: false, userId: person.id, message: 'That account does not exist any more.' });
			return authRefusal(e, person.id);
		}
		return {
			ok: true,
			userId: '',
			message: `${person.name}’s account and everything in it are deleted.`
		} satisfies Done;
	}
};
