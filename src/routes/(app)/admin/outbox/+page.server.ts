import { readOutbox } from '$lib/server/mail';
import { requireArea } from '$lib/server/roles';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = ({ locals }) => {
	requireArea(locals, 'admin');
	return { mails: process.env.SMTP_URL ? [] : readOutbox(), smtp: Boolean(process.env.SMTP_URL) };
};
