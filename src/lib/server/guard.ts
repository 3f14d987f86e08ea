// What every request passes: a body limit for everything that does not stream its body under a
// limit of its own, and the security headers of every answer.
import type { RequestEvent } from '@sveltejs/kit';
import { publicOrigin } from './config';
import { discardUnread, readBytes, Refusal, refusalResponse, tooLarge } from './http';

/** Bodies of pages, form actions and the auth endpoints (1 MiB); JSON API routes set their own. */
export const GENERAL_BODY_LIMIT = 1 << 20;

/** A submission form carries its audio file (up to 50 MB); its action streams it under that size itself. */
const FORM_UPLOAD_ROUTES = new Set(['/(app)/assignments/[id]']);
const FORM_UPLOAD_LIMIT = 51 * 1024 * 1024;

/** SvelteKit endpoints under /api read their bodies through readJson/receiveUpload, with limits of their own. */
const ownLimit = (event: RequestEvent) => event.route.id?.startsWith('/api/') ?? false;

/** Refuses a body over the general limit with 413 in the API's error shape; null lets the request on. */
export async function limitBody(event: RequestEvent): Promise<Response | null> {
	const request = event.request;
	if (!request.body || ownLimit(event)) return null;
	const streams = FORM_UPLOAD_ROUTES.has(event.route.id ?? '');
	const limit = streams ? FORM_UPLOAD_LIMIT : GENERAL_BODY_LIMIT;
	const declared = request.headers.get('content-length');
	if (declared !== null || streams) {
		// A form that streams its file is never held here: only a declared length is checked.
		if (declared === null || Number(declared) <= limit) return null;
		discardUnread(request);
		return refusalResponse(new Refusal(413, tooLarge(limit)));
	}
	// A body without a declared length is read here, under the limit, and handed on whole.
	try {
		const body = await readBytes(request, limit);
		event.request = new Request(request.url, { method: request.method, headers: request.headers, body });
		return null;
	} catch (e) {
		return refusalResponse(e);
	}
}

/** One year (RFC 6797 §6.1.1 max-age; a year is common practice). Subdomains are left to the school. */
const HSTS = 'max-age=31536000';

/**
 * Security headers of every answer: no sniffing of content types, no referrer to other sites, no
 * framing (the page CSP from svelte.config.js says `frame-ancestors 'none'` too; answers without
 * a CSP get a closed one), and HSTS when Padproof is served over https.
 */
export function secureHeaders(response: Response, origin = publicOrigin()): Response {
	const apply = (headers: Headers) => {
		headers.set('x-content-type-options', 'nosniff');
		headers.set('referrer-policy', 'same-origin');
		headers.set('x-frame-options', 'DENY');
		if (!headers.has('content-security-policy'))
			headers.set('content-security-policy', "default-src 'none'; frame-ancestors 'none'; sandbox");
		if (origin.startsWith('https://')) headers.set('strict-transport-security', HSTS);
	};
	try {
		apply(response.headers);
		return response;
	} catch {
		// Some answers (a fetch result, Response.redirect) have immutable headers: copy them.
		const copy = new Response(response.body, response);
		apply(copy.headers);
		return copy;
	}
}

/**
 * better-auth answers its refusals as `{ message, code }` (and some failures with an empty body);
 * they get the app's one error shape too. `message` and `code` stay for its own client.
 */
export async function authErrorShape(event: RequestEvent, response: Response): Promise<Response> {
	if (response.status < 400 || !event.url.pathname.startsWith('/api/auth/')) return response;
	const text = await response.text();
	let body: Record<string, unknown> = {};
	try {
		const parsed = JSON.parse(text);
		if (parsed && typeof parsed === 'object' && !Array.isArray(parsed)) body = parsed;
	} catch {
		/* an empty or non-JSON body */
	}
	const error =
		typeof body.error === 'string'
			? body.error
			: typeof body.message === 'string' && body.message
				? body.message
				: response.status >= 500
					? 'The server could not complete this request; try again in a moment.'
					: `The request was refused (${response.status}).`;
	const headers = new Headers(response.headers);
	headers.set('content-type', 'application/json');
	headers.delete('content-length');
	return new Response(JSON.stringify({ ...body, error, problems: Array.isArray(body.problems) ? body.problems : [] }), {
		status: response.status,
		headers
	});
}
