// Personal API tokens on the JSON API: a request to /api/* (not /api/auth/*) with
// `Authorization: Bearer <token>` acts as the token's owner. Pages, form actions and better-auth's
// own endpoints ignore the header and go by the session cookie alone.
import type { RequestEvent } from '@sveltejs/kit';
import {
	bearerToken,
	findTokenOwner,
	resolveToken,
	tokenRefusalResponse,
	TokenRefusal,
	verifyStoredToken
} from './api-tokens';
import type { AuthSession } from './auth';
import { rateLimitEnabled, tokenRequestsPerMinute } from './config';
import { db } from './db';
import { throttle } from './throttle-instance';

const isTokenPath = (path: string) =>
	path.startsWith('/api/') && path !== '/api/auth' && !path.startsWith('/api/auth/');

/**
 * The owner of the request's API token, a refusal (401, 429) in the API's error shape, or null
 * when the request carries no token or is not an /api request.
 */
export async function tokenUser(event: RequestEvent): Promise<AuthSession['user'] | Response | null> {
	if (!isTokenPath(event.url.pathname)) return null;
	const token = bearerToken(event.request.headers);
	if (token === null) return null;
	const owner =
		token instanceof TokenRefusal
			? token
			: await resolveToken(token, {
					verify: (key) => verifyStoredToken(db, key),
					findUser: (id) => findTokenOwner(db, id),
					hit: (bucket, rule) => throttle.hit(bucket, rule),
					rule: rateLimitEnabled() ? { limit: tokenRequestsPerMinute(), windowMs: 60_000 } : null
				});
	return owner instanceof TokenRefusal ? tokenRefusalResponse(owner) : (owner as AuthSession['user']);
}
