// Mail through a real SMTP conversation: an SMTP server from the `smtp-server` package runs in
// the test, Padproof sends to it through SMTP_URL, and `mailparser` reads the message back.
// Without SMTP_URL the same message lands in the local outbox, decoded the same way.
import { simpleParser, type ParsedMail } from 'mailparser';
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import type { AddressInfo } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { SMTPServer } from 'smtp-server';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readOutbox, sendMail } from '$lib/server/mail';
import { assignmentMail, feedbackMail, invitationMail, submissionMail } from '$lib/server/mail-messages';

const received: { to: string[]; mail: ParsedMail }[] = [];
let server: SMTPServer;
let outbox = '';

beforeAll(async () => {
	server = new SMTPServer({
		authOptional: true,
		disabledCommands: ['STARTTLS'],
		onData(stream, session, callback) {
			simpleParser(stream)
				.then((mail) => {
					received.push({ to: session.envelope.rcptTo.map((r) => r.address), mail });
					callback();
				})
				.catch(callback);
		}
	});
	await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
	outbox = mkdtempSync(join(tmpdir(), 'padproof-mail-'));
});
afterAll(async () => {
	await new Promise<void>((resolve) => server.close(() => resolve()));
	rmSync(outbox, { recursive: true, force: true });
	delete process.env.SMTP_URL;
	delete process.env.MAIL_OUTBOX_DIR;
});

// A long link and letters outside ASCII: quoted-printable must fold the line and encode them
// (RFC 2045 §6.7: lines of at most 76 characters, soft breaks with "="), and the reader must get
// the original back.
const url = `http://padproof.test/join/${'x'.repeat(90)}`;
const invite = invitationMail({
	to: 'zoe@example.com',
	teacher: 'Zoë Brandão',
	className: 'Grünwald <evening> crew',
	url
});

describe('mail', () => {
	it('sends through SMTP_URL and arrives whole: subject, text and HTML, non-ASCII and a long link', async () => {
		process.env.SMTP_URL = `smtp://127.0.0.1:${(server.server.address() as AddressInfo).port}`;
		await sendMail(invite);
		delete process.env.SMTP_URL;
		const [{ to, mail }] = received;
		expect(to).toEqual(['zoe@example.com']);
		expect(mail.subject).toBe('Zoë Brandão invites you to the class “Grünwald <evening> crew”');
		expect(mail.text).toContain(`Join the class: ${url}`);
		expect(mail.text).toContain('Zoë Brandão has invited you');
		expect(mail.html).toContain(`<a href="${url}">Join the class</a>`);
		expect(mail.html).toContain('Grünwald &lt;evening&gt; crew'); // a name is text, never markup
	});

	it('writes to the local outbox without SMTP_URL, folded on the wire and read back intact', async () => {
		process.env.MAIL_OUTBOX_DIR = outbox;
		await sendMail(invite);
		const [file] = readdirSync(outbox);
		const raw = readFileSync(join(outbox, file), 'utf8');
		expect(raw).toMatch(/Content-Transfer-Encoding: quoted-printable/);
		expect(Math.max(...raw.split('\n').map((l) => l.length))).toBeLessThanOrEqual(78);
		const [entry] = await readOutbox();
		expect(entry.subject).toBe(invite.subject);
		expect(entry.to).toBe('zoe@example.com');
		expect(entry.body).toContain(url);
		expect(entry.body).not.toMatch(/=\n|=C3/);
	});

	it('has its own wording for each teaching message, in text and HTML', () => {
		const due = new Date('2027-03-01T18:00:00Z');
		const all = [
			invite,
			assignmentMail({ to: 'a@b.c', name: 'Kai', className: 'Tue', drill: 'Rolls', due, url }),
			submissionMail({ to: 'a@b.c', teacher: 'Tomas', student: 'Kai', drill: 'Rolls', late: true, url }),
			feedbackMail({ to: 'a@b.c', name: 'Kai', teacher: 'Tomas', drill: 'Rolls', grade: 'A', url })
		];
		expect(all.map((m) => m.subject)).toEqual([
			invite.subject,
			'New drill in Tue: Rolls',
			'Kai handed in Rolls (late)',
			'Feedback on Rolls: A'
		]);
		expect(all[1].text).toContain('It is due on 1 March 2027 at 18:00 UTC');
		for (const m of all) {
			expect(m.text).toContain(url);
			expect(m.html).toContain(`href="${url}"`);
		}
	});

	it('reads an outbox that does not exist yet as empty (nothing has been sent)', async () => {
		const missing = join(outbox, 'not-made-yet');
		process.env.MAIL_OUTBOX_DIR = missing;
		expect(await readOutbox()).toEqual([]);
		expect(existsSync(missing)).toBe(false);
	});
});
