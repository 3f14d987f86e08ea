import { simpleParser } from 'mailparser';
import nodemailer from 'nodemailer';
import { existsSync, mkdirSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { outboxDir } from './config';

export interface Mail {
	to: string;
	subject: string;
	text: string;
	/** An HTML alternative of `text`; the message is then multipart/alternative. */
	html?: string;
}

const FROM = process.env.MAIL_FROM ?? 'Padproof <no-reply@padproof.local>';

/** Sends through SMTP_URL when set; otherwise writes the message to the local outbox folder. */
export async function sendMail(mail: Mail): Promise<void> {
	// Quoted-printable keeps the text readable on the wire, folded at 76 characters (RFC 2045 §6.7).
	const message = { from: FROM, ...mail, textEncoding: 'quoted-printable' as const };
	if (process.env.SMTP_URL) {
		await nodemailer.createTransport(process.env.SMTP_URL).sendMail(message);
		return;
	}
	const transport = nodemailer.createTransport({ streamTransport: true, buffer: true, newline: 'unix' });
	const info = await transport.sendMail(message);
	const dir = outboxDir();
	mkdirSync(dir, { recursive: true });
	const name = `${new Date().toISOString().replace(/[:.]/g, '-')}-${Math.random().toString(36).slice(2, 8)}.eml`;
	writeFileSync(join(dir, name), info.message as Buffer);
}

export interface OutboxEntry {
	file: string;
	to: string;
	subject: string;
	date: string;
	body: string;
}

/**
 * The newest messages of the local outbox, decoded (headers, transfer encodings, charsets). Before
 * the first message there is no outbox folder yet: that is an empty outbox, and reading makes none.
 */
export async function readOutbox(limit = 50): Promise<OutboxEntry[]> {
	const dir = outboxDir({ create: false });
	if (!existsSync(dir)) return [];
	const files = readdirSync(dir)
		.filter((f) => f.endsWith('.eml'))
		.sort()
		.reverse()
		.slice(0, limit);
	return Promise.all(
		files.map(async (file) => {
			const mail = await simpleParser(readFileSync(join(dir, file)));
			const to = Array.isArray(mail.to) ? mail.to.map((a) => a.text).join(', ') : (mail.to?.text ?? '');
			return { file, to, subject: mail.subject ?? '', date: mail.date?.toUTCString() ?? '', body: mail.text ?? '' };
		})
	);
}
