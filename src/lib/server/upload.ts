// Receiving a file upload: the request body (or one file of a multipart form) streams to a
// temporary file with a unique name, its size counted and its kind read from its first bytes
// while it arrives. Nothing is kept when a limit is crossed, the kind is wrong or the connection
// breaks.
import busboy from 'busboy';
import { randomUUID } from 'node:crypto';
import { open, rm } from 'node:fs/promises';
import { join } from 'node:path';
import { Readable } from 'node:stream';
import type { ReadableStream as NodeWebStream } from 'node:stream/web';
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

export interface FormUpload<K> {
	/** The form's text fields (the last value of each name). */
	fields: Record<string, string>;
	/** The file sent under the upload field, or null when none was chosen. */
	file: (Received<K> & { name: string }) | null;
}

/** Text fields of a form with a file are short: ids and choices. */
const FORM_FIELD_BYTES = 4096;
const FORM_FIELDS = 32;

/**
 * Reads a multipart form as it arrives: its text fields, and the file under `field` streamed to a
 * temporary file under the rules (never held in memory). A chosen file with no bytes is refused
 * with 400 naming it; a part with no file name and no bytes is "no file chosen".
 */
export async function receiveFormUpload<K>(
	request: Request,
	field: string,
	rules: UploadRules<K>
): Promise<FormUpload<K>> {
	const type = request.headers.get('content-type') ?? '';
	if (!type.toLowerCase().startsWith('multipart/form-data'))
		throw new Refusal(415, 'Send the form as multipart/form-data.');
	const declared = Number(request.headers.get('content-length') ?? NaN);
	if (declared > rules.limit + FORM_FIELDS * FORM_FIELD_BYTES) {
		discardUnread(request);
		throw new Refusal(413, rules.tooLarge);
	}
	if (!request.body) throw new Refusal(400, 'The form is empty.');
	const fields: Record<string, string> = {};
	let file: Promise<(Received<K> & { name: string }) | null> | null = null;
	const parser = busboy({
		headers: { 'content-type': type },
		limits: { files: 1, fields: FORM_FIELDS, fieldSize: FORM_FIELD_BYTES, fileSize: rules.limit + 1 }
	});
	parser.on('field', (name, value) => (fields[name] = value));
	parser.on('file', (name, stream, info) => {
		if (name !== field || file) {
			stream.resume();
			return;
		}
		file = streamFile(stream, info.filename ?? '', rules);
		file.catch(() => undefined); // awaited below, once the form has been read
	});
	const body = Readable.fromWeb(request.body as unknown as NodeWebStream<Uint8Array>);
	try {
		await new Promise<void>((resolve, reject) => {
			parser.on('close', resolve);
			parser.on('error', reject);
			body.on('error', reject);
			body.pipe(parser);
		});
	} catch (e) {
		const got = await (file as Promise<Received<K> | null> | null)?.catch(() => null);
		if (got) await rm(got.path, { force: true });
		body.destroy();
		if (e instanceof Refusal) throw e;
		throw new Refusal(400, 'The form could not be read; send it again.');
	}
	return { fields, file: file ? await file : null };
}

async function streamFile<K>(
	stream: AsyncIterable<Uint8Array> & { resume(): unknown },
	name: string,
	rules: UploadRules<K>
): Promise<(Received<K> & { name: string }) | null> {
	const path = join(incomingDir(), `${randomUUID()}.part`);
	const handle = await open(path, 'wx');
	let bytes = 0;
	let kind: K | null = null;
	let head: Uint8Array[] = [];
	let headBytes = 0;
	let refusal: Refusal | null = null;
	try {
		// The whole part is read even after a refusal, so the rest of the form still arrives.
		for await (const chunk of stream) {
			if (refusal) continue;
			bytes += chunk.byteLength;
			if (bytes > rules.limit) {
				refusal = new Refusal(413, rules.tooLarge);
				continue;
			}
			if (kind !== null) {
				await handle.write(chunk);
				continue;
			}
			head.push(chunk);
			headBytes += chunk.byteLength;
			if (headBytes >= SNIFF_BYTES) {
				try {
					kind = await decide(head, rules);
				} catch (e) {
					refusal = e instanceof Refusal ? e : new Refusal(400, 'The file could not be read.');
					continue;
				}
				for (const part of head) await handle.write(part);
				head = [];
			}
		}
		if (refusal) throw refusal;
		if (bytes === 0) {
			if (!name) return close(null);
			throw new Refusal(
				400,
				`The file “${name.slice(0, 80)}” is empty; choose it again, or send the form without a file.`
			);
		}
		if (kind === null) {
			kind = await decide(head, rules);
			for (const part of head) await handle.write(part);
		}
		await handle.sync();
		return close({ path, bytes, kind, name });
	} catch (e) {
		await handle.close().catch(() => undefined);
		await rm(path, { force: true });
		throw e;
	}

	async function close<T>(value: T): Promise<T> {
		await handle.close();
		if (value === null) await rm(path, { force: true });
		return value;
	}
}
