// Uploaded files on local disk under UPLOADS_DIR. Names are ours (never the client's), so a
// request can't write outside the folder.
import { createReadStream, existsSync, statSync } from 'node:fs';
import { mkdir, rename, rm, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { Readable } from 'node:stream';
import { uploadsDir } from './config';
import { Refusal } from './http';

export const AUDIO_TYPES: Record<string, string> = {
	'audio/webm': 'webm',
	'audio/ogg': 'ogg',
	'audio/wav': 'wav',
	'audio/x-wav': 'wav',
	'audio/mp4': 'm4a',
	'audio/mpeg': 'mp3'
};
export const MAX_AUDIO_BYTES = 200 * 1024 * 1024;

export function audioExtension(contentType: string | null): string {
	const type = (contentType ?? '').split(';')[0].trim().toLowerCase();
	const ext = AUDIO_TYPES[type];
	if (!ext)
		throw new Refusal(415, `Audio must be WebM, Ogg, WAV, MP4 or MP3; this upload is "${type || 'of no type'}".`);
	return ext;
}

/** Writes a file whole (to a temporary name first), so a broken upload never replaces a good one. */
export async function saveUpload(name: string, data: Uint8Array): Promise<string> {
	const dir = uploadsDir();
	await mkdir(dir, { recursive: true });
	const temp = join(dir, `.${name}.part`);
	await writeFile(temp, data);
	await rename(temp, join(dir, name));
	return name;
}

export function uploadPath(name: string): string | null {
	if (!/^[\w.-]+$/.test(name)) return null;
	const path = join(uploadsDir(), name);
	return existsSync(path) ? path : null;
}

export function streamUpload(name: string): { stream: ReadableStream; size: number } | null {
	const path = uploadPath(name);
	if (!path) return null;
	return { stream: Readable.toWeb(createReadStream(path)) as ReadableStream, size: statSync(path).size };
}

export async function removeUpload(name: string | null | undefined) {
	const path = name ? uploadPath(name) : null;
	if (path) await rm(path, { force: true });
}
