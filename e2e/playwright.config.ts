import { defineConfig } from '@playwright/test';
import { existsSync, mkdirSync, rmSync } from 'node:fs';
import { resolve } from 'node:path';

// The suite runs against the built app (`node build`) on a fresh database. E2E_DEV=1 runs it
// against `vite dev` instead, and E2E_PORT picks the port, so several people can run it at once.
const port = Number(process.env.E2E_PORT ?? 4173);
const origin = `http://localhost:${port}`;
const dataDir = resolve(`e2e/.data/${port}`);
// A second server on the next port keeps the sign-in throttle on (e2e/throttle.spec.ts).
const throttledPort = port + 1;
const throttledDir = resolve(`e2e/.data/${port}-throttled`);
// Workers load this file again while the server runs: only the runner itself starts afresh.
if (!process.env.TEST_WORKER_INDEX) {
	for (const dir of [dataDir, throttledDir]) {
		rmSync(dir, { recursive: true, force: true });
		mkdirSync(dir, { recursive: true });
	}
}

const chromium = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium';
if (!existsSync(chromium)) {
	throw new Error(
		`Browser tests need Chromium at ${chromium}. Install it with "sudo apt-get install -y chromium" ` +
			'or point CHROMIUM_PATH at a Chromium or Chrome binary.'
	);
}

const throttledOrigin = `http://localhost:${throttledPort}`;

const env = {
	PORT: String(port),
	ORIGIN: origin,
	BETTER_AUTH_URL: origin,
	BETTER_AUTH_SECRET: 'e2e-secret-e2e-secret-e2e-secret-0123',
	DATABASE_URL: `file:${dataDir}/padproof.db`,
	UPLOADS_DIR: `${dataDir}/uploads`,
	MAIL_OUTBOX_DIR: `${dataDir}/outbox`,
	PADPROOF_DATA_DIR: dataDir,
	PADPROOF_DEMO: '1',
	PADPROOF_RATE_LIMIT: 'off'
};

export default defineConfig({
	testDir: '.',
	outputDir: `../test-results/${port}`,
	fullyParallel: false,
	workers: 1,
	retries: Number(process.env.E2E_RETRIES ?? 0), // local debugging only; CI runs without retries
	timeout: 60_000,
	reporter: process.env.CI ? [['list']] : [['list']],
	use: {
		baseURL: origin,
		trace: 'retain-on-failure',
		launchOptions: {
			executablePath: chromium,
			args: [
				'--no-sandbox',
				'--disable-gpu',
				'--disable-quic',
				'--no-first-run',
				'--disable-background-networking',
				'--disable-component-update',
				'--disable-sync',
				'--autoplay-policy=no-user-gesture-required'
			]
		}
	},
	// Started one after the other: the second reuses the first one's build.
	webServer: [
		{
			command: process.env.E2E_DEV ? `npx vite dev --port ${port} --strictPort` : 'npm run build && node build',
			cwd: '..',
			url: origin,
			timeout: 480_000,
			reuseExistingServer: false,
			env
		},
		{
			command: process.env.E2E_DEV ? `npx vite dev --port ${throttledPort} --strictPort` : 'node build',
			cwd: '..',
			url: throttledOrigin,
			timeout: 120_000,
			reuseExistingServer: false,
			env: {
				...env,
				PORT: String(throttledPort),
				ORIGIN: throttledOrigin,
				BETTER_AUTH_URL: throttledOrigin,
				DATABASE_URL: `file:${throttledDir}/padproof.db`,
				UPLOADS_DIR: `${throttledDir}/uploads`,
				MAIL_OUTBOX_DIR: `${throttledDir}/outbox`,
				PADPROOF_DATA_DIR: throttledDir,
				PADPROOF_RATE_LIMIT: 'on'
			}
		}
	]
});
