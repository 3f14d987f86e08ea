import { randomBytes } from 'node:crypto';
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { dataDir, isProduction } from './config';

/**
 * The auth secret: BETTER_AUTH_SECRET when set; in production its absence stops the start;
 * a local run generates one once and keeps it under the data folder, so sessions survive restarts.
 */
export function authSecret(): string {
	const fromEnv = process.env.BETTER_AUTH_SECRET;
	if (fromEnv) return fromEnv;
	if (isProduction() && process.env.PADPROOF_LOCAL_SECRET !== '1') {
		throw new Error(
			'BETTER_AUTH_SECRET is not set. Padproof refuses to start in production without it: ' +
				'set it to a long random string (for example: openssl rand -base64 32).'
		);
	}
	const file = join(dataDir(), 'auth-secret');
	if (existsSync(file)) return readFileSync(file, 'utf8').trim();
	const secret = randomBytes(32).toString('base64url');
	writeFileSync(file, secret + '\n', { mode: 0o600 });
	return secret;
}
