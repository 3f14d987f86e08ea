// Receiving a file upload: the request body streams to a temporary file with a unique name, its
// size counted and its kind read from its first bytes while it arrives. Nothing is kept when a
// limit is crossed, the kind is wrong or the connection breaks.
import { randomUUID } from 'node:crypto';
import { open, rm } from 'node:fs/promises';
import { join } from 'node:path';
import { discardUnread, drain, Refusal } from './http';
import { SNIFF_BYTES } from './sniff';
import { incomingDir } from './storage';

export interface Received<K> {
	/** The temporary file; the caller commits it to storage or removes it. */
	path: string;
	bytes: number;
	kind: K;
}

export interface UploadRules<K> {
	/** Most bytes accepted. */
	limit: number;
	/** The sentence of a 413 refusal. */
	tooLarge: string;
	/** Reads the kind from the first bytes; null refuses the upload with 415. */
	sniff: (head: Uint8Array) => Promise<K | null>;
	/** The sentence of a 415 refusal, given what the bytes look like. */
	wrongKind: (head: Uint8Array) => Promise<string> | string;
}

/** Streams the request body to a temporary file under the rules; refuses with 400/413/415. */
export async function receiveUpload<K>(request: Request, rules: UploadRules<K>): Promise<Received<K>> {
	const declared = Number(request.headers.get('content-length') ?? NaN);
	if (declared > rules.limit) {
		discardUnread(request);
		throw new Refusal(413, rules.tooLarge);
	}
	if (!request.body) {
		if (declared > 0 && !request.headers.get('content-type'))
			throw new Refusal(
				415,
				'The upload has no Content-Type header; send it with one (its kind is read from the file).'
			);
		throw new Refusal(400, 'The upload is empty.');
	}
	const reader = request.body.getReader();
	const path = join(incomingDir(), `${randomUUID()}.part`);
	const file = await open(path, 'wx');
	let bytes = 0;
	let kind: K | null = null;
	let head: Uint8Array[] = [];
	let headBytes = 0;
	let finished = false;
	try {
		for (;;) {
			const { done, value } = await reader.read();
			if (done) break;
			bytes += value.byteLength;
			if (bytes > rules.limit) throw new Refusal(413, rules.tooLarge);
			if (kind !== null) {
				await file.write(value);
				continue;
			}
			head.push(value);
			headBytes += value.byteLength;
			if (headBytes >= SNIFF_BYTES) {
				kind = await decide(head, rules);
				for (const part of head) await file.write(part);
				head = [];
			}
		}
		finished = true;
		if (bytes === 0) throw new Refusal(400, 'The upload is empty.');
		if (kind === null) {
			kind = await decide(head, rules);
			for (const part of head) await file.write(part);
		}
		await file.sync();
		await file.close();
		return { path, bytes, kind };
	} catch (e) {
		await file.close().catch(() => undefined);
		await rm(path, { force: true });
		if (!finished) drain(reader);
		throw e;
	}
}

async function decide<K>(head: Uint8Array[], rules: UploadRules<K>): Promise<K> {
	const bytes = Buffer.concat(head);
	const kind = await rules.sniff(bytes);
	if (kind === null) throw new Refusal(415, await rules.wrongKind(bytes));
	return kind;
}
