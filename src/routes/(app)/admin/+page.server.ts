import { db } from '$lib/server/db';
import { requireArea, ROLES } from '$lib/server/roles';
import { changeRole, listUsers, RoleChangeError } from '$lib/server/users';
import { formObject, validate } from '$lib/server/validate';
import { fail } from '@sveltejs/kit';
import { z } from 'zod';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, url }) => {
	requireArea(locals, 'admin');
	const q = url.searchParams.get('q') ?? '';
	return { q, users: await listUsers(db, q), showOutbox: !process.env.SMTP_URL };
};

const SetRole = z.object({
	userId: z.string().min(1, { error: 'No account was chosen.' }),
	role: z.enum(ROLES, { error: 'Choose admin, teacher or student.' })
});

export const actions: Actions = {
	setRole: async ({ request, locals }) => {
		requireArea(locals, 'admin');
		const parsed = validate(SetRole, formObject(await request.formData()));
		if (!parsed.ok) return fail(400, { message: parsed.message });
		try {
			const changed = await changeRole(db, parsed.data.userId, parsed.data.role);
			return { message: `${changed.name} is now ${changed.role}.` };
		} catch (e) {
			if (e instanceof RoleChangeError) return fail(409, { message: e.message });
			throw e;
		}
	}
};
