import { assignmentsOf } from '$lib/server/assignments';
import { className, createClass, joinByCode, joinCodeSchema, joinedClasses, taughtClasses } from '$lib/server/classes';
import { db } from '$lib/server/db';
import { Refusal } from '$lib/server/http';
import { canEnter, requireArea } from '$lib/server/roles';
import { formObject, validate } from '$lib/server/validate';
import { fail, redirect } from '@sveltejs/kit';
import { z } from 'zod';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals }) => {
	const user = requireArea(locals, 'app');
	const teaches = canEnter(user.role, 'teaching');
	const [taught, joined, due] = await Promise.all([
		teaches ? taughtClasses(db, user.id) : Promise.resolve([]),
		joinedClasses(db, user.id),
		assignmentsOf(db, user.id)
	]);
	return { teaches, taught, joined, due };
};

export const actions: Actions = {
	create: async ({ locals, request }) => {
		const user = requireArea(locals, 'teaching');
		const parsed = validate(z.object({ name: className }), formObject(await request.formData()));
		if (!parsed.ok) return fail(400, { action: 'create', errors: parsed.errors, message: parsed.message });
		const id = await createClass(db, user.id, parsed.data.name);
		redirect(303, `/classes/${id}`);
	},
	join: async ({ locals, request }) => {
		const user = requireArea(locals, 'app');
		const fields = formObject(await request.formData());
		const parsed = validate(z.object({ code: joinCodeSchema }), fields);
		if (!parsed.ok)
			return fail(400, { action: 'join', code: fields.code ?? '', errors: parsed.errors, message: parsed.message });
		try {
			const c = await joinByCode(db, user.id, parsed.data.code);
			redirect(303, `/classes/${c.id}`);
		} catch (e) {
			if (e instanceof Refusal)
				return fail(e.status, {
					action: 'join',
					code: fields.code ?? '',
					errors: { code: e.message },
					message: e.message
				});
			throw e;
		}
	}
};
