import { DEMO_MAPPINGS, type ControllerProfile, type Mapping } from '$lib/engine';
import { GENERIC_PROFILES, withLearnedProfile } from '$lib/midi/profiles';
import { listLayouts } from '$lib/server/controllers';
import { db } from '$lib/server/db';
import { Refusal } from '$lib/server/http';
import { createMapping } from '$lib/server/mappings';
import { requireArea } from '$lib/server/roles';
import { formObject, validate } from '$lib/server/validate';
import { fail, redirect } from '@sveltejs/kit';
import { z } from 'zod';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals }) => {
	const user = requireArea(locals, 'app');
	const layouts = await listLayouts(db, user.id);
	return {
		controllers: [
			...GENERIC_PROFILES.map((p, i) => ({ key: `builtin:${i}`, name: p.name, learned: false })),
			...layouts.map((l) => ({ key: `layout:${l.id}`, name: l.name, learned: true }))
		],
		starters: DEMO_MAPPINGS.map((d) => ({ slug: d.slug, title: d.title, summary: d.summary }))
	};
};

const NewMapping = z.object({
	name: z.string().trim().min(1, { error: 'Give the mapping a name.' }).max(120, { error: 'At most 120 characters.' }),
	controller: z.string().regex(/^(builtin|layout):[\w-]+$/, { error: 'Choose a controller.' }),
	decks: z.enum(['2', '4'], { error: 'Choose two or four decks.' }).default('2'),
	racks: z.coerce
		.number({ error: 'Say how many racks (1 to 8).' })
		.int({ error: 'A whole number of racks.' })
		.min(1, { error: 'At least one rack.' })
		.max(8, { error: 'At most 8 racks.' }),
	starter: z.string().regex(/^(empty|two-deck|four-deck|broken-row)$/, { error: 'Choose how to start.' })
});

async function profileFor(userId: string, key: string): Promise<ControllerProfile | null> {
	const [kind, id] = key.split(':');
	if (kind === 'builtin') return GENERIC_PROFILES[Number(id)] ?? null;
	return (await listLayouts(db, userId)).find((l) => l.id === id)?.profile ?? null;
}

export const actions: Actions = {
	default: async ({ locals, request }) => {
		const user = requireArea(locals, 'app');
		const form = formObject(await request.formData());
		const parsed = validate(NewMapping, form);
		if (!parsed.ok) return fail(400, { errors: parsed.errors, message: parsed.message, values: form });
		const { name, controller, racks, starter } = parsed.data;
		const profile = await profileFor(user.id, controller);
		if (!profile)
			return fail(400, { errors: { controller: 'That controller is not there any more.' }, message: '', values: form });
		let document: Mapping;
		const demo = DEMO_MAPPINGS.find((d) => d.slug === starter);
		if (demo) {
			// A starter set keeps its pads and moves them onto the chosen controller's addresses by grid cell.
			document = { ...withLearnedProfile(demo.mapping, profile).mapping, name };
		} else {
			const decks = Number(parsed.data.decks) as 2 | 4;
			document = {
				version: 2,
				name,
				decks,
				tempo: 124,
				profile,
				racks: Array.from({ length: racks }, (_, i) => ({ id: `rack-${i + 1}`, label: `Rack ${i + 1}` })),
				counters: [],
				bindings: []
			};
		}
		let id: string;
		try {
			id = await createMapping(db, user.id, { document, name });
		} catch (e) {
			if (e instanceof Refusal) return fail(400, { errors: {}, message: e.message, values: form });
			throw e;
		}
		return redirect(303, `/mappings/${id}`);
	}
};
