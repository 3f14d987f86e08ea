import { submissionFor } from '$lib/server/assignments';
import { db } from '$lib/server/db';
import { refusalResponse, signedIn } from '$lib/server/http';
import { json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';

/** A submission's score and review: for its student and its class teacher only (404 otherwise). */
export const GET: RequestHandler = async ({ locals, params }) => {
	try {
		const s = await submissionFor(db, signedIn(locals).id, params.id);
		return json({
			id: s.id,
			drill: s.drill.name,
			student: s.student.name,
			submittedAt: s.submittedAt,
			late: s.late,
			score: s.score,
			grade: s.grade,
			comment: s.comment,
			gradedAt: s.gradedAt,
			hasAudio: s.audioFile !== null
		});
	} catch (e) {
		return refusalResponse(e);
	}
};
