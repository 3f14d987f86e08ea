import { auth } from '$lib/server/auth';
import { redirect } from '@sveltejs/kit';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = () => redirect(303, '/');

export const actions: Actions = {
	default: async ({ request, locals }) => {
		if (locals.session) await auth.api.signOut({ headers: request.headers });
		redirect(303, '/');
	}
};
