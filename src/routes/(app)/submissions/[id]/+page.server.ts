import { scoreSummary } from '$lib/engine';
import { review, reviewInput, submissionFor } from '$lib/server/assignments';
import { publicOrigin } from '$lib/server/config';
import { db } from '$lib/server/db';
import { mappingVersion } from '$lib/server/db/schema';
import { scoreTake, takeOf } from '$lib/server/drills';
import { pageRefusal, Refusal } from '$lib/server/http';
import { storedDocument } from '$lib/server/mappings';
import { getRehearsal } from '$lib/server/rehearsals';
import { requireArea } from '$lib/server/roles';
import { formObject, validate } from '$lib/server/validate';
import { parseDrill } from '$lib/engine';
import { fail } from '@sveltejs/kit';
import { eq } from 'drizzle-orm';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, params }) => {
	const user = requireArea(locals, 'app');
	const s = await submissionFor(db, user.id, params.id).catch(pageRefusal);
	// Access was granted through the submission: read the session as its owner would.
	const { row, session } = await getRehearsal(db, s.studentId, s.rehearsalId).catch(pageRefusal);
	const drill = parseDrill(s.drill.document);
	const [v] = await db.select().from(mappingVersion).where(eq(mappingVersion.id, s.drill.mappingVersionId));
	const mapping = v ? storedDocument(v.document) : null;
	const take = await takeOf(db, s.rehearsalId);
	const detail = drill.ok && mapping ? scoreTake(drill.drill, mapping, session, take?.zero ?? 0) : null;
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
		drill: drill.ok ? drill.drill : null,
		detail: detail
			? { ...scoreSummary(detail), targets: detail.targets, presses: detail.presses, extraPresses: detail.extraPresses }
			: null,
		mapping,
		document: session,
		zero: take?.zero ?? 0
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
