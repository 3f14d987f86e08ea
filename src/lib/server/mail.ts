// Outgoing mail through nodemailer. With SMTP_URL set it sends for real; otherwise the local
// outbox folder stands in for the mail service (one .eml file per message, read back by the
// outbox page with mailparser so encoded lines show as written).
import nodemailer from 'nodemailer';
import { simpleParser } from 'mailparser';
import { mkdirSync, readdirSync } from 'node:fs';
import { readFile, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { outboxDir } from './config';

export interface Mail {
	to: string;
	subject: string;
	text: string;
	html?: string;
}

const from = () => process.env.MAIL_FROM ?? 'Padproof <no-reply@padproof.local>';

/** Sends through SMTP_URL when set; otherwise writes the message to the local outbox folder. */
export async function sendMail(mail: Mail): Promise<void> {
	const message = { from: from(), ...mail, textEncoding: 'quoted-printable' as const };
	if (process.env.SMTP_URL) {
		await nodemailer.createTransport(process.env.SMTP_URL).sendMail(message);
		return;
	}
	const transport = nodemailer.createTransport({ streamTransport: true, buffer: true, newline: 'unix' });
	const info = await transport.sendMail(message);
	const dir = outboxDir();
	mkdirSync(dir, { recursive: true });
	const name = `${new Date().toISOString().replace(/[:.]/g, '-')}-${Math.random().toString(36).slice(2, 8)}.eml`;
	await writeFile(join(dir, name), info.message as Buffer);
}

export interface OutboxEntry {
	file: string;
	to: string;
	subject: string;
	date: string;
	body: string;
}

/** The newest messages of the local outbox, decoded (quoted-printable, base64, encoded words). */
export async function readOutbox(limit = 50): Promise<OutboxEntry[]> {
	const dir = outboxDir();
	const files = readdirSync(dir)
		.filter((f) => f.endsWith('.eml'))
		.sort()
		.reverse()
		.slice(0, limit);
	return Promise.all(
		files.map(async (file) => {
			const parsed = await simpleParser(await readFile(join(dir, file)));
			const to = Array.isArray(parsed.to) ? parsed.to.map((a) => a.text).join(', ') : (parsed.to?.text ?? '');
			return {
				file,
				to,
				subject: parsed.subject ?? '',
				date: parsed.date?.toISOString() ?? '',
				body: parsed.text ?? ''
			};
		})
	);
}
