// Personal API tokens: better-auth's API-key plugin (`@better-auth/api-key`) makes, hashes, stores
// and checks them; this module holds its settings, the /account form rules, the token list and the
// resolution of `Authorization: Bearer <token>` on /api requests into the owner, with the owner's
// own rights and a per-token rate limit. It does not import the auth instance, so tests can give
// it one of their own (api-token-gate.ts wires it to the app's).
import { apiKey, defaultKeyHasher } from '@better-auth/api-key';
import { and, count, desc, eq } from 'drizzle-orm';
import { z } from 'zod';
import type { Database } from './db';
import { apikey, user } from './db/schema';
import { Refusal } from './http';
import type { Rule } from './throttle';

/** Every token starts with this, so a person (or a secret scanner) recognises one. */
export const TOKEN_PREFIX = 'pp_';
/** Random letters a–z, A–Z after the prefix: the plugin's default length (64), about 365 bits. */
export const TOKEN_LENGTH = 64;
/** Characters of a token kept readable in the list (prefix included). */
export const TOKEN_START_LENGTH = TOKEN_PREFIX.length + 5;
export const TOKEN_NAME_MAX = 60;
/** Tokens one person may hold at once. */
export const TOKENS_PER_PERSON = 25;
/** Lifetimes offered on /account, in days (the plugin allows 1–365). */
export const TOKEN_LIFETIMES = ['7', '30', '90', '365', 'never'] as const;

export const apiTokenPlugin = () =>
	apiKey({
		defaultPrefix: TOKEN_PREFIX,
		defaultKeyLength: TOKEN_LENGTH,
		startingCharactersConfig: { shouldStore: true, charactersLength: TOKEN_START_LENGTH },
		requireName: true,
		minimumNameLength: 1,
		maximumNameLength: TOKEN_NAME_MAX,
		keyExpiration: { defaultExpiresIn: null, minExpiresIn: 1, maxExpiresIn: 365 },
		// The plugin measures its window from a key's *last* request, so a client that keeps a
		// steady pace is refused after `max` requests however slowly they came. Tokens are counted
		// by the app's throttle instead (a fixed minute from the first request, in the database).
		rateLimit: { enabled: false },
		enableMetadata: false
	});

const noControl = /^[^\p{Cc}]*$/u;

export const newTokenForm = z.object({
	name: z
		.string()
		.trim()
		.min(1, { error: 'Give the token a name, for example “Backup script”.' })
		.max(TOKEN_NAME_MAX, { error: `Keep the name to ${TOKEN_NAME_MAX} characters or fewer.` })
		.regex(noControl, { error: 'The name cannot contain line breaks or control characters.' }),
	expires: z.enum(TOKEN_LIFETIMES, { error: 'Choose when the token stops working.' })
});

export const revokeTokenForm = z.object({
	id: z.string().min(1, { error: 'Which token? Reload the page and try again.' }).max(128)
});

/** The plugin's expiresIn (seconds) for a lifetime chosen on /account; null never expires. */
export function expiresInSeconds(expires: (typeof TOKEN_LIFETIMES)[number]): number | null {
	return expires === 'never' ? null : Number(expires) * 24 * 60 * 60;
}

export interface TokenRow {
	id: string;
	name: string | null;
	start: string | null;
	createdAt: Date;
	lastUsedAt: Date | null;
	expiresAt: Date | null;
}

/** A person's tokens, newest first; never the hash. */
export async function listTokens(db: Database, userId: string): Promise<TokenRow[]> {
	return db
		.select({
			id: apikey.id,
			name: apikey.name,
			start: apikey.start,
			createdAt: apikey.createdAt,
			lastUsedAt: apikey.lastRequest,
			expiresAt: apikey.expiresAt
		})
		.from(apikey)
		.where(eq(apikey.referenceId, userId))
		.orderBy(desc(apikey.createdAt));
}

export async function countTokens(db: Database, userId: string): Promise<number> {
	const [row] = await db.select({ n: count() }).from(apikey).where(eq(apikey.referenceId, userId));
	return row?.n ?? 0;
}

export async function deleteTokensOf(db: Pick<Database, 'delete'>, userId: string) {
	await db.delete(apikey).where(eq(apikey.referenceId, userId));
}

export async function tokenOwnedBy(db: Database, id: string, userId: string): Promise<boolean> {
	const [row] = await db
		.select({ id: apikey.id })
		.from(apikey)
		.where(and(eq(apikey.id, id), eq(apikey.referenceId, userId)));
	return Boolean(row);
}

// ---- Resolving a token on an /api request ----

/** A refusal of a token request; `retryAfter` (seconds) goes into the Retry-After header. */
export class TokenRefusal extends Refusal {
	constructor(
		status: number,
		message: string,
		readonly retryAfter?: number
	) {
		super(status, message);
	}
}

const HOW = 'Send a personal API token as “Authorization: Bearer <token>”; create one on your account page (/account).';
const NOT_VALID =
	'This API token is not valid: it was revoked, mistyped or has expired. Create a new one on your account page.';

/**
 * The token of an `Authorization` header: null when there is none (the session cookie decides),
 * a TokenRefusal when it is not a bearer token of ours. The scheme is case-insensitive
 * (RFC 9110 §11.1; bearer tokens: RFC 6750 §2.1).
 */
export function bearerToken(headers: Headers): string | TokenRefusal | null {
	const header = headers.get('authorization');
	if (header === null) return null;
	const match = /^\s*bearer\s+(\S+)\s*$/i.exec(header);
	if (!match) return new TokenRefusal(401, `The Authorization header is not understood. ${HOW}`);
	const token = match[1];
	const shape = new RegExp(`^${TOKEN_PREFIX}[A-Za-z]{${TOKEN_LENGTH}}$`);
	// Not one of ours at all: refused without a database look-up.
	if (!shape.test(token)) return new TokenRefusal(401, NOT_VALID);
	return token;
}

/** What better-auth's `verifyApiKey` answers (the part used here); `verifyStoredToken` answers the same. */
export interface VerifyResult {
	valid: boolean;
	error: { code?: string; message?: string } | null;
	key: { id: string; referenceId: string; name?: string | null } | null;
}

/** "Last used" is written at most this often, not on every request (one write less per request). */
export const LAST_USED_STEP_MS = 60_000;

/**
 * Checks a token against the plugin's table the way its `verifyApiKey` does for our settings
 * (same hash, `enabled`, `expiresAt`; no usage quota, permissions or plugin limiter are used), but
 * with one read and at most one write a minute: `verifyApiKey` writes the row twice on every
 * request. Expired rows are left to the plugin, which deletes them when tokens are made or revoked.
 */
export async function verifyStoredToken(db: Database, key: string, now = Date.now()): Promise<VerifyResult> {
	const [row] = await db
		.select({
			id: apikey.id,
			referenceId: apikey.referenceId,
			name: apikey.name,
			enabled: apikey.enabled,
			expiresAt: apikey.expiresAt,
			lastRequest: apikey.lastRequest
		})
		.from(apikey)
		.where(eq(apikey.key, await defaultKeyHasher(key)));
	if (!row || row.enabled === false) return { valid: false, error: { code: 'INVALID_API_KEY' }, key: null };
	if (row.expiresAt && row.expiresAt.getTime() <= now)
		return { valid: false, error: { code: 'KEY_EXPIRED' }, key: null };
	if (!row.lastRequest || now - row.lastRequest.getTime() >= LAST_USED_STEP_MS) {
		await db
			.update(apikey)
			.set({ lastRequest: new Date(now) })
			.where(eq(apikey.id, row.id));
	}
	return { valid: true, error: null, key: { id: row.id, referenceId: row.referenceId, name: row.name } };
}

export interface TokenDeps<U> {
	/** `verifyStoredToken`, or better-auth's `auth.api.verifyApiKey({ body: { key } })`. */
	verify: (key: string) => Promise<VerifyResult>;
	findUser: (id: string) => Promise<U | null>;
	/** The app's throttle (throttle.ts `hit`): counts one request in a bucket kept in the database. */
	hit: (bucket: string, rule: Rule) => Promise<{ hits: number; retryAfterMs: number }>;
	/** Requests a token may make in a window; null: no limit (`PADPROOF_RATE_LIMIT=off`). */
	rule: Rule | null;
	now?: () => number;
}

type Owner = { id: string; banned?: boolean | null; banExpires?: Date | null };

/**
 * The owner of a valid token, counted against the token's rate limit. A token acts with exactly
 * its owner's rights: the caller puts the owner in `locals.user`, where every endpoint's own
 * role and ownership checks read it, as for a session cookie.
 */
export async function resolveToken<U extends Owner>(token: string, deps: TokenDeps<U>): Promise<U | TokenRefusal> {
	const result = await deps.verify(token);
	if (!result.valid || !result.key) {
		const expired = result.error?.code === 'KEY_EXPIRED';
		return new TokenRefusal(
			401,
			expired ? 'This API token has expired. Create a new one on your account page.' : NOT_VALID
		);
	}
	const owner = await deps.findUser(result.key.referenceId);
	if (!owner) return new TokenRefusal(401, NOT_VALID);
	const now = deps.now?.() ?? Date.now();
	if (owner.banned && (!owner.banExpires || owner.banExpires.getTime() > now)) {
		return new TokenRefusal(401, 'This account is disabled, and so are its API tokens. Ask your school’s admin.');
	}
	if (deps.rule) {
		const { hits, retryAfterMs } = await deps.hit(`token:${result.key.id}`, deps.rule);
		if (hits > deps.rule.limit) {
			const seconds = Math.max(1, Math.ceil(retryAfterMs / 1000));
			return new TokenRefusal(
				429,
				`This API token made more than ${deps.rule.limit} requests in ${Math.round(deps.rule.windowMs / 1000)} seconds. ` +
					`Wait ${seconds} second${seconds === 1 ? '' : 's'} and try again.`,
				seconds
			);
		}
	}
	return owner;
}

/** A refusal in the API's one error shape, with Retry-After (429) or WWW-Authenticate (401, RFC 6750 §3). */
export function tokenRefusalResponse(refusal: TokenRefusal): Response {
	const headers = new Headers({ 'content-type': 'application/json' });
	if (refusal.retryAfter !== undefined) headers.set('retry-after', String(refusal.retryAfter));
	if (refusal.status === 401) headers.set('www-authenticate', 'Bearer realm="padproof", error="invalid_token"');
	return new Response(JSON.stringify({ error: refusal.message, problems: refusal.problems }), {
		status: refusal.status,
		headers
	});
}

/** The owner's row as better-auth's session user has it. */
export async function findTokenOwner(db: Database, id: string) {
	const [row] = await db.select().from(user).where(eq(user.id, id));
	return row ?? null;
}
