import { db } from '$lib/server/db';
import { Refusal } from '$lib/server/http';
import { requireArea } from '$lib/server/roles';
import { listTrash, restoreFromTrash, TRASH_DAYS } from '$lib/server/trash';
import { emptyExpiredTrash } from '$lib/server/trash-purge';
import { formObject, validate } from '$lib/server/validate';
import { fail } from '@sveltejs/kit';
import { z } from 'zod';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals }) => {
	const user = requireArea(locals, 'app');
	await emptyExpiredTrash(db);
	return { items: await listTrash(db, user.id), days: TRASH_DAYS };
};

const Restore = z.object({
	kind: z.enum(['mapping', 'session'], { error: 'Choose a mapping or a session to restore.' }),
	id: z.string().min(1, { error: 'Choose something to restore.' }).max(64)
});

export const actions: Actions = {
	restore: async ({ request, locals }) => {
		const user = requireArea(locals, 'app');
		const parsed = validate(Restore, formObject(await request.formData()));
		if (!parsed.ok) return fail(400, { message: parsed.message });
		try {
			const name = await restoreFromTrash(db, user.id, parsed.data.kind, parsed.data.id);
			return {
				message: `“${name}” is back in your ${parsed.data.kind === 'mapping' ? 'mappings' : 'sessions'}.`,
				href: parsed.data.kind === 'mapping' ? '/mappings' : `/sessions/${parsed.data.id}`
			};
		} catch (e) {
			if (e instanceof Refusal) return fail(e.status, { message: e.message });
			throw e;
		}
	}
};
