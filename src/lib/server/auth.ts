import { building } from '$app/environment';
import { getRequestEvent } from '$app/server';
import { betterAuth } from 'better-auth';
import { drizzleAdapter } from 'better-auth/adapters/drizzle';
import { sveltekitCookies } from 'better-auth/svelte-kit';
import { publicOrigin } from './config';
import { db } from './db';
import * as schema from './db/schema';
import { authSecret } from './secret';

const origin = publicOrigin();
const alternate = origin.includes('localhost')
	? origin.replace('localhost', '127.0.0.1')
	: origin.replace('127.0.0.1', 'localhost');

export const auth = betterAuth({
	baseURL: origin,
	// The build imports this module to analyse routes; no secret is needed or created then.
	secret: building ? 'build-time-placeholder-secret-not-used' : authSecret(),
	trustedOrigins: [origin, alternate],
	database: drizzleAdapter(db, { provider: 'sqlite', schema }),
	emailAndPassword: { enabled: true, minPasswordLength: 8, maxPasswordLength: 128 },
	user: {
		additionalFields: {
			role: { type: 'string', required: false, defaultValue: 'student', input: false }
		}
	},
	rateLimit: { enabled: process.env.PADPROOF_RATE_LIMIT !== 'off' && process.env.NODE_ENV === 'production' },
	advanced: {
		ipAddress: {
			ipAddressHeaders: process.env.ADDRESS_HEADER ? [process.env.ADDRESS_HEADER] : undefined
		}
	},
	plugins: [sveltekitCookies(getRequestEvent)]
});

export type AuthSession = typeof auth.$Infer.Session;
