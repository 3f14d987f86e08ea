import { scoreSummary } from '$lib/engine';
import { review, reviewInput, submissionBreakdown } from '$lib/server/assignments';
import { publicOrigin } from '$lib/server/config';
import { db } from '$lib/server/db';
import { pageRefusal, Refusal } from '$lib/server/http';
import { requireArea } from '$lib/server/roles';
import { formObject, validate } from '$lib/server/validate';
import { fail } from '@sveltejs/kit';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, params }) => {
	const user = requireArea(locals, 'app');
	// Worked out against what the stored score was counted against, so the two always agree.
	const {
		submission: s,
		row,
		session,
		drill,
		mapping,
		zero,
		detail
	} = await submissionBreakdown(db, user.id, params.id).catch(pageRefusal);
	return {
		submission: {
			id: s.id,
			role: s.role,
			student: s.student,
			drill: s.drill.name,
			className: s.class.name,
			classId: s.class.id,
			assignmentId: s.assignmentId,
			dueAt: s.assignment.dueAt,
			submittedAt: s.submittedAt,
			late: s.late,
			grade: s.grade,
			comment: s.comment,
			gradedAt: s.gradedAt,
			hasAudio: s.audioFile !== null,
			score: s.score,
			rehearsalId: s.rehearsalId,
			sessionName: row.name
		},
		drill,
		detail: detail
			? { ...scoreSummary(detail), targets: detail.targets, presses: detail.presses, extraPresses: detail.extraPresses }
			: null,
		mapping,
		document: session,
		zero
	};
};

export const actions: Actions = {
	review: async ({ locals, params, request }) => {
		const user = requireArea(locals, 'teaching');
		const fields = formObject(await request.formData());
		const parsed = validate(reviewInput, fields);
		if (!parsed.ok) return fail(400, { ...fields, errors: parsed.errors, message: parsed.message });
		try {
			await review(db, user, params.id, parsed.data, publicOrigin());
			return { reviewed: true };
		} catch (e) {
			if (e instanceof Refusal) return fail(e.status, { ...fields, errors: {}, message: e.message });
			throw e;
		}
	}
};
