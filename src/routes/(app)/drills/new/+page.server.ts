import { db } from '$lib/server/db';
import { editorMappings } from '$lib/server/drill-editor';
import { createDrill } from '$lib/server/drills';
import { Refusal } from '$lib/server/http';
import { requireArea } from '$lib/server/roles';
import { fail, redirect } from '@sveltejs/kit';
import type { Actions, PageServerLoad } from './$types';
import { readDrillForm } from '../drill-form';

export const load: PageServerLoad = async ({ locals }) => {
	const user = requireArea(locals, 'teaching');
	return { mappings: await editorMappings(db, user.id) };
};

export const actions: Actions = {
	default: async ({ locals, request }) => {
		const user = requireArea(locals, 'teaching');
		const input = readDrillForm(await request.formData());
		if (!input.ok) return fail(400, { message: input.message });
		try {
			const id = await createDrill(db, user.id, input.data);
			redirect(303, `/drills/${id}?saved=1`);
		} catch (e) {
			if (e instanceof Refusal) return fail(e.status, { message: e.message, problems: e.problems });
			throw e;
		}
	}
};
