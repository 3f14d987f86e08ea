// Runtime settings with embedded defaults, read from process.env so that drizzle-kit, the CLI
// and tests can import the server modules outside SvelteKit.
import { mkdirSync } from 'node:fs';
import { resolve } from 'node:path';

export const isProduction = () => process.env.NODE_ENV === 'production';

/** A setting that stops the start; the server entry prints its message alone and exits with 1. */
export class ConfigError extends Error {
	override name = 'ConfigError';
}

export function dataDir(): string {
	const dir = resolve(process.env.PADPROOF_DATA_DIR ?? 'data');
	mkdirSync(dir, { recursive: true });
	return dir;
}

export function databaseUrl(): string {
	return process.env.DATABASE_URL || `file:${dataDir()}/padproof.db`;
}

/**
 * How a local database file waits for the disk on commit. `normal` (the default): in WAL mode a
 * commit survives a crash of the app but may roll back after a power loss or a crash of the
 * machine; `full`: every commit waits for the disk (SQLite's `PRAGMA synchronous`,
 * https://sqlite.org/pragma.html#pragma_synchronous).
 */
export function databaseSync(): 'normal' | 'full' {
	const value = (process.env.PADPROOF_DB_SYNC ?? 'normal').toLowerCase();
	if (value !== 'normal' && value !== 'full')
		throw new ConfigError(`PADPROOF_DB_SYNC must be "normal" or "full", not "${process.env.PADPROOF_DB_SYNC}".`);
	return value;
}

export function uploadsDir(): string {
	const dir = resolve(process.env.UPLOADS_DIR ?? `${dataDir()}/uploads`);
	mkdirSync(dir, { recursive: true });
	return dir;
}

export function outboxDir(options: { create?: boolean } = {}): string {
	const dir = resolve(process.env.MAIL_OUTBOX_DIR ?? `${dataDir()}/outbox`);
	if (options.create ?? true) mkdirSync(dir, { recursive: true });
	return dir;
}

export function backupsDir(): string {
	const dir = resolve(process.env.BACKUPS_DIR ?? `${dataDir()}/backups`);
	mkdirSync(dir, { recursive: true });
	return dir;
}

export function publicOrigin(): string {
	return process.env.BETTER_AUTH_URL || process.env.ORIGIN || `http://localhost:${process.env.PORT ?? 3000}`;
}

export function demoEnabled(): boolean {
	return !isProduction() || process.env.PADPROOF_DEMO === '1';
}

/** Settings S3-compatible object storage needs; null when uploads stay on local disk. */
export function s3Settings() {
	const bucket = process.env.S3_BUCKET;
	if (!bucket) return null;
	return {
		bucket,
		endpoint: process.env.S3_ENDPOINT || undefined,
		region: process.env.S3_REGION || 'us-east-1',
		accessKeyId: process.env.S3_ACCESS_KEY_ID,
		secretAccessKey: process.env.S3_SECRET_ACCESS_KEY,
		forcePathStyle: process.env.S3_FORCE_PATH_STYLE === '1' || process.env.S3_FORCE_PATH_STYLE === 'true'
	};
}

/** The shortest BETTER_AUTH_SECRET production accepts (32 characters; better-auth's own guidance). */
export const MIN_SECRET_LENGTH = 32;

/** What stops a production start, in plain words; empty when it may start. */
export function productionProblems(env: NodeJS.ProcessEnv = process.env): string[] {
	if (env.NODE_ENV !== 'production') return [];
	const problems: string[] = [];
	const secret = env.BETTER_AUTH_SECRET ?? '';
	if (!secret)
		problems.push(
			'BETTER_AUTH_SECRET is not set. Set it to a long random string (for example: openssl rand -base64 32).'
		);
	else if (secret.length < MIN_SECRET_LENGTH)
		problems.push(
			`BETTER_AUTH_SECRET is ${secret.length} characters long; production needs at least ${MIN_SECRET_LENGTH} ` +
				'(for example: openssl rand -base64 32).'
		);
	if (!env.ORIGIN && !env.BETTER_AUTH_URL)
		problems.push(
			'ORIGIN is not set. Set it to the public address of Padproof (for example https://padproof.example.org).'
		);
	if (env.PADPROOF_RATE_LIMIT === 'off')
		problems.push('PADPROOF_RATE_LIMIT=off is for tests only; production keeps the rate limits on. Unset it.');
	if (env.S3_BUCKET && !(env.S3_ACCESS_KEY_ID && env.S3_SECRET_ACCESS_KEY))
		problems.push('S3_BUCKET is set but S3_ACCESS_KEY_ID or S3_SECRET_ACCESS_KEY is missing.');
	return problems;
}

export function assertProductionSettings(env: NodeJS.ProcessEnv = process.env) {
	const problems = productionProblems(env);
	if (problems.length)
		throw new ConfigError(`Padproof refuses to start in production:\n  - ${problems.join('\n  - ')}`);
}

/** The sign-in throttle is on unless `PADPROOF_RATE_LIMIT=off` (the browser tests set that). */
export function rateLimitEnabled(): boolean {
	return process.env.PADPROOF_RATE_LIMIT !== 'off';
}

/** A header set by a proxy you run (e.g. `x-forwarded-for`), trusted for the client address; none by default. */
export function addressHeader(): string | undefined {
	return process.env.ADDRESS_HEADER?.trim().toLowerCase() || undefined;
}

function limit(name: string, fallback: number): number {
	const value = Number(process.env[name]);
	return Number.isInteger(value) && value > 0 ? value : fallback;
}

/** How much one person may keep, so that one account cannot fill the server for everyone. */
export const limits = {
	/** Events in one recorded session (about 3 hours of constant playing at 20 events a second). */
	sessionEvents: () => limit('PADPROOF_MAX_SESSION_EVENTS', 200_000),
	/** Sessions one person keeps. */
	sessions: () => limit('PADPROOF_MAX_SESSIONS', 5_000),
	/** Mappings one person owns. */
	mappings: () => limit('PADPROOF_MAX_MAPPINGS', 500)
};

/**
 * Requests one personal API token may make in a minute (`PADPROOF_TOKEN_RATE_LIMIT`, default 300:
 * five a second, well above a script that uploads a chunk every 2 s). Off with the other limits
 * when `PADPROOF_RATE_LIMIT=off`.
 */
export const tokenRequestsPerMinute = () => limit('PADPROOF_TOKEN_RATE_LIMIT', 300);
