import type { Database } from './db';
import { uploadStore } from './storage';
import { purgeTrash } from './trash';

/** Purges the trash and removes the audio files of the sessions it purged. */
export async function emptyExpiredTrash(db: Database, now = new Date()) {
	const purged = await purgeTrash(db, now);
	const store = uploadStore();
	await Promise.all(purged.audioFiles.map((file) => store.remove(file)));
	return purged;
}
