// The class gradebook as CSV (RFC 4180 quoting by papaparse), one row per student and assignment.
import type { GradebookRow } from '$lib/teaching';
import Papa from 'papaparse';

export const GRADEBOOK_FIELDS = [
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
	'comment',
	'left_class'
] as const;

/**
 * The CSV text with a byte order mark, so spreadsheets read it as UTF-8. A cell that starts with
 * = + - @ (or a tab or carriage return) is written with a leading ' so that a spreadsheet shows it
 * as text instead of running it as a formula (papaparse's escapeFormulae; OWASP "CSV Injection").
 */
export function gradebookCsv(rows: readonly GradebookRow[]): string {
	const csv = Papa.unparse(
		{
			fields: [...GRADEBOOK_FIELDS],
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
				r.comment ?? '',
				r.left ? 'yes' : 'no'
			])
		},
		{ escapeFormulae: true }
	);
	return '\uFEFF' + csv + '\r\n';
}
