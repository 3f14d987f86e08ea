import { classesOf, deleteDrill, drillFor, drillUse, duplicateDrill, ownDrill, updateDrill } from '$lib/server/drills';
import { db } from '$lib/server/db';
import { editorMappings } from '$lib/server/drill-editor';
import { pageRefusal, Refusal } from '$lib/server/http';
import { requireArea } from '$lib/server/roles';
import { fail, redirect } from '@sveltejs/kit';
import type { Actions, PageServerLoad } from './$types';
import { readDrillForm } from '../drill-form';

export const load: PageServerLoad = async ({ locals, params, url }) => {
	const user = requireArea(locals, 'teaching');
	const row = await ownDrill(db, user.id, params.id).catch(pageRefusal);
	const d = await drillFor(db, user.id, row.id).catch(pageRefusal);
	const [mappings, classes, use] = await Promise.all([
		editorMappings(db, user.id),
		classesOf(db, user.id),
		drillUse(db, row.id)
	]);
	return {
		drill: {
			id: row.id,
			mappingId: row.mappingId,
			document: d.document,
			mappingVersion: d.mappingVersion,
			locked: use.handIns > 0
		},
		mappings,
		classes,
		use,
		saved: url.searchParams.has('saved')
	};
};

export const actions: Actions = {
	save: async ({ locals, params, request }) => {
		const user = requireArea(locals, 'teaching');
		const input = readDrillForm(await request.formData());
		if (!input.ok) return fail(400, { message: input.message });
		try {
			await updateDrill(db, user.id, params.id, input.data);
			return { saved: true };
		} catch (e) {
			if (e instanceof Refusal) return fail(e.status, { message: e.message });
			throw e;
		}
	},
	duplicate: async ({ locals, params }) => {
		const user = requireArea(locals, 'teaching');
		const id = await duplicateDrill(db, user.id, params.id).catch(pageRefusal);
		redirect(303, `/drills/${id}`);
	},
	delete: async ({ locals, params }) => {
		const user = requireArea(locals, 'teaching');
		try {
			await deleteDrill(db, user.id, params.id);
		} catch (e) {
			// Hand-ins of it exist (409): the page says what to do; anything else is the error page.
			if (e instanceof Refusal && e.status === 409) return fail(409, { deleteProblem: e.message });
			pageRefusal(e);
		}
		redirect(303, '/drills');
	}
};
