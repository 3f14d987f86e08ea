import { gradebook } from '$lib/server/assignments';
import { taughtClass } from '$lib/server/classes';
import { db } from '$lib/server/db';
import { gradebookCsv } from '$lib/server/gradebook-csv';
import { refusalResponse, signedIn } from '$lib/server/http';
import type { RequestHandler } from './$types';

/** The class's gradebook as CSV, one row per student and assignment (see gradebook-csv.ts). */
export const GET: RequestHandler = async ({ locals, params }) => {
	try {
		const user = signedIn(locals);
		const c = await taughtClass(db, user.id, params.id);
		const rows = await gradebook(db, user.id, c.id);
		const name = `${c.name.replace(/[^\w.-]+/g, '-').replace(/^-|-$/g, '') || 'class'}-gradebook.csv`;
		return new Response(gradebookCsv(rows), {
			headers: { 'content-type': 'text/csv; charset=utf-8', 'content-disposition': `attachment; filename="${name}"` }
		});
	} catch (e) {
		return refusalResponse(e);
	}
};
