import {
	apiTokenPlugin,
	bearerToken,
	findTokenOwner,
	listTokens,
	newTokenForm,
	resolveToken,
	TOKEN_PREFIX,
	TokenRefusal,
	tokenRefusalResponse,
	verifyStoredToken,
	type TokenDeps,
	type VerifyResult
} from '$lib/server/api-tokens';
import { apikey, user } from '$lib/server/db/schema';
import { requireArea } from '$lib/server/roles';
import { Throttle } from '$lib/server/throttle';
import { deleteAccountData } from '$lib/server/users';
import { validate } from '$lib/server/validate';
import { betterAuth } from 'better-auth';
import { drizzleAdapter } from 'better-auth/adapters/drizzle';
import { eq } from 'drizzle-orm';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import * as schema from '$lib/server/db/schema';
import { demoDatabase } from './factories';

let demo: Awaited<ReturnType<typeof demoDatabase>>;
let auth: ReturnType<typeof makeAuth>;
let clock: number;

function makeAuth() {
	return betterAuth({
		baseURL: 'http://localhost:3999',
		secret: 'api-token-test-secret-0123456789abcdef',
		database: drizzleAdapter(demo.db, { provider: 'sqlite', schema }),
		emailAndPassword: { enabled: true },
		rateLimit: { enabled: false },
		plugins: [apiTokenPlugin()]
	});
}

/** A seeded database and a better-auth instance with the token plugin on it, for the tests that need them. */
function withDatabase() {
	beforeEach(async () => {
		demo = await demoDatabase();
		auth = makeAuth();
		clock = Date.UTC(2026, 2, 2, 10, 0, 0);
	});
	afterEach(() => demo.close());
}

async function tokenFor(userId: string, name = 'Backup script') {
	const created = await auth.api.createApiKey({ body: { name, userId } });
	return { id: created.id, key: created.key };
}

function deps(overrides: Partial<TokenDeps<Awaited<ReturnType<typeof findTokenOwner>> & object>> = {}) {
	const throttle = new Throttle(demo.db, { enabled: true, now: () => clock });
	return {
		verify: (key: string) => verifyStoredToken(demo.db, key),
		findUser: (id: string) => findTokenOwner(demo.db, id),
		hit: throttle.hit.bind(throttle),
		rule: { limit: 300, windowMs: 60_000 },
		now: () => clock,
		...overrides
	};
}

const headers = (authorization?: string) => new Headers(authorization ? { authorization } : {});

describe('the Authorization header', () => {
	it('is optional: without it the session cookie decides', () => {
		expect(bearerToken(headers())).toBeNull();
	});

	it('takes a bearer token of ours, the scheme in any case (RFC 9110 §11.1)', () => {
		const token = TOKEN_PREFIX + 'a'.repeat(32) + 'B'.repeat(32);
		expect(bearerToken(headers(`Bearer ${token}`))).toBe(token);
		expect(bearerToken(headers(`bearer  ${token} `))).toBe(token);
	});

	it('refuses other schemes and strings that cannot be a token with 401 and a sentence', () => {
		const basic = bearerToken(headers('Basic a2FpOnNlY3JldA=='));
		expect(basic).toBeInstanceOf(TokenRefusal);
		expect((basic as TokenRefusal).status).toBe(401);
		expect((basic as TokenRefusal).message).toMatch(/Authorization: Bearer <token>/);
		for (const bad of ['Bearer', 'Bearer pp_short', `Bearer xx_${'a'.repeat(64)}`, `Bearer pp_${'a'.repeat(63)}1`]) {
			const refusal = bearerToken(headers(bad));
			expect(refusal, bad).toBeInstanceOf(TokenRefusal);
			expect((refusal as TokenRefusal).status).toBe(401);
		}
	});
});

describe('resolving a token', { timeout: 30_000 }, () => {
	withDatabase();

	it('is stored only as a hash, and listed by its first characters', async () => {
		const { key } = await tokenFor(demo.kai);
		expect(key).toMatch(/^pp_[A-Za-z]{64}$/);
		const [row] = await demo.db.select().from(apikey).where(eq(apikey.referenceId, demo.kai));
		expect(row.key).not.toContain(key.slice(3));
		const [listed] = await listTokens(demo.db, demo.kai);
		expect(listed).toMatchObject({ name: 'Backup script', start: key.slice(0, 8), lastUsedAt: null, expiresAt: null });
		expect(Object.keys(listed)).not.toContain('key');
	});

	it("acts as the owner with exactly the owner's rights", async () => {
		const student = await resolveToken((await tokenFor(demo.kai)).key, deps());
		expect(student).not.toBeInstanceOf(TokenRefusal);
		const locals = { user: student as { id: string; role: string } };
		expect(locals.user.id).toBe(demo.kai);
		expect(requireArea(locals, 'app').role).toBe('student');
		expect(() => requireArea(locals, 'teaching')).toThrow(expect.objectContaining({ status: 403 }));

		const teacher = await resolveToken((await tokenFor(demo.teacher)).key, deps());
		expect(requireArea({ user: teacher as { id: string; role: string } }, 'teaching').id).toBe(demo.teacher);
	});

	it('follows a role change at once: the role is read on every request, not kept in the token', async () => {
		const { key } = await tokenFor(demo.kai);
		await demo.db.update(user).set({ role: 'teacher' }).where(eq(user.id, demo.kai));
		const owner = (await resolveToken(key, deps())) as { role: string };
		expect(owner.role).toBe('teacher');
	});

	it('records when the token was last used, at most once a minute', async () => {
		const { key } = await tokenFor(demo.kai);
		const t0 = Date.now();
		await verifyStoredToken(demo.db, key, t0);
		await verifyStoredToken(demo.db, key, t0 + 59_000);
		expect((await listTokens(demo.db, demo.kai))[0].lastUsedAt?.getTime()).toBe(t0);
		await verifyStoredToken(demo.db, key, t0 + 60_000);
		expect((await listTokens(demo.db, demo.kai))[0].lastUsedAt?.getTime()).toBe(t0 + 60_000);
	});

	it("agrees with the plugin's own verifyApiKey on valid, revoked and expired tokens", async () => {
		const plugin = (key: string) => auth.api.verifyApiKey({ body: { key } }) as Promise<VerifyResult>;
		const live = await tokenFor(demo.kai, 'Live');
		const expired = await tokenFor(demo.kai, 'Expired');
		const revoked = await tokenFor(demo.kai, 'Revoked');
		await demo.db
			.update(apikey)
			.set({ expiresAt: new Date(Date.now() - 1000) })
			.where(eq(apikey.id, expired.id));
		await demo.db.delete(apikey).where(eq(apikey.id, revoked.id));
		const ours = await verifyStoredToken(demo.db, live.key);
		const theirs = await plugin(live.key);
		expect(ours).toMatchObject({ valid: true, key: { id: live.id, referenceId: demo.kai } });
		expect(theirs).toMatchObject({ valid: true, key: { id: live.id, referenceId: demo.kai } });
		// Ours first: the plugin deletes an expired key when it sees one.
		expect((await verifyStoredToken(demo.db, expired.key)).error?.code).toBe('KEY_EXPIRED');
		expect((await plugin(expired.key)).error?.code).toBe('KEY_EXPIRED');
		for (const check of [verifyStoredToken.bind(null, demo.db), plugin]) {
			expect((await check(revoked.key)).valid).toBe(false);
			expect((await check(live.key.slice(0, -1) + (live.key.endsWith('a') ? 'b' : 'a'))).valid).toBe(false);
		}
	});

	it('refuses a revoked token with 401', async () => {
		const { id, key } = await tokenFor(demo.kai);
		expect(await resolveToken(key, deps())).not.toBeInstanceOf(TokenRefusal);
		await demo.db.delete(apikey).where(eq(apikey.id, id));
		const refused = await resolveToken(key, deps());
		expect(refused).toBeInstanceOf(TokenRefusal);
		expect((refused as TokenRefusal).status).toBe(401);
		expect((refused as TokenRefusal).message).toMatch(/not valid/);
	});

	it('refuses an expired token with 401 and says so', async () => {
		const { id, key } = await tokenFor(demo.kai);
		await demo.db
			.update(apikey)
			.set({ expiresAt: new Date(Date.now() - 1000) })
			.where(eq(apikey.id, id));
		const refused = (await resolveToken(key, deps())) as TokenRefusal;
		expect(refused.status).toBe(401);
		expect(refused.message).toMatch(/expired/);
	});

	it("refuses a disabled account's tokens with 401", async () => {
		const { key } = await tokenFor(demo.kai);
		await demo.db.update(user).set({ banned: true }).where(eq(user.id, demo.kai));
		const refused = (await resolveToken(key, deps())) as TokenRefusal;
		expect(refused.status).toBe(401);
		expect(refused.message).toMatch(/disabled/);
	});

	it("goes with the account: deleting a person's data removes their tokens", async () => {
		const { key } = await tokenFor(demo.kai);
		await deleteAccountData(demo.db, demo.kai, null);
		expect(await listTokens(demo.db, demo.kai)).toEqual([]);
		expect(((await resolveToken(key, deps())) as TokenRefusal).status).toBe(401);
	});
});

describe('the per-token rate limit', { timeout: 30_000 }, () => {
	withDatabase();
	const rule = { limit: 3, windowMs: 60_000 };

	it('answers 429 with the seconds to wait past the limit, per token, until the minute is over', async () => {
		const first = await tokenFor(demo.kai, 'First');
		const second = await tokenFor(demo.kai, 'Second');
		for (let i = 0; i < 3; i++) expect(await resolveToken(first.key, deps({ rule }))).not.toBeInstanceOf(TokenRefusal);
		clock += 20_000;
		const refused = (await resolveToken(first.key, deps({ rule }))) as TokenRefusal;
		expect(refused.status).toBe(429);
		expect(refused.retryAfter).toBe(40);
		expect(refused.message).toMatch(/more than 3 requests in 60 seconds\. Wait 40 seconds/);
		// Another token of the same person has its own count.
		expect(await resolveToken(second.key, deps({ rule }))).not.toBeInstanceOf(TokenRefusal);
		clock += 40_001;
		expect(await resolveToken(first.key, deps({ rule }))).not.toBeInstanceOf(TokenRefusal);
	});

	it('is shared by two app instances on one database', async () => {
		const { key } = await tokenFor(demo.kai);
		const a = deps({ rule });
		const b = deps({ rule });
		await resolveToken(key, a);
		await resolveToken(key, b);
		await resolveToken(key, a);
		expect(((await resolveToken(key, b)) as TokenRefusal).status).toBe(429);
	});

	it('is off when the limits are off', async () => {
		const { key } = await tokenFor(demo.kai);
		for (let i = 0; i < 6; i++) expect(await resolveToken(key, deps({ rule: null }))).not.toBeInstanceOf(TokenRefusal);
	});
});

describe('refusals', () => {
	it("use the API's one error shape, with Retry-After on 429 and WWW-Authenticate on 401 (RFC 6750 §3)", async () => {
		const limited = tokenRefusalResponse(new TokenRefusal(429, 'Slow down.', 12));
		expect(limited.status).toBe(429);
		expect(limited.headers.get('retry-after')).toBe('12');
		expect(await limited.json()).toEqual({ error: 'Slow down.', problems: [] });
		const invalid = tokenRefusalResponse(new TokenRefusal(401, 'Not valid.'));
		expect(invalid.headers.get('www-authenticate')).toMatch(/^Bearer /);
		expect(invalid.headers.get('retry-after')).toBeNull();
	});
});

describe('the new-token form', () => {
	it('takes a trimmed name and a lifetime', () => {
		expect(validate(newTokenForm, { name: '  Backup script ', expires: '30' })).toEqual({
			ok: true,
			data: { name: 'Backup script', expires: '30' }
		});
	});

	it('refuses an empty, overlong or multi-line name and an unknown lifetime in plain words', () => {
		expect(validate(newTokenForm, { name: ' ', expires: '30' })).toMatchObject({
			ok: false,
			errors: { name: expect.stringMatching(/Give the token a name/) }
		});
		expect(validate(newTokenForm, { name: 'x'.repeat(61), expires: '30' })).toMatchObject({
			ok: false,
			errors: { name: 'Keep the name to 60 characters or fewer.' }
		});
		expect(validate(newTokenForm, { name: 'a\nb', expires: '30' })).toMatchObject({ ok: false });
		expect(validate(newTokenForm, { name: 'ok', expires: '1000' })).toMatchObject({
			ok: false,
			errors: { expires: 'Choose when the token stops working.' }
		});
	});
});
