import { assignmentInput, assignmentsOf, classAssignments, createAssignment } from '$lib/server/assignments';
import {
	classFor,
	inviteByEmail,
	inviteEmails,
	pendingInvites,
	removeMember,
	roster,
	shareMapping,
	sharedMappings,
	unshareMapping
} from '$lib/server/classes';
import { publicOrigin } from '$lib/server/config';
import { db } from '$lib/server/db';
import { listDrills } from '$lib/server/drills';
import { pageRefusal, Refusal } from '$lib/server/http';
import { listMappings } from '$lib/server/mappings';
import { requireArea } from '$lib/server/roles';
import { formObject, validate } from '$lib/server/validate';
import { fail } from '@sveltejs/kit';
import { z } from 'zod';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, params, url }) => {
	const user = requireArea(locals, 'app');
	const c = await classFor(db, user.id, params.id).catch(pageRefusal);
	const shared = await sharedMappings(db, c.id);
	if (c.role === 'student') {
		const due = (await assignmentsOf(db, user.id)).filter((a) => a.classId === c.id);
		// ?joined=1: the invitation link just brought the student in.
		const joined = url.searchParams.get('joined') === '1';
		return { c: { id: c.id, name: c.name, teacher: c.teacher, role: c.role }, shared, due, teacher: null, joined };
	}
	const [people, invites, assignments, drills, mappings] = await Promise.all([
		roster(db, c.id),
		pendingInvites(db, c.id),
		classAssignments(db, c.id),
		listDrills(db, user.id),
		listMappings(db, user.id)
	]);
	return {
		c: { id: c.id, name: c.name, teacher: c.teacher, role: c.role },
		shared,
		due: [],
		joined: false,
		teacher: {
			joinCode: c.joinCode,
			people,
			invites,
			assignments,
			drills: drills.map((d) => ({ id: d.id, name: d.name })),
			mappings: mappings.map((m) => ({ id: m.id, name: m.name }))
		}
	};
};

async function guarded<T>(action: string, work: () => Promise<T>) {
	try {
		return await work();
	} catch (e) {
		if (e instanceof Refusal)
			return fail(e.status, { action, message: e.message, errors: {} as Record<string, string> });
		throw e;
	}
}

export const actions: Actions = {
	invite: async ({ locals, params, request }) => {
		const user = requireArea(locals, 'teaching');
		const fields = formObject(await request.formData());
		const parsed = validate(z.object({ emails: inviteEmails }), fields);
		if (!parsed.ok)
			return fail(400, {
				action: 'invite',
				emails: fields.emails ?? '',
				errors: parsed.errors,
				message: parsed.message
			});
		return guarded('invite', async () => {
			const sent = await inviteByEmail(db, user, params.id, parsed.data.emails, publicOrigin());
			return { action: 'invite', invited: sent };
		});
	},
	remove: async ({ locals, params, request }) => {
		const user = requireArea(locals, 'teaching');
		const parsed = validate(z.object({ userId: z.string().min(1).max(64) }), formObject(await request.formData()));
		if (!parsed.ok) return fail(400, { action: 'remove', message: parsed.message, errors: parsed.errors });
		return guarded('remove', async () => {
			await removeMember(db, user.id, params.id, parsed.data.userId);
			return { action: 'remove', removed: true };
		});
	},
	share: async ({ locals, params, request }) => {
		const user = requireArea(locals, 'teaching');
		const parsed = validate(
			z.object({ mappingId: z.string().min(1, { error: 'Choose a mapping to share.' }).max(64) }),
			formObject(await request.formData())
		);
		if (!parsed.ok) return fail(400, { action: 'share', message: parsed.message, errors: parsed.errors });
		return guarded('share', async () => {
			await shareMapping(db, user.id, params.id, parsed.data.mappingId);
			return { action: 'share', shared: true };
		});
	},
	unshare: async ({ locals, params, request }) => {
		const user = requireArea(locals, 'teaching');
		const parsed = validate(z.object({ mappingId: z.string().min(1).max(64) }), formObject(await request.formData()));
		if (!parsed.ok) return fail(400, { action: 'unshare', message: parsed.message, errors: parsed.errors });
		return guarded('unshare', async () => {
			await unshareMapping(db, user.id, params.id, parsed.data.mappingId);
			return { action: 'unshare' };
		});
	},
	assign: async ({ locals, params, request }) => {
		const user = requireArea(locals, 'teaching');
		const fields = formObject(await request.formData());
		const parsed = validate(assignmentInput, fields);
		if (!parsed.ok) return fail(400, { action: 'assign', errors: parsed.errors, message: parsed.message });
		// The form's local date and time are read in the teacher's time zone, sent along as an offset.
		const offset = Number(fields.tzOffset ?? 0);
		const local = new Date(`${parsed.data.due.slice(0, 16)}:00Z`);
		const dueAt = new Date(local.getTime() + (Number.isFinite(offset) ? offset : 0) * 60_000);
		if (Number.isNaN(dueAt.getTime()))
			return fail(400, {
				action: 'assign',
				errors: { due: 'Give a due date and time.' },
				message: 'Give a due date and time.'
			});
		return guarded('assign', async () => {
			await createAssignment(db, user, params.id, { drillId: parsed.data.drillId, dueAt }, publicOrigin());
			return { action: 'assign', assigned: true };
		});
	}
};
