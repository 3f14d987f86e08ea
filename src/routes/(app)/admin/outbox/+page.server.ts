import { readOutbox } from '$lib/server/mail';
import { requireArea } from '$lib/server/roles';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals }) => {
	requireArea(locals, 'admin');
	return { mails: process.env.SMTP_URL ? [] : await readOutbox(), smtp: Boolean(process.env.SMTP_URL) };
};
