import { assignmentFor, assignmentSubmissions, deleteAssignment, handInsOf, submit } from '$lib/server/assignments';
import { publicOrigin } from '$lib/server/config';
import { db } from '$lib/server/db';
import { drillBrief, takesOf } from '$lib/server/drills';
import { pageRefusal, Refusal } from '$lib/server/http';
import { requireArea } from '$lib/server/roles';
import { describeContent, sniffAudio } from '$lib/server/sniff';
import { uploadStore } from '$lib/server/storage';
import { receiveFormUpload, type FormUpload } from '$lib/server/upload';
import { rm } from 'node:fs/promises';
import { rehearsal, submission } from '$lib/server/db/schema';
import { fail, redirect } from '@sveltejs/kit';
import { and, eq, inArray } from 'drizzle-orm';
import { randomUUID } from 'node:crypto';
import { z } from 'zod';
import type { Actions, PageServerLoad } from './$types';

/** Audio handed in with the form, streamed to disk under this limit (the server's body limit is lifted; see README). */
const MAX_FORM_AUDIO = 50 * 1024 * 1024;

export const load: PageServerLoad = async ({ locals, params }) => {
	const user = requireArea(locals, 'app');
	const a = await assignmentFor(db, user.id, params.id).catch(pageRefusal);
	const base = {
		assignment: {
			id: a.id,
			drillId: a.drillId,
			mappingId: a.drill.mappingId,
			drill: a.drill.name,
			brief: drillBrief(a.drill.document),
			dueAt: a.dueAt,
			className: a.className,
			classId: a.classId,
			teacher: a.teacher,
			role: a.role
		}
	};
	if (a.role === 'teacher')
		return {
			...base,
			submissions: await assignmentSubmissions(db, a.id),
			handIns: await handInsOf(db, a.id),
			takes: [],
			mine: null
		};
	const takes = await takesOf(db, user.id, a.drillId);
	const names = takes.length
		? await db
				.select({ id: rehearsal.id, name: rehearsal.name, createdAt: rehearsal.createdAt })
				.from(rehearsal)
				.where(
					inArray(
						rehearsal.id,
						takes.map((t) => t.rehearsalId)
					)
				)
		: [];
	const [mine] = await db
		.select()
		.from(submission)
		.where(and(eq(submission.assignmentId, a.id), eq(submission.studentId, user.id)));
	return {
		...base,
		submissions: [],
		handIns: null,
		takes: takes.map((t) => ({
			id: t.rehearsalId,
			name: names.find((n) => n.id === t.rehearsalId)?.name ?? 'Take',
			createdAt: t.createdAt,
			score: t.score
		})),
		mine: mine
			? {
					id: mine.id,
					rehearsalId: mine.rehearsalId,
					submittedAt: mine.submittedAt,
					late: mine.late,
					hitRate: mine.hitRate,
					grade: mine.grade,
					graded: mine.gradedAt !== null
				}
			: null
	};
};

export const actions: Actions = {
	/** The class teacher deletes the assignment; `graded` is how many graded hand-ins the confirmation named. */
	delete: async ({ locals, params, request }) => {
		const user = requireArea(locals, 'app');
		const graded = Number((await request.formData()).get('graded') ?? 0);
		let classId: string;
		try {
			({ classId } = await deleteAssignment(db, user.id, params.id, Number.isInteger(graded) ? graded : 0));
		} catch (e) {
			if (e instanceof Refusal && e.status === 409) return fail(409, { message: e.message });
			pageRefusal(e);
		}
		redirect(303, `/classes/${classId}`);
	},
	submit: async ({ locals, params, request }) => {
		const user = requireArea(locals, 'app');
		let form: FormUpload<{ ext: string; mime: string }>;
		try {
			// The audio streams to a temporary file as it arrives, its kind read from its bytes.
			form = await receiveFormUpload(request, 'audio', {
				limit: MAX_FORM_AUDIO,
				tooLarge: 'The audio file is larger than 50 MB; hand in a shorter recording.',
				sniff: sniffAudio,
				wrongKind: async (head) =>
					`Audio must be WebM, Ogg, WAV, MP4 or MP3; this file is ${await describeContent(head)}.`
			});
		} catch (e) {
			if (e instanceof Refusal) return fail(e.status, { message: e.message });
			throw e;
		}
		const parsed = z
			.object({ rehearsalId: z.string().min(1, { error: 'Choose one of your takes.' }).max(64) })
			.safeParse({ rehearsalId: form.fields.rehearsalId ?? '' });
		const store = uploadStore();
		if (!parsed.success) {
			if (form.file) await rm(form.file.path, { force: true });
			return fail(400, { message: parsed.error.issues[0].message });
		}
		let audio: { file: string; type: string } | null = null;
		if (form.file) {
			const name = `submission-${randomUUID()}.${form.file.kind.ext}`;
			await store.put(form.file.path, name, form.file.kind.mime);
			audio = { file: name, type: form.file.kind.mime };
		}
		let id: string;
		try {
			const r = await submit(db, user, params.id, parsed.data.rehearsalId, audio, publicOrigin());
			if (r.previousAudio && r.previousAudio !== audio?.file) await store.remove(r.previousAudio);
			id = r.id;
		} catch (e) {
			if (audio) await store.remove(audio.file);
			if (e instanceof Refusal) return fail(e.status, { message: e.message });
			throw e;
		}
		redirect(303, `/submissions/${id}`);
	}
};
