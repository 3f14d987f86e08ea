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

/** Reads a JSON body of at most `limit` bytes and validates it; refuses with 400/413 in plain words. */
export async function readJson<T>(request: Request, schema: z.ZodType<T>, limit = 1 << 20): Promise<T> {
	const text = await request.text();
	if (text.length > limit) throw new Refusal(413, `The request is too large (over ${Math.round(limit / 1024)} KiB).`);
	let body: unknown;
	try {
		body = JSON.parse(text);
	} catch {
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
