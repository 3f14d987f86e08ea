// The mails Padproof sends about accounts, in plain text and HTML, in our own words.
import { publicOrigin } from './config';
import { sendMail, type Mail } from './mail';

const escape = (s: string) =>
	s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);

function html(paragraphs: string[], link?: { href: string; label: string }): string {
	const body = paragraphs.map((p) => `<p style="margin:0 0 16px">${escape(p)}</p>`);
	if (link) {
		body.splice(
			1,
			0,
			`<p style="margin:0 0 16px"><a href="${escape(link.href)}" style="display:inline-block;padding:10px 18px;` +
				`border-radius:8px;background:#2dd4a7;color:#0b0f14;font-weight:600;text-decoration:none">` +
				`${escape(link.label)}</a></p>`,
			`<p style="margin:0 0 16px;font-size:13px;color:#555">Or open this address: ${escape(link.href)}</p>`
		);
	}
	return (
		'<!doctype html><html><head><meta charset="utf-8"></head>' +
		`<body style="font-family:system-ui,sans-serif;font-size:15px;line-height:1.5;color:#111">${body.join('')}` +
		'<p style="margin:24px 0 0;font-size:13px;color:#555">Padproof — rehearse your pads before the gig.</p></body></html>'
	);
}

export function resetMail(name: string, link: string): Omit<Mail, 'to'> {
	const lines = [
		`Hello ${name},`,
		'someone (we hope you) asked to set a new Padproof password for this address. Open the link within an hour to choose one; it works once.',
		'Setting the new password signs this account out on every other device. If you did not ask for this, ignore this mail: your password stays as it is.'
	];
	return {
		subject: 'Set a new Padproof password',
		text: `${lines[0]}\n\n${lines[1]}\n\n${link}\n\n${lines[2]}\n`,
		html: html(lines, { href: link, label: 'Choose a new password' })
	};
}

/** better-auth's `sendResetPassword`: the link opens our own page, which sets the password. */
export async function sendResetLink(user: { name: string; email: string }, token: string) {
	const link = `${publicOrigin()}/reset-password?token=${encodeURIComponent(token)}`;
	await sendMail({ to: user.email, ...resetMail(user.name, link) });
}

export function welcomeMail(name: string): Omit<Mail, 'to'> {
	const lines = [
		`Hello ${name},`,
		'your Padproof account is ready. Sign in to rehearse your pads, record takes and replay them.'
	];
	const link = `${publicOrigin()}/signin`;
	return {
		subject: 'Welcome to Padproof',
		text: `${lines[0]}\n\n${lines[1]}\n\n${link}\n`,
		html: html(lines, { href: link, label: 'Sign in' })
	};
}

export function passwordChangedMail(name: string): Omit<Mail, 'to'> {
	const lines = [
		`Hello ${name},`,
		'the password of your Padproof account was just changed, and other devices were signed out.',
		'If this was not you, ask for a reset link on the sign-in page and tell your school’s admin at once.'
	];
	return { subject: 'Your Padproof password was changed', text: lines.join('\n\n') + '\n', html: html(lines) };
}

/** Sends a mail that is a courtesy, not a step: a failure is logged and the request goes on. */
export async function sendCourtesyMail(mail: Mail): Promise<boolean> {
	try {
		await sendMail(mail);
		return true;
	} catch (e) {
		console.error(`Mail "${mail.subject}" to ${mail.to} could not be sent:`, e);
		return false;
	}
}
