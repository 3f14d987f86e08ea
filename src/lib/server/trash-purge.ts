import { removeFiles } from './cleanup';
import type { Database } from './db';
import { purgeTrash } from './trash';

/** Purges the trash and removes the audio files of the sessions it purged. */
export async function emptyExpiredTrash(db: Database, now = new Date()) {
	const purged = await purgeTrash(db, now);
	await removeFiles(purged.audioFiles);
	return purged;
}
