import { simpleParser, type ParsedMail } from 'mailparser';
import { existsSync, readdirSync, readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';

/** The local outbox of the server on `port` (MAIL_OUTBOX_DIR in playwright.config.ts). */
export function outboxDir(port = Number(process.env.E2E_PORT ?? 4173)): string {
	return resolve(`e2e/.data/${port}/outbox`);
}

/** Waits for the newest mail to `to` whose subject matches, decoded as a mail program would. */
export async function waitForMail(to: string, subject: RegExp, timeoutMs = 10_000): Promise<ParsedMail> {
	const dir = outboxDir();
	const until = Date.now() + timeoutMs;
	for (;;) {
		const files = existsSync(dir)
			? readdirSync(dir)
					.filter((f) => f.endsWith('.eml'))
					.sort()
					.reverse()
			: [];
		for (const file of files) {
			const mail = await simpleParser(readFileSync(join(dir, file)));
			const rcpt = Array.isArray(mail.to) ? mail.to.map((a) => a.text).join() : (mail.to?.text ?? '');
			if (rcpt.includes(to) && subject.test(mail.subject ?? '')) return mail;
		}
		if (Date.now() > until) throw new Error(`No mail to ${to} matching ${subject} in ${dir}`);
		await new Promise((r) => setTimeout(r, 200));
	}
}

/** The reset link of a reset mail, from its plain-text part. */
export function resetLink(mail: ParsedMail): string {
	const link = mail.text?.match(/https?:\/\/\S+\/reset-password\?token=[\w%-]+/)?.[0];
	if (!link) throw new Error(`No reset link in: ${mail.text}`);
	return link;
}
