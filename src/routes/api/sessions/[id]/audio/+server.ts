import { db } from '$lib/server/db';
import { Refusal, refusalResponse, signedIn } from '$lib/server/http';
import { attachAudio, sessionDocument } from '$lib/server/rehearsals';
import { audioExtension, MAX_AUDIO_BYTES, removeUpload, saveUpload, streamUpload } from '$lib/server/storage';
import { json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';

/** Stores the session's audio capture (the request body is the file), replacing an earlier one. */
export const PUT: RequestHandler = async ({ locals, params, request }) => {
	try {
		const user = signedIn(locals);
		await sessionDocument(db, user.id, params.id);
		const type = request.headers.get('content-type');
		const ext = audioExtension(type);
		const declared = Number(request.headers.get('content-length') ?? 0);
		if (declared > MAX_AUDIO_BYTES)
			throw new Refusal(413, 'The recording is larger than 200 MB; record a shorter take.');
		const data = new Uint8Array(await request.arrayBuffer());
		if (data.byteLength === 0) throw new Refusal(400, 'The recording is empty.');
		if (data.byteLength > MAX_AUDIO_BYTES)
			throw new Refusal(413, 'The recording is larger than 200 MB; record a shorter take.');
		const name = await saveUpload(`${params.id}.${ext}`, data);
		const previous = await attachAudio(db, user.id, params.id, name, type!.split(';')[0], data.byteLength);
		if (previous && previous !== name) await removeUpload(previous);
		return json({ bytes: data.byteLength }, { status: 201 });
	} catch (e) {
		return refusalResponse(e);
	}
};

export const GET: RequestHandler = async ({ locals, params }) => {
	try {
		const { row } = await sessionDocument(db, signedIn(locals).id, params.id);
		const file = row.audioFile ? streamUpload(row.audioFile) : null;
		if (!file) throw new Refusal(404, 'This session has no audio recording.');
		return new Response(file.stream, {
			headers: { 'content-type': row.audioType ?? 'application/octet-stream', 'content-length': String(file.size) }
		});
	} catch (e) {
		return refusalResponse(e);
	}
};
