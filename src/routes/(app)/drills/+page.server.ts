import { createDrill, listDrills } from '$lib/server/drills';
import { db } from '$lib/server/db';
import { Refusal } from '$lib/server/http';
import { listMappings } from '$lib/server/mappings';
import { requireArea } from '$lib/server/roles';
import { formObject, validate } from '$lib/server/validate';
import { fail, redirect } from '@sveltejs/kit';
import { z } from 'zod';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals }) => {
	const user = requireArea(locals, 'teaching');
	const [drills, mappings] = await Promise.all([listDrills(db, user.id), listMappings(db, user.id)]);
	const names = new Map(mappings.map((m) => [m.id, m.name]));
	return {
		drills: drills.map((d) => {
			const doc = d.document as { tempo: number; lengthBars: number; targets: unknown[] };
			return {
				id: d.id,
				name: d.name,
				mapping: names.get(d.mappingId) ?? 'a mapping no longer shared with you',
				tempo: doc.tempo,
				lengthBars: doc.lengthBars,
				targets: doc.targets.length,
				updatedAt: d.updatedAt
			};
		}),
		mappings: mappings.map((m) => ({ id: m.id, name: m.name }))
	};
};

export const actions: Actions = {
	import: async ({ locals, request }) => {
		const user = requireArea(locals, 'teaching');
		const parsed = validate(
			z.object({
				mappingId: z.string().min(1, { error: 'Choose the mapping the drill is played on.' }).max(64),
				text: z
					.string()
					.min(2, { error: 'Choose a drill file.' })
					.max(2_000_000, { error: 'The file is larger than 2 MB.' })
			}),
			formObject(await request.formData())
		);
		if (!parsed.ok) return fail(400, { message: parsed.message });
		let document: unknown;
		try {
			document = JSON.parse(parsed.data.text);
		} catch {
			return fail(400, { message: 'The file is not a drill document: it is not valid JSON.' });
		}
		try {
			const id = await createDrill(db, user.id, { mappingId: parsed.data.mappingId, document });
			redirect(303, `/drills/${id}`);
		} catch (e) {
			if (e instanceof Refusal) return fail(e.status, { message: e.message });
			throw e;
		}
	}
};
