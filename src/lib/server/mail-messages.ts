// The teaching mails, in our own words: each as plain text and as simple HTML with the same
// content. Names and titles come from users, so the HTML escapes them.
import type { Mail } from './mail';

const escape = (s: string) =>
	s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);

interface Parts {
	to: string;
	subject: string;
	greeting: string;
	lines: string[];
	action: { label: string; url: string };
	closing?: string;
}

function compose(p: Parts): Mail {
	const closing = p.closing ?? 'See you in the rehearsal room,\nPadproof';
	const text = [p.greeting, '', ...p.lines, '', `${p.action.label}: ${p.action.url}`, '', closing, ''].join('\n');
	const html = `<!doctype html><html><body style="font-family:sans-serif;line-height:1.5">
<p>${escape(p.greeting)}</p>
${p.lines.map((l) => `<p>${escape(l)}</p>`).join('\n')}
<p><a href="${escape(p.action.url)}">${escape(p.action.label)}</a></p>
<p>${escape(closing).replace(/\n/g, '<br>')}</p>
</body></html>`;
	return { to: p.to, subject: p.subject, text, html };
}

const when = (d: Date) =>
	new Intl.DateTimeFormat('en-GB', { dateStyle: 'long', timeStyle: 'short', timeZone: 'UTC' }).format(d) + ' UTC';

export function invitationMail(a: { to: string; teacher: string; className: string; url: string }): Mail {
	return compose({
		to: a.to,
		subject: `${a.teacher} invites you to the class “${a.className}”`,
		greeting: 'Hello,',
		lines: [
			`${a.teacher} has invited you to join the class “${a.className}” on Padproof, where you practise pad drills and hand them in.`,
			'Follow the link to sign up (or sign in, if you have an account with this address) and join the class.'
		],
		action: { label: 'Join the class', url: a.url }
	});
}

export function assignmentMail(a: {
	to: string;
	name: string;
	className: string;
	drill: string;
	due: Date;
	url: string;
}) {
	return compose({
		to: a.to,
		subject: `New drill in ${a.className}: ${a.drill}`,
		greeting: `Hello ${a.name},`,
		lines: [
			`A new drill, “${a.drill}”, was given to your class “${a.className}”.`,
			`It is due on ${when(a.due)}. Practise it in the rehearsal room as often as you like, then hand in your best take.`
		],
		action: { label: 'Open the assignment', url: a.url }
	});
}

export function submissionMail(a: {
	to: string;
	teacher: string;
	student: string;
	drill: string;
	late: boolean;
	url: string;
}) {
	return compose({
		to: a.to,
		subject: `${a.student} handed in ${a.drill}${a.late ? ' (late)' : ''}`,
		greeting: `Hello ${a.teacher},`,
		lines: [
			`${a.student} handed in a take for “${a.drill}”${a.late ? ', after the due date' : ''}.`,
			'Padproof has scored it; replay it, then leave a comment and a grade.'
		],
		action: { label: 'Review the take', url: a.url }
	});
}

export function feedbackMail(a: {
	to: string;
	name: string;
	teacher: string;
	drill: string;
	grade: string;
	url: string;
}) {
	return compose({
		to: a.to,
		subject: `Feedback on ${a.drill}: ${a.grade}`,
		greeting: `Hello ${a.name},`,
		lines: [
			`${a.teacher} reviewed your take of “${a.drill}” and gave it ${a.grade}.`,
			'Read the comment next to your score.'
		],
		action: { label: 'Read the feedback', url: a.url }
	});
}
