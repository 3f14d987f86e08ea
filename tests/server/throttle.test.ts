import { clientAddress, normalizeAddress } from '$lib/server/address';
import { openDatabase, prepareDatabase } from '$lib/server/db';
import { RULES, Throttle } from '$lib/server/throttle';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';

let dir: string;
let handle: ReturnType<typeof openDatabase>;
let clock: number;
const now = () => clock;

beforeEach(async () => {
	dir = mkdtempSync(join(tmpdir(), 'padproof-throttle-'));
	handle = openDatabase(`file:${join(dir, 'test.db')}`);
	await prepareDatabase(handle.client, handle.db);
	clock = Date.UTC(2026, 0, 5, 9, 0, 0);
});

afterEach(() => {
	handle.client.close();
	rmSync(dir, { recursive: true, force: true });
});

const throttle = () => new Throttle(handle.db, { enabled: true, now });

describe('per account', () => {
	it('locks an account after 10 failed attempts from any mix of addresses, with a clear message', async () => {
		const t = throttle();
		for (let i = 0; i < 10; i++) {
			const refusal = await t.guard({
				kind: 'sign-in',
				account: 'kai@mixlab.example',
				address: i % 2 ? '198.51.100.1' : '203.0.113.9'
			});
			expect(refusal).toBeNull();
		}
		const eleventh = await t.guard({ kind: 'sign-in', account: 'kai@mixlab.example', address: '192.0.2.44' });
		expect(eleventh?.status).toBe(429);
		expect(eleventh?.message).toMatch(/Too many wrong passwords for this account\. It is locked for 15 minutes/);
		// Another account from the same addresses is not affected.
		expect(await t.guard({ kind: 'sign-in', account: 'lena@mixlab.example', address: '203.0.113.9' })).toBeNull();
	});

	it('shares the count between two app instances on one database', async () => {
		const a = throttle();
		const b = throttle();
		for (let i = 0; i < 5; i++)
			await a.guard({ kind: 'sign-in', account: 'omar@mixlab.example', address: '203.0.113.1' });
		for (let i = 0; i < 5; i++)
			await b.guard({ kind: 'password', account: 'omar@mixlab.example', address: '203.0.113.2' });
		expect((await a.guard({ kind: 'sign-in', account: 'omar@mixlab.example', address: '203.0.113.3' }))?.status).toBe(
			429
		);
	});

	it('opens again when the 15-minute window has passed (injected clock)', async () => {
		const t = throttle();
		for (let i = 0; i < 11; i++)
			await t.guard({ kind: 'sign-in', account: 'kai@mixlab.example', address: '203.0.113.9' });
		clock += RULES.account.windowMs - 60_000;
		const late = await t.guard({ kind: 'sign-in', account: 'kai@mixlab.example', address: '203.0.113.9' });
		expect(late?.message).toMatch(/locked for a minute/);
		clock += 60_000;
		expect(await t.guard({ kind: 'sign-in', account: 'kai@mixlab.example', address: '203.0.113.9' })).toBeNull();
	});

	it('starts counting again after a right password', async () => {
		const t = throttle();
		for (let i = 0; i < 9; i++)
			await t.guard({ kind: 'sign-in', account: 'kai@mixlab.example', address: '203.0.113.9' });
		await t.succeeded('kai@mixlab.example');
		for (let i = 0; i < 10; i++) {
			expect(await t.guard({ kind: 'sign-in', account: 'kai@mixlab.example', address: '203.0.113.9' })).toBeNull();
		}
		expect(await t.guard({ kind: 'sign-in', account: 'kai@mixlab.example', address: '203.0.113.9' })).not.toBeNull();
	});

	it('limits reset mails per email address', async () => {
		const t = throttle();
		for (let i = 0; i < RULES.resetMail.limit; i++) {
			expect(
				await t.guard({ kind: 'reset-request', account: 'kai@mixlab.example', address: `203.0.113.${i}` })
			).toBeNull();
		}
		const next = await t.guard({ kind: 'reset-request', account: 'kai@mixlab.example', address: '203.0.113.99' });
		expect(next?.status).toBe(429);
		expect(next?.message).toMatch(/reset links/);
	});
});

describe('per address', () => {
	it('lets a whole class behind one router sign in (60 attempts in a minute) and refuses past the limit', async () => {
		const t = throttle();
		expect(RULES.address.limit).toBeGreaterThanOrEqual(60);
		for (let i = 0; i < RULES.address.limit; i++) {
			const kind = i % 3 === 0 ? 'sign-up' : 'sign-in';
			expect(await t.guard({ kind, account: `student${i}@school.example`, address: '203.0.113.50' })).toBeNull();
			clock += 100;
		}
		const over = await t.guard({ kind: 'sign-in', account: 'new@school.example', address: '203.0.113.50' });
		expect(over?.status).toBe(429);
		expect(over?.message).toMatch(/Too many attempts from your network/);
		// Another address is unaffected, and the first one opens after the minute.
		expect(await t.guard({ kind: 'sign-in', account: 'new@school.example', address: '203.0.113.51' })).toBeNull();
		clock += RULES.address.windowMs;
		expect(await t.guard({ kind: 'sign-in', account: 'new@school.example', address: '203.0.113.50' })).toBeNull();
	});

	it('does nothing when turned off (PADPROOF_RATE_LIMIT=off)', async () => {
		const t = new Throttle(handle.db, { enabled: false, now });
		for (let i = 0; i < 200; i++) {
			expect(await t.guard({ kind: 'sign-in', account: 'kai@mixlab.example', address: '203.0.113.9' })).toBeNull();
		}
	});
});

describe('clientAddress', () => {
	const socket = () => '::ffff:192.0.2.10';

	it('uses the socket address and ignores forwarded headers unless one is configured', () => {
		const headers = new Headers({ 'x-forwarded-for': '203.0.113.66' });
		expect(clientAddress(headers, socket, undefined)).toBe('192.0.2.10');
	});

	it('trusts the configured header, taking the entry the proxy added (right-most)', () => {
		const headers = new Headers({ 'x-forwarded-for': '10.9.9.9, 203.0.113.66' });
		expect(clientAddress(headers, socket, 'x-forwarded-for')).toBe('203.0.113.66');
		expect(clientAddress(new Headers(), socket, 'x-forwarded-for')).toBe('192.0.2.10');
	});

	it('counts IPv6 clients per /64 and marks garbage as unknown', () => {
		expect(normalizeAddress('2001:db8:1:2:aaaa::1')).toBe('2001:0db8:0001:0002::/64');
		expect(normalizeAddress('2001:DB8:1:2:ffff:1:2:3')).toBe('2001:0db8:0001:0002::/64');
		expect(normalizeAddress('not an address')).toBe('unknown');
	});
});
