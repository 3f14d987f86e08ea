import { assignmentFor, assignmentSubmissions, deleteAssignment, handInsOf, submit } from '$lib/server/assignments';
import { publicOrigin } from '$lib/server/config';
import { db } from '$lib/server/db';
import { drillBrief, takesOf } from '$lib/server/drills';
import { pageRefusal, Refusal } from '$lib/server/http';
import { requireArea } from '$lib/server/roles';
import { describeContent, sniffAudio } from '$lib/server/sniff';
import { incomingDir, uploadStore } from '$lib/server/storage';
import { writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { rehearsal, submission } from '$lib/server/db/schema';
import { fail, redirect } from '@sveltejs/kit';
import { and, eq, inArray } from 'drizzle-orm';
import { randomUUID } from 'node:crypto';
import { z } from 'zod';
import type { Actions, PageServerLoad } from './$types';

/** Audio handed in with a form (adapter-node's body limit applies; see README). */
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
		const form = await request.formData();
		const parsed = z
			.object({ rehearsalId: z.string().min(1, { error: 'Choose one of your takes.' }).max(64) })
			.safeParse({ rehearsalId: form.get('rehearsalId') ?? '' });
		if (!parsed.success) return fail(400, { message: parsed.error.issues[0].message });
		const file = form.get('audio');
		let audio: { file: string; type: string } | null = null;
		const store = uploadStore();
		// A browser sends an empty part without a name when no file was chosen; a chosen empty file is refused.
		if (file instanceof File && file.size === 0 && file.name)
			return fail(400, {
				message: `The audio file “${file.name.slice(0, 80)}” is empty; choose the recording again, or hand in without audio.`
			});
		if (file instanceof File && file.size > 0) {
			if (file.size > MAX_FORM_AUDIO) return fail(413, { message: 'The audio file is larger than 50 MB.' });
			const bytes = new Uint8Array(await file.arrayBuffer());
			// The kind is read from the bytes, never from the name or the browser's word for it.
			const kind = await sniffAudio(bytes.subarray(0, 4100));
			if (!kind)
				return fail(415, {
					message: `Audio must be WebM, Ogg, WAV, MP4 or MP3; this file is ${await describeContent(bytes.subarray(0, 4100))}.`
				});
			const name = `submission-${randomUUID()}.${kind.ext}`;
			const temp = join(incomingDir(), `${name}.part`);
			await writeFile(temp, bytes);
			await store.put(temp, name, kind.mime);
			audio = { file: name, type: kind.mime };
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
