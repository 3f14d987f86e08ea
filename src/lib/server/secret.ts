import { randomBytes } from 'node:crypto';
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { assertProductionSettings, dataDir, isProduction } from './config';

/**
 * The auth secret: BETTER_AUTH_SECRET when set. In production a missing or short one (under 32
 * characters) stops the start with a ConfigError; a local run generates one once and keeps it
 * under the data folder, so sessions survive restarts.
 */
export function authSecret(): string {
	if (isProduction()) assertProductionSettings();
	const fromEnv = process.env.BETTER_AUTH_SECRET;
	if (fromEnv) return fromEnv;
	const file = join(dataDir(), 'auth-secret');
	if (existsSync(file)) return readFileSync(file, 'utf8').trim();
	const secret = randomBytes(32).toString('base64url');
	writeFileSync(file, secret + '\n', { mode: 0o600 });
	return secret;
}
