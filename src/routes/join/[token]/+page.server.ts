import { acceptInvitation, invitation } from '$lib/server/classes';
import { db } from '$lib/server/db';
import { Refusal } from '$lib/server/http';
import { fail, redirect } from '@sveltejs/kit';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, params }) => {
	const found = await invitation(db, params.token);
	if (!found) return { invite: null, signedIn: Boolean(locals.user) };
	const { invite, className, teacher } = found;
	const me = locals.user;
	return {
		invite: {
			className,
			teacher,
			email: invite.email,
			used: invite.acceptedBy !== null && invite.acceptedBy !== me?.id,
			joined: invite.acceptedBy !== null && invite.acceptedBy === me?.id,
			classId: invite.classId
		},
		signedIn: Boolean(me),
		me: me ? { email: me.email } : null
	};
};

export const actions: Actions = {
	default: async ({ locals, params }) => {
		const me = locals.user;
		if (!me) redirect(303, `/signin?next=${encodeURIComponent(`/join/${params.token}`)}`);
		try {
			const classId = await acceptInvitation(db, me, params.token);
			redirect(303, `/classes/${classId}?joined=1`);
		} catch (e) {
			if (e instanceof Refusal) return fail(e.status, { message: e.message });
			throw e;
		}
	}
};
