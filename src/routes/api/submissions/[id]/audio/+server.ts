import { submissionFor } from '$lib/server/assignments';
import { db } from '$lib/server/db';
import { Refusal, refusalResponse, signedIn } from '$lib/server/http';
import { uploadStore } from '$lib/server/storage';
import type { RequestHandler } from './$types';

/** The audio handed in with a submission: for its student and its class teacher only. */
export const GET: RequestHandler = async ({ locals, params }) => {
	try {
		const s = await submissionFor(db, signedIn(locals).id, params.id);
		const file = s.audioFile ? await uploadStore().get(s.audioFile) : null;
		if (!file) throw new Refusal(404, 'No audio was handed in with this submission.');
		return new Response(file.stream, {
			headers: {
				'content-type': s.audioType ?? 'application/octet-stream',
				'content-length': String(file.size),
				'content-disposition': `attachment; filename="${s.audioFile}"`
			}
		});
	} catch (e) {
		return refusalResponse(e);
	}
};
