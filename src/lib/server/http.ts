import { error as kitError, json } from '@sveltejs/kit';
import type { z } from 'zod';

/** An error a person can act on, with the HTTP status an API answers it with. */
export class Refusal extends Error {
	constructor(
		readonly status: number,
		message: string,
		readonly problems: { path: string; message: string }[] = []
	) {
		super(message);
	}
}

/** The stable error shape of every JSON endpoint: `{ error, problems }`. */
export function refusalResponse(e: unknown): Response {
	if (e instanceof Refusal) return json({ error: e.message, problems: e.problems }, { status: e.status });
	throw e;
}

/**
 * A refused request's remaining bytes are read and dropped (up to this many) so the client gets
 * the refusal instead of a reset connection; past that the connection is closed.
 */
const DRAIN_BYTES = 64 << 20;

/** Reads and drops the rest of a body in the background (see DRAIN_BYTES). */
export function drain(reader: ReadableStreamDefaultReader<Uint8Array>) {
	let seen = 0;
	const next = (): Promise<void> =>
		reader.read().then(({ done, value }) => {
			if (done) return;
			seen += value.byteLength;
			if (seen > DRAIN_BYTES) return void reader.cancel().catch(() => undefined);
			return next();
		});
	void next().catch(() => undefined);
}

/**
 * Reads and drops a body nobody read (an answer given before the body was needed), so the client
 * can finish sending and read the answer on a connection that stays usable.
 */
export function discardUnread(request: Request) {
	if (request.body && !request.bodyUsed && !request.body.locked) drain(request.body.getReader());
}

export const tooLarge = (limit: number) =>
	`The request is too large (over ${limit >= 1 << 20 ? `${Math.round(limit / (1 << 20))} MiB` : `${Math.round(limit / 1024)} KiB`}).`;

/** Reads a body of at most `limit` bytes, counting while it streams; refuses with 413 past it. */
export async function readBytes(
	request: Request,
	limit: number,
	message = tooLarge(limit)
): Promise<Uint8Array<ArrayBuffer>> {
	if (Number(request.headers.get('content-length') ?? 0) > limit) {
		discardUnread(request);
		throw new Refusal(413, message);
	}
	if (!request.body) return new Uint8Array(0);
	const reader = request.body.getReader();
	const parts: Uint8Array[] = [];
	let size = 0;
	for (;;) {
		const { done, value } = await reader.read();
		if (done) break;
		size += value.byteLength;
		if (size > limit) {
			drain(reader);
			throw new Refusal(413, message);
		}
		parts.push(value);
	}
	return Buffer.concat(parts, size);
}

/** A JSON document starts with one of these (after white space); anything else is another kind of file. */
const JSON_START = /^[\s]*[{["\-\d]|^[\s]*(true|false|null)\b/;

/** Reads a JSON body of at most `limit` bytes and validates it; refuses with 400/413/415 in plain words. */
export async function readJson<T>(request: Request, schema: z.ZodType<T>, limit = 1 << 20): Promise<T> {
	const text = new TextDecoder().decode(await readBytes(request, limit));
	let body: unknown;
	try {
		body = JSON.parse(text);
	} catch {
		if (text.trim() && !JSON_START.test(text.slice(0, 64)))
			throw new Refusal(415, 'The request body is not JSON; send a JSON document (Content-Type: application/json).');
		throw new Refusal(400, 'The request body is not valid JSON.');
	}
	const parsed = schema.safeParse(body);
	if (!parsed.success) {
		const problems = parsed.error.issues.map((i) => ({ path: i.path.join('.'), message: i.message }));
		throw new Refusal(
			400,
			`The request was refused: ${problems[0].path ? problems[0].path + ': ' : ''}${problems[0].message}`,
			problems
		);
	}
	return parsed.data;
}

export function signedIn<U>(locals: { user: U | null }): U {
	if (!locals.user) throw new Refusal(401, 'Please sign in first.');
	return locals.user;
}

/** For pages and form actions: a Refusal becomes the error page with its status and sentence. */
export function pageRefusal(e: unknown): never {
	if (e instanceof Refusal) kitError(e.status, e.message);
	throw e;
}
