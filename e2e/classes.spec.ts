// A class from start to finish in Chromium: the teacher creates a class and a drill and gives it
// to the class, invites a student by e-mail (read from the local outbox), the student follows the
// link and signs up (which joins them), practises with a fake MIDI controller and hands in the take; the teacher
// sees the score and grades it; the student reads the grade; the gradebook CSV holds the row.
// Then people outside the class are kept out of its pages, API routes and downloads.
import { expect, test, type Browser, type Page } from '@playwright/test';
import { simpleParser } from 'mailparser';
import { readdirSync, readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import Papa from 'papaparse';
import { installFakeMidi, ONE_CONTROLLER } from './fake-midi';
import { DEMO, open, signIn } from './support';

const port = Number(process.env.E2E_PORT ?? 4173);
const outbox = resolve(`e2e/.data/${port}/outbox`);
const shots = `test-results/${port}/classes`;
const NOTE_ON = 0x90; // MIDI 1.0: Note On, channel 1
const NOTE_OFF = 0x80;
const PAD_1 = 36; // pad-1 of the demo grid (notes 36–51)

async function mailTo(address: string, subject: RegExp) {
	const files = readdirSync(outbox).filter((f) => f.endsWith('.eml'));
	for (const f of files.sort().reverse()) {
		const mail = await simpleParser(readFileSync(resolve(outbox, f)));
		const to = Array.isArray(mail.to) ? mail.to.map((a) => a.text).join() : (mail.to?.text ?? '');
		if (to.includes(address) && subject.test(mail.subject ?? '')) return mail;
	}
	return null;
}

const shot = (page: Page, name: string) => page.screenshot({ path: `${shots}/${name}.png`, fullPage: true });

let classUrl = '';
let submissionUrl = '';
let sessionId = '';
const student = { name: 'Sam Quill', email: `sam.${Date.now()}@example.com`, password: 'practise-daily-9' };

async function teacherPage(browser: Browser) {
	const page = await browser.newPage();
	await signIn(page, 'teacher');
	return page;
}

test('teacher, student and gradebook: a drill from class creation to a graded, exported take', async ({ browser }) => {
	test.setTimeout(300_000);
	const teacher = await teacherPage(browser);

	// A class.
	await open(teacher, '/classes');
	await teacher.getByLabel('New class name').fill('Thursday pad crew');
	await teacher.getByRole('button', { name: 'Create class' }).click();
	await expect(teacher.getByTestId('class-name')).toHaveText('Thursday pad crew');
	classUrl = new URL(teacher.url()).pathname;
	await expect(teacher.getByTestId('join-code')).toHaveText(/^[A-Z2-9]{4}-[A-Z2-9]{4}$/);

	// A drill: pad 1 on every beat of one bar at 100 BPM, drawn on the grid.
	await open(teacher, '/drills/new');
	await teacher.getByLabel('Name').fill('Steady pad one');
	await teacher.getByLabel('Played on').selectOption({ label: 'Two-deck pad set (v1)' });
	await expect(teacher.getByLabel('Mapping version')).toHaveValue('1'); // the newest, listed with its date
	await teacher.getByLabel('Tempo (BPM)').fill('100');
	await teacher.getByLabel('Length (bars)').fill('1');
	await teacher.getByLabel('Timing window (± ms)').fill('40');
	await teacher.getByLabel('Grid').selectOption('1');
	for (const beat of [1, 2, 3, 4])
		await teacher.getByRole('button', { name: `Place Pad 1 at beat ${beat}`, exact: true }).click();
	await expect(teacher.getByTestId('drill-target')).toHaveCount(4);
	await expect(teacher.getByTestId('drill-summary')).toHaveText('4 target presses over 1 bar');
	await shot(teacher, 'drill-editor');
	await teacher.getByRole('button', { name: 'Create drill' }).click();
	await expect(teacher.getByRole('status')).toContainText('Drill saved.');
	const drillUrl = new URL(teacher.url()).pathname;
	const exported = await teacher.request.get(
		`${new URL(teacher.url()).pathname}`.replace('/drills/', '/api/drills/') + '?download'
	);
	expect(exported.headers()['content-disposition']).toMatch(/attachment; filename="Steady-pad-one\.drill\.json"/);
	expect(await exported.json()).toMatchObject({
		version: 1,
		tempo: 100,
		windowMs: 40,
		targets: [{ input: 'pad-1', beat: 0, beats: 1 }, {}, {}, {}]
	});

	// Invite the student, then give the drill to the class.
	await open(teacher, classUrl);
	await teacher.getByLabel('E-mail addresses').fill(student.email);
	await teacher.getByRole('button', { name: 'Send invitations' }).click();
	await expect(teacher.getByRole('status')).toContainText(`Invitation sent to ${student.email}`);
	await teacher.getByLabel('Drill').selectOption({ label: 'Steady pad one' });
	await teacher.getByLabel('Due').fill('2099-06-01T18:00');
	await teacher.getByRole('button', { name: 'Give to class' }).click();
	await expect(teacher.getByTestId('assignment-list')).toContainText('Steady pad one');
	await shot(teacher, 'class-teacher');

	// The student follows the mailed link, signs up and joins.
	const invite = await mailTo(student.email, /invites you to the class “Thursday pad crew”/);
	expect(invite, 'invitation in the outbox').not.toBeNull();
	expect(invite!.html).toContain('Join the class');
	const link = invite!.text!.match(/https?:\/\/\S+\/join\/[\w-]+/)![0];
	const midiContext = await browser.newContext();
	const page = await midiContext.newPage();
	await installFakeMidi(page, { ports: ONE_CONTROLLER });
	await open(page, new URL(link).pathname);
	await expect(page.getByRole('heading', { name: 'Join “Thursday pad crew”' })).toBeVisible();
	await shot(page, 'join-signed-out');
	await page.getByRole('link', { name: 'Create an account to join' }).click();
	await page.getByLabel('Name').fill(student.name);
	await page.getByLabel('Email').fill(student.email);
	await page.getByLabel('Password', { exact: true }).fill(student.password);
	await page.getByLabel('Repeat password').fill(student.password);
	await page.getByRole('button', { name: 'Create account' }).click();
	// Signed up from the link sent to this address: in the class at once, and told so.
	await expect(page.getByTestId('class-name')).toHaveText('Thursday pad crew');
	await expect(page.getByTestId('joined-notice')).toHaveText('You joined “Thursday pad crew”.');
	await expect(page.getByTestId('due-list')).toContainText('Steady pad one');
	await shot(page, 'class-student');

	// Practice with the fake controller: press pad 1 on each beat, 10 ms late, held 300 ms.
	// Home lists what is due; the assignment says what the drill asks for before practising.
	await open(page, '/home');
	await page
		.getByTestId('home-due')
		.getByRole('link', { name: /Steady pad one/ })
		.click();
	await expect(page.getByTestId('drill-brief')).toContainText('4 presses in 1 bar at 100 BPM');
	await expect(page.getByTestId('drill-brief')).toContainText('within ±40 ms');
	const assignmentUrl = new URL(page.url()).pathname;
	await page.getByTestId('practise-link').click();
	const panel = page.getByTestId('drill-panel');
	await expect(panel).toBeVisible({ timeout: 60_000 });
	await expect(page.getByTestId('midi-status')).toHaveAttribute('data-status', 'ready', { timeout: 15_000 });
	// The player waits in the page for beat 0 to be known, so a slow test runner can't make it late.
	await page.evaluate(
		({ on, off, note }) => {
			const panel = document.querySelector('[data-testid="drill-panel"]')!;
			new MutationObserver((_, watch) => {
				const zero = Number(panel.getAttribute('data-zero'));
				if (!zero) return;
				watch.disconnect();
				for (let beat = 0; beat < 4; beat++) {
					const at = zero + beat * 600 + 10; // 100 BPM: 600 ms a beat; 10 ms late
					// Stamped with the time they are played, as a device does, however late the timer runs.
					setTimeout(() => window.__fakeMidi.send('pads-in', [on, note, 100], at), at - performance.now());
					setTimeout(() => window.__fakeMidi.send('pads-in', [off, note, 0], at + 300), at + 300 - performance.now());
				}
			}).observe(panel, { attributes: true, attributeFilter: ['data-zero'] });
		},
		{ on: NOTE_ON, off: NOTE_OFF, note: PAD_1 }
	);
	await page.getByTestId('drill-start').click();
	await expect(panel).toHaveAttribute('data-status', /counting|playing/, { timeout: 15_000 });
	await shot(page, 'practice-running');
	await expect(panel).toHaveAttribute('data-status', 'scored', { timeout: 30_000 });
	await expect(page.getByTestId('score-hit-rate')).toHaveText('100 %');
	await expect(page.getByTestId('score-hits')).toHaveText('4 of 4');
	await expect(page.getByTestId('score-pass')).toHaveText('Passed');
	await shot(page, 'practice-scored');

	// Hand it in.
	await page.getByTestId('to-assignment').click();
	await expect(page.getByTestId('take-score')).toContainText('100 % hits');
	await page.getByRole('button', { name: 'Hand in' }).click();
	await expect(page.getByTestId('submission-title')).toContainText('Your take');
	await expect(page.getByTestId('feedback-waiting')).toBeVisible();
	submissionUrl = new URL(page.url()).pathname;
	sessionId = (await page.getByRole('link', { name: 'Open the full replay' }).getAttribute('href'))!
		.split('?')[0]
		.split('/')
		.pop()!;

	// The teacher is told, sees the score and grades with a comment.
	expect(await mailTo(DEMO.teacher, /Sam Quill handed in Steady pad one/)).not.toBeNull();
	await open(teacher, submissionUrl);
	await expect(teacher.getByTestId('submission-title')).toContainText('Sam Quill');
	await expect(teacher.getByTestId('score-hit-rate')).toHaveText('100 %');
	await expect(teacher.getByTestId('target-chart')).toBeVisible();
	await teacher.getByLabel('Grade').fill('A−');
	await teacher.getByLabel('Comment').fill('Right on the beat. Next: hold each press a full beat.');
	await teacher.getByRole('button', { name: 'Save grade and comment' }).click();
	await expect(teacher.getByRole('status').filter({ hasText: 'Grade and comment saved' })).toBeVisible();
	await shot(teacher, 'submission-teacher');
	// The drill now has a hand-in: what is scored no longer changes; a copy can be made instead.
	await open(teacher, drillUrl);
	await expect(teacher.getByText('This drill has hand-ins; duplicate it to change it.')).toBeVisible();
	await teacher.getByLabel('Length (bars)').fill('2');
	await teacher.getByRole('button', { name: 'Save drill' }).click();
	await expect(teacher.getByRole('alert')).toHaveText('This drill has hand-ins; duplicate it to change it.');
	await teacher.getByRole('button', { name: 'Duplicate' }).click();
	await expect(teacher.getByRole('heading', { name: 'Steady pad one (copy)' })).toBeVisible();
	// The full replay opens for the teacher through the submission.
	await open(teacher, `/sessions/${sessionId}?submission=${submissionUrl.split('/').pop()}`);
	await expect(teacher.getByTestId('replay-page')).toBeVisible();

	// The student is told and reads it.
	expect(await mailTo(student.email, /Feedback on Steady pad one: A−/)).not.toBeNull();
	await open(page, submissionUrl);
	await expect(page.getByTestId('feedback-grade')).toHaveText('A−');
	await expect(page.getByTestId('feedback-comment')).toHaveText(
		'Right on the beat. Next: hold each press a full beat.'
	);
	await shot(page, 'submission-student');

	// Gradebook and its CSV.
	await open(teacher, `${classUrl}/gradebook`);
	await expect(teacher.getByTestId('gradebook-row')).toHaveCount(1);
	await expect(teacher.getByTestId('gradebook-row')).toContainText('A−');
	await shot(teacher, 'gradebook');
	const csv = await teacher.request.get(`${classUrl}/gradebook.csv`);
	expect(csv.headers()['content-type']).toMatch(/text\/csv/);
	const parsed = Papa.parse<Record<string, string>>((await csv.text()).replace(/^\uFEFF/, ''), {
		header: true,
		skipEmptyLines: true
	});
	expect(parsed.data).toEqual([
		expect.objectContaining({
			student: 'Sam Quill',
			email: student.email,
			assignment: 'Steady pad one',
			late: 'no',
			hit_rate: '1.0000',
			passed: 'yes',
			grade: 'A−',
			comment: 'Right on the beat. Next: hold each press a full beat.'
		})
	]);

	// What the class keeps is not deleted under it: the handed-in take stays with the student, the
	// drill is refused while a hand-in of it exists, and deleting the assignment names the graded one.
	await open(page, '/sessions');
	const takeRow = page.getByTestId('session-row').filter({ has: page.locator(`a[href="/sessions/${sessionId}"]`) });
	await expect(takeRow).toContainText('handed in');
	await takeRow.getByRole('button', { name: /^Delete/ }).click();
	await expect(page.getByTestId('session-problem')).toHaveText(
		'This take was handed in for “Steady pad one”; it stays while the class keeps it.'
	);
	await open(teacher, drillUrl);
	await teacher.getByTestId('delete-drill').click();
	await expect(teacher.getByTestId('delete-problem')).toContainText('Students handed in 1 take for “Steady pad one”');
	await open(teacher, assignmentUrl);
	await teacher.getByTestId('delete-assignment').click();
	const confirm = teacher.getByRole('dialog');
	await expect(confirm).toContainText('One of them is graded: its grade and comment go too.');
	await expect(confirm.getByRole('button', { name: 'Delete with 1 graded' })).toBeVisible();
	await confirm.getByRole('button', { name: 'Cancel' }).click();
	await expect(confirm).toBeHidden();
	await midiContext.close();

	// People outside the class get 404 from its pages, API routes and downloads.
	await outsiders(await browser.newPage());
});

async function outsiders(page: Page) {
	const submission = submissionUrl.split('/').pop()!;
	// Another student (Kai is in no class of this teacher).
	await signIn(page, 'student');
	for (const path of [
		submissionUrl,
		`/sessions/${sessionId}`,
		`/sessions/${sessionId}?submission=${submission}`,
		classUrl
	])
		expect((await page.goto(path))?.status(), path).toBe(404);
	for (const path of [
		`/api/submissions/${submission}`,
		`/api/submissions/${submission}/audio`,
		`/api/sessions/${sessionId}`,
		`/api/sessions/${sessionId}/audio`
	]) {
		const r = await page.request.get(path);
		expect(r.status(), path).toBe(404);
		expect((await r.json()).error).toBeTruthy();
	}
	const gradebook = await page.goto(`${classUrl}/gradebook`);
	expect(gradebook?.status()).toBe(403); // students never enter the teaching area
	await page.getByRole('button', { name: 'Sign out' }).click();

	// Another teacher (the admin teaches no class here).
	await signIn(page, 'admin');
	for (const path of [classUrl, `${classUrl}/gradebook`, submissionUrl])
		expect((await page.goto(path))?.status(), path).toBe(404);
	expect((await page.request.get(`${classUrl}/gradebook.csv`)).status()).toBe(404);
	expect((await page.request.get(`/api/submissions/${submission}`)).status()).toBe(404);
}

test('the demo class: a member opens the practice room of its drill straight from its address', async ({ page }) => {
	await signIn(page, 'student2'); // Lena is in the demo school's "Wednesday night crew"
	await open(page, '/home');
	await page
		.getByTestId('home-due')
		.getByRole('link', { name: /Echo and filter swap/ })
		.click();
	await expect(page.getByTestId('drill-brief')).toContainText('5 presses in 4 bars at 120 BPM');
	const practise = await page.getByTestId('practise-link').getAttribute('href');
	// Loaded as a new page (rendered on the server first), not by an in-app link.
	const response = await page.goto(practise!);
	expect(response?.status()).toBe(200);
	await page.locator('html[data-ready]').waitFor();
	await expect(page.getByTestId('drill-panel')).toBeVisible();
	await expect(page.getByTestId('drill-panel')).toContainText('Echo and filter swap');
});
