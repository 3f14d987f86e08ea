// Shapes the teaching pages share between server and browser.

export interface GradebookRow {
	student: string;
	email: string;
	assignment: string;
	due: string;
	submitted: string | null;
	late: boolean | null;
	hitRate: number | null;
	meanAbsMs: number | null;
	findings: number | null;
	pass: boolean | null;
	grade: string | null;
	comment: string | null;
	submissionId: string | null;
	/** The student left the class (or was removed); their hand-ins stay in the gradebook. */
	left: boolean;
}
