// Everything that reaches better-auth over HTTP (`/api/auth/*`) passes here first: bodies are
// bounded and validated with the same rules as our forms, password and mail endpoints are
// throttled, account management stays on the admin page (and API tokens on /account), and
// refusals use the app's one error shape `{ error, problems }` (better-auth itself answers a
// malformed body with an empty 500).
import type { RequestEvent } from '@sveltejs/kit';
import { json } from '@sveltejs/kit';
import { z } from 'zod';
import { clientAddress } from './address';
import { auth } from './auth';
import { Refusal } from './http';
import { passwordProblem } from './passwords';
import { throttle } from './throttle-instance';
import type { AttemptKind } from './throttle';
import { currentPassword, email, newPasswordText, password, personName } from './validate';

/** No auth request needs more; a sign-up with the longest allowed fields is under 1 KiB. */
export const AUTH_BODY_LIMIT = 16 * 1024;

const callbackURL = z.string().max(2048).optional();
const token = z.string().min(1, { error: 'The link is incomplete.' }).max(256);

interface Gate {
	body: z.ZodType<Record<string, unknown>>;
	kind?: AttemptKind;
	/** Which account the attempt is on, if any. */
	account?: (body: Record<string, unknown>, event: RequestEvent) => string | undefined;
}

const GATES: Record<string, Gate> = {
	'/sign-in/email': {
		body: z.object({ email, password: currentPassword, rememberMe: z.boolean().optional(), callbackURL }),
		kind: 'sign-in',
		account: (b) => b.email as string
	},
	'/sign-up/email': {
		body: z
			.object({ name: personName, email, password: newPasswordText, rememberMe: z.boolean().optional(), callbackURL })
			.superRefine((v, ctx) => {
				const problem = passwordProblem(v.password, [v.name, v.email]);
				if (problem) ctx.addIssue({ code: 'custom', path: ['password'], message: problem });
			}),
		kind: 'sign-up'
	},
	'/request-password-reset': {
		body: z.object({ email, redirectTo: callbackURL }),
		kind: 'reset-request',
		account: (b) => b.email as string
	},
	'/reset-password': { body: z.object({ newPassword: password, token }), kind: 'reset' },
	'/change-password': {
		body: z.object({ currentPassword, newPassword: password, revokeOtherSessions: z.boolean().optional() }),
		kind: 'password',
		account: (_b, event) => event.locals.user?.email.toLowerCase()
	},
	'/delete-user': {
		body: z.object({ password: currentPassword, callbackURL }),
		kind: 'delete',
		account: (_b, event) => event.locals.user?.email.toLowerCase()
	},
	'/update-user': { body: z.object({ name: personName.optional(), image: z.string().max(2048).nullish() }) },
	'/sign-out': { body: z.object({}) }
};

function refuse(status: number, error: string, problems: { path: string; message: string }[] = []) {
	return json({ error, problems }, { status });
}

function problemsOf(error: z.ZodError) {
	return error.issues.map((i) => ({ path: i.path.join('.'), message: i.message }));
}

async function readBody(request: Request): Promise<string> {
	const declared = Number(request.headers.get('content-length') ?? 0);
	if (declared > AUTH_BODY_LIMIT) throw new Refusal(413, 'The request is too large.');
	if (!request.body) return '';
	const reader = request.body.getReader();
	const chunks: Uint8Array[] = [];
	let size = 0;
	for (;;) {
		const { done, value } = await reader.read();
		if (done) break;
		size += value.byteLength;
		if (size > AUTH_BODY_LIMIT) {
			await reader.cancel();
			throw new Refusal(413, 'The request is too large.');
		}
		chunks.push(value);
	}
	return Buffer.concat(chunks).toString('utf8');
}

/** Answers a request under `/api/auth`. */
export async function authGate(event: RequestEvent): Promise<Response> {
	const path = event.url.pathname.slice('/api/auth'.length);
	try {
		if (path.startsWith('/admin/')) {
			return refuse(403, 'Accounts are managed on the admin page of Padproof, not through this API.');
		}
		if (path.startsWith('/api-key/')) {
			return refuse(403, 'API tokens are created and revoked on your account page (/account), not through this API.');
		}
		if (event.request.method !== 'POST') return await auth.handler(event.request);

		const text = await readBody(event.request);
		let body: unknown = {};
		if (text.trim()) {
			if (!/^application\/json\b/i.test(event.request.headers.get('content-type') ?? '')) {
				return refuse(415, 'Send the request body as JSON (Content-Type: application/json).');
			}
			try {
				body = JSON.parse(text);
			} catch {
				return refuse(400, 'The request body is not valid JSON.');
			}
			if (typeof body !== 'object' || body === null || Array.isArray(body)) {
				return refuse(400, 'The request body must be a JSON object.');
			}
		}
		const gate = GATES[path];
		let forward = text;
		let account: string | undefined;
		if (gate) {
			const parsed = gate.body.safeParse(body);
			if (!parsed.success) {
				const problems = problemsOf(parsed.error);
				const first = problems[0];
				return refuse(400, `The request was refused: ${first.path ? first.path + ': ' : ''}${first.message}`, problems);
			}
			forward = JSON.stringify(parsed.data);
			if (gate.kind) {
				account = gate.account?.(parsed.data, event);
				const address = clientAddress(event.request.headers, () => event.getClientAddress());
				const refusal = await throttle.guard({ kind: gate.kind, account, address });
				if (refusal) return refuse(refusal.status, refusal.message);
			}
		}
		const headers = new Headers(event.request.headers);
		headers.delete('content-length');
		if (forward) headers.set('content-type', 'application/json');
		const response = await auth.handler(
			new Request(event.request.url, { method: 'POST', headers, body: forward || undefined })
		);
		if (account && response.ok && gate?.kind !== 'reset-request') await throttle.succeeded(account);
		if (response.status >= 500 && !response.headers.get('content-type')?.includes('json')) {
			return refuse(response.status, 'Something went wrong on our side. Please try again in a moment.');
		}
		return response;
	} catch (e) {
		if (e instanceof Refusal) return refuse(e.status, e.message, e.problems);
		console.error('Auth request failed:', e);
		return refuse(500, 'Something went wrong on our side. Please try again in a moment.');
	}
}
