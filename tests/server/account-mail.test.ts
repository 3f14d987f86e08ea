import { resetMail, sendCourtesyMail } from '$lib/server/account-mail';
import { readOutbox, sendMail } from '$lib/server/mail';
import { simpleParser } from 'mailparser';
import { mkdtempSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';

let dir: string;
beforeEach(() => {
	dir = mkdtempSync(join(tmpdir(), 'padproof-mail-'));
	vi.stubEnv('MAIL_OUTBOX_DIR', dir);
});
afterEach(() => {
	vi.unstubAllEnvs();
	rmSync(dir, { recursive: true, force: true });
});

describe('account mail', () => {
	it('writes a reset mail with a plain-text and an HTML part that decode to our words', async () => {
		const link = 'http://localhost:3000/reset-password?token=abcDEF123';
		await sendMail({ to: 'zoe@example.com', ...resetMail('Zoë <Brandt>', link) });
		const [file] = readdirSync(dir);
		const mail = await simpleParser(readFileSync(join(dir, file)));
		expect(mail.subject).toBe('Set a new Padproof password');
		expect(mail.text).toContain('Hello Zoë <Brandt>,');
		expect(mail.text).toContain(link);
		expect(mail.html).toContain('Hello Zoë &lt;Brandt&gt;,'); // escaped in HTML
		expect(mail.html).toContain(`href="${link}"`);
		const [entry] = await readOutbox();
		expect(entry).toMatchObject({ to: 'zoe@example.com', subject: 'Set a new Padproof password' });
		expect(entry.body).toContain(link);
	});

	it('a courtesy mail that cannot be delivered is logged, not thrown', async () => {
		vi.stubEnv('SMTP_URL', 'smtp://127.0.0.1:9/?connectionTimeout=2000');
		const log = vi.spyOn(console, 'error').mockImplementation(() => {});
		expect(await sendCourtesyMail({ to: 'a@example.com', subject: 'Welcome to Padproof', text: 'Hi' })).toBe(false);
		expect(log).toHaveBeenCalledOnce();
		log.mockRestore();
	});
});
