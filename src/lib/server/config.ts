// Runtime settings with embedded defaults, read from process.env so that drizzle-kit, the CLI
// and tests can import the server modules outside SvelteKit.
import { mkdirSync } from 'node:fs';
import { resolve } from 'node:path';

export const isProduction = () => process.env.NODE_ENV === 'production';

export function dataDir(): string {
	const dir = resolve(process.env.PADPROOF_DATA_DIR ?? 'data');
	mkdirSync(dir, { recursive: true });
	return dir;
}

export function databaseUrl(): string {
	return process.env.DATABASE_URL || `file:${dataDir()}/padproof.db`;
}

export function uploadsDir(): string {
	const dir = resolve(process.env.UPLOADS_DIR ?? `${dataDir()}/uploads`);
	mkdirSync(dir, { recursive: true });
	return dir;
}

export function outboxDir(): string {
	const dir = resolve(process.env.MAIL_OUTBOX_DIR ?? `${dataDir()}/outbox`);
	mkdirSync(dir, { recursive: true });
	return dir;
}

export function publicOrigin(): string {
	return process.env.BETTER_AUTH_URL || process.env.ORIGIN || `http://localhost:${process.env.PORT ?? 3000}`;
}

export function demoEnabled(): boolean {
	return !isProduction() || process.env.PADPROOF_DEMO === '1';
}

/** The sign-in throttle is on unless `PADPROOF_RATE_LIMIT=off` (the browser tests set that). */
export function rateLimitEnabled(): boolean {
	return process.env.PADPROOF_RATE_LIMIT !== 'off';
}

/** A header set by a proxy you run (e.g. `x-forwarded-for`), trusted for the client address; none by default. */
export function addressHeader(): string | undefined {
	return process.env.ADDRESS_HEADER?.trim().toLowerCase() || undefined;
}
