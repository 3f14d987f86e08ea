import nodemailer from 'nodemailer';
import { mkdirSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { outboxDir } from './config';

export interface Mail {
	to: string;
	subject: string;
	text: string;
}

const FROM = process.env.MAIL_FROM ?? 'Padproof <no-reply@padproof.local>';

/** Sends through SMTP_URL when set; otherwise writes the message to the local outbox folder. */
export async function sendMail(mail: Mail): Promise<void> {
	if (process.env.SMTP_URL) {
		await nodemailer.createTransport(process.env.SMTP_URL).sendMail({ from: FROM, ...mail });
		return;
	}
	const transport = nodemailer.createTransport({ streamTransport: true, buffer: true, newline: 'unix' });
	const info = await transport.sendMail({ from: FROM, ...mail });
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

export function readOutbox(limit = 50): OutboxEntry[] {
	const dir = outboxDir();
	return readdirSync(dir)
		.filter((f) => f.endsWith('.eml'))
		.sort()
		.reverse()
		.slice(0, limit)
		.map((file) => {
			const raw = readFileSync(join(dir, file), 'utf8');
			const [head, ...rest] = raw.split('\n\n');
			const header = (name: string) => head.match(new RegExp(`^${name}: (.*)$`, 'mi'))?.[1] ?? '';
			return { file, to: header('To'), subject: header('Subject'), date: header('Date'), body: rest.join('\n\n') };
		});
}
