// A session's audio capture: received as a stream under the size limit with its kind read from
// its bytes, stored under a fresh unique name, then attached to the session atomically. Every
// failure on the way removes what was written; a replaced or orphaned file is removed. A deleted
// session keeps its file in the trash; the purge removes it (trash-purge.ts).
import { randomUUID } from 'node:crypto';
import { rm } from 'node:fs/promises';
import type { Database } from './db';
import { attachAudio, getRehearsalRow } from './rehearsals';
import { describeContent, sniffAudio } from './sniff';
import { uploadStore, type UploadStore } from './storage';
import { receiveUpload } from './upload';

/** 200 MiB: about 3 hours of Opus in WebM, or 20 minutes of CD-quality WAV. */
export const MAX_AUDIO_BYTES = 200 * 1024 * 1024;

export async function storeSessionAudio(
	db: Database,
	userId: string,
	id: string,
	request: Request,
	store: UploadStore = uploadStore()
) {
	await getRehearsalRow(db, userId, id);
	const upload = await receiveUpload(request, {
		limit: MAX_AUDIO_BYTES,
		tooLarge: 'The recording is larger than 200 MB; record a shorter take.',
		sniff: sniffAudio,
		wrongKind: async (head) =>
			`Audio must be WebM, Ogg, WAV, MP4 or MP3; this upload is ${await describeContent(head)}.`
	});
	const name = `${id}-${randomUUID()}.${upload.kind.ext}`;
	try {
		await store.put(upload.path, name, upload.kind.mime);
	} catch (e) {
		await rm(upload.path, { force: true });
		throw e;
	}
	let previous: string | null;
	try {
		previous = await attachAudio(db, userId, id, name, upload.kind.mime, upload.bytes);
	} catch (e) {
		await store.remove(name);
		throw e;
	}
	if (previous) await store.remove(previous);
	return { bytes: upload.bytes, type: upload.kind.mime };
}

export async function openSessionAudio(db: Database, userId: string, id: string, store = uploadStore()) {
	const row = await getRehearsalRow(db, userId, id);
	const file = row.audioFile ? await store.get(row.audioFile) : null;
	return file ? { ...file, type: row.audioType ?? 'application/octet-stream' } : null;
}
