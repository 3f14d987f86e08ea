import { building } from '$app/environment';
import { getRequestEvent } from '$app/server';
import { betterAuth } from 'better-auth';
import { drizzleAdapter } from 'better-auth/adapters/drizzle';
import { APIError } from 'better-auth/api';
import { admin } from 'better-auth/plugins';
import { createAccessControl } from 'better-auth/plugins/access';
import { adminAc, defaultStatements, userAc } from 'better-auth/plugins/admin/access';
import { sveltekitCookies } from 'better-auth/svelte-kit';
import { sendResetLink } from './account-mail';
import { apiTokenPlugin } from './api-tokens';
import { addressHeader, publicOrigin } from './config';
import { db } from './db';
import * as schema from './db/schema';
import { MAX_PASSWORD, MIN_PASSWORD } from './passwords';
import { authSecret } from './secret';
import { throttle } from './throttle-instance';
import { deleteAccountData, heirFor, lastAdminProblem } from './users';

const origin = publicOrigin();
const alternate = origin.includes('localhost')
	? origin.replace('localhost', '127.0.0.1')
	: origin.replace('127.0.0.1', 'localhost');

// Our three roles for better-auth's admin plugin: admins manage accounts, everyone else has the
// plugin's plain user rights. Which pages a role may open is still decided by `requireArea`.
const ac = createAccessControl(defaultStatements);
const roles = {
	admin: ac.newRole(adminAc.statements),
	teacher: ac.newRole(userAc.statements),
	student: ac.newRole(userAc.statements)
};

const header = addressHeader();

export const auth = betterAuth({
	baseURL: origin,
	// The build imports this module to analyse routes; no secret is needed or created then.
	secret: building ? 'build-time-placeholder-secret-not-used' : authSecret(),
	trustedOrigins: [origin, alternate],
	database: drizzleAdapter(db, { provider: 'sqlite', schema }),
	emailAndPassword: {
		enabled: true,
		minPasswordLength: MIN_PASSWORD,
		maxPasswordLength: MAX_PASSWORD,
		resetPasswordTokenExpiresIn: 60 * 60,
		revokeSessionsOnPasswordReset: true,
		sendResetPassword: ({ user, token }) => sendResetLink(user, token),
		onPasswordReset: ({ user }) => throttle.succeeded(user.email.toLowerCase())
	},
	user: {
		deleteUser: {
			enabled: true,
			beforeDelete: async (user) => {
				// Checked and claimed in one write transaction: see lastAdminProblem.
				const problem = await lastAdminProblem(db, user.id, { claim: true });
				if (problem) throw APIError.from('BAD_REQUEST', { message: problem, code: 'LAST_ADMIN' });
			}
		}
	},
	databaseHooks: {
		user: {
			delete: {
				// Runs for a self-deletion and for the admin plugin's removeUser alike.
				before: async (user) => {
					await deleteAccountData(db, user.id, await heirFor(db, user.id));
				}
			}
		}
	},
	// better-auth's own limiter keeps its counters in process memory and puts every client without
	// a trusted address header into one bucket; ours (throttle.ts, applied in auth-gate.ts and the
	// form actions) is kept in the database and counts per account as well.
	rateLimit: { enabled: false },
	advanced: {
		ipAddress: header ? { ipAddressHeaders: [header] } : { disableIpTracking: true }
	},
	plugins: [
		admin({
			ac,
			roles,
			adminRoles: ['admin'],
			defaultRole: 'student',
			defaultBanReason: 'Disabled by an admin',
			bannedUserMessage: 'This account is disabled. Ask your school’s admin to enable it again.'
		}),
		// Personal API tokens for /api/* (api-tokens.ts); made and revoked on /account only.
		apiTokenPlugin(),
		sveltekitCookies(getRequestEvent)
	]
});

export type AuthSession = typeof auth.$Infer.Session;
