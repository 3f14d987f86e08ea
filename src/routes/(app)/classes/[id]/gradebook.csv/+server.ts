import { gradebook } from '$lib/server/assignments';
import { taughtClass } from '$lib/server/classes';
import { db } from '$lib/server/db';
import { refusalResponse, signedIn } from '$lib/server/http';
import Papa from 'papaparse';
import type { RequestHandler } from './$types';

/** The class's gradebook as CSV (RFC 4180 quoting by papaparse), one row per student and assignment. */
export const GET: RequestHandler = async ({ locals, params }) => {
	try {
		const user = signedIn(locals);
		const c = await taughtClass(db, user.id, params.id);
		const rows = await gradebook(db, user.id, c.id);
		const csv = Papa.unparse({
			fields: [
				'student',
				'email',
				'assignment',
				'due',
				'submitted',
				'late',
				'hit_rate',
				'mean_abs_ms',
				'findings',
				'passed',
				'grade',
				'comment'
			],
			data: rows.map((r) => [
				r.student,
				r.email,
				r.assignment,
				r.due,
				r.submitted ?? '',
				r.late === null ? '' : r.late ? 'yes' : 'no',
				r.hitRate === null ? '' : r.hitRate.toFixed(4),
				r.meanAbsMs === null ? '' : r.meanAbsMs.toFixed(1),
				r.findings ?? '',
				r.pass === null ? '' : r.pass ? 'yes' : 'no',
				r.grade ?? '',
				r.comment ?? ''
			])
		});
		const name = `${c.name.replace(/[^\w.-]+/g, '-').replace(/^-|-$/g, '') || 'class'}-gradebook.csv`;
		return new Response('\uFEFF' + csv + '\r\n', {
			headers: { 'content-type': 'text/csv; charset=utf-8', 'content-disposition': `attachment; filename="${name}"` }
		});
	} catch (e) {
		return refusalResponse(e);
	}
};
