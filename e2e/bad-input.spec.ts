// Bad input against the built app: generated bodies (fast-check) for every JSON endpoint and
// every file import are refused with a 4xx in the one error shape `{ error, problems }`, never a
// 5xx, and the database and the upload folder are exactly as they were (checksums before and
// after). Bodies are invalid by construction, so none of them may change anything.
import { expect, test, type APIRequestContext } from '@playwright/test';
import fc from 'fast-check';
import {
	apiAs,
	createdId,
	databaseChecksum,
	demoDocument,
	demoId,
	DRILL,
	joinClass,
	newAssignment,
	newClass,
	newDrill,
	newTake,
	SMALL_WEBM,
	uploadsChecksum
} from './api-support';
import { DEMO } from './support';

const RUNS = Number(process.env.BAD_INPUT_RUNS ?? 60);

let kai: APIRequestContext;
let tomas: APIRequestContext; // a teacher, for the drill endpoints
let document: unknown;
let ids: {
	mapping: string;
	publicMapping: string;
	session: string;
	recording: string;
	drill: string;
	assignment: string;
	take: string;
};

test.beforeAll(async () => {
	test.setTimeout(120_000);
	kai = await apiAs(DEMO.student);
	tomas = await apiAs(DEMO.teacher);
	document = await demoDocument(kai);
	const mapping = await createdId(await kai.post('/api/mappings', { data: { document, name: 'Bad input target' } }));
	const session = await createdId(await kai.post('/api/sessions', { data: { mappingId: mapping, tempo: 120 } }));
	await kai.post(`/api/sessions/${session}/chunks`, { data: { seq: 0, events: [{ t: 1, input: null }] } });
	await kai.patch(`/api/sessions/${session}`, { data: { finish: true } });
	await kai.put(`/api/sessions/${session}/audio`, { data: SMALL_WEBM, headers: { 'content-type': 'audio/webm' } });
	const recording = await createdId(await kai.post('/api/sessions', { data: { mappingId: mapping, tempo: 120 } }));
	await kai.post(`/api/sessions/${recording}/chunks`, { data: { seq: 0, events: [{ t: 1, input: null }] } });
	const publicMapping = await demoId(kai);
	// A class of the teacher with Kai in it, a drill given to it and Kai's scored take of it.
	const { id: classId, code } = await newClass(tomas, 'Bad input class');
	await joinClass(kai, code);
	const drill = await newDrill(tomas, publicMapping, 'Bad input drill');
	const assignment = await newAssignment(tomas, classId, drill);
	const take = await newTake(kai, publicMapping, drill);
	ids = { mapping, publicMapping, session, recording, drill, assignment, take };
});

test.afterAll(async () => {
	await kai?.dispose();
	await tomas?.dispose();
});

// ---- generators: every body is wrong somewhere ----

/** Text that is not JSON at all. */
const notJson = fc.oneof(
	fc.string().filter((s) => {
		try {
			JSON.parse(s);
			return false;
		} catch {
			return true;
		}
	}),
	fc.constant('{"unterminated": '),
	fc.constant('\u0000\u0001binary')
);
/** JSON that is not an object. */
const notObject = fc.oneof(fc.jsonValue().filter((v) => v === null || typeof v !== 'object' || Array.isArray(v)));
/** Anything but a value of the wanted kind. */
const notString = fc.oneof(fc.integer(), fc.boolean(), fc.constant(null), fc.array(fc.string(), { maxLength: 3 }));
const notNumber = fc.oneof(fc.string(), fc.boolean(), fc.constant(null), fc.dictionary(fc.string(), fc.string()));
const notBoolean = fc.oneof(fc.string(), fc.integer(), fc.constant(null));
/** A document that is no mapping or session: JSON values and objects with some known keys broken. */
const notDocument = fc.oneof(
	fc.jsonValue(),
	fc.record({ version: fc.oneof(fc.integer({ min: 2 }), fc.string()), tempo: fc.jsonValue(), events: fc.jsonValue() }),
	fc.record({ decks: fc.oneof(fc.integer({ min: 9 }), fc.string()), bindings: fc.jsonValue(), profile: fc.jsonValue() })
);
/** A drill document broken somewhere: not one at all, a wrong version or kind, no targets, a target off the grid or off the mapping. */
const notDrill = fc.oneof(
	fc.jsonValue(),
	fc.record({ version: fc.oneof(fc.integer({ min: 2 }), fc.string()), tempo: fc.jsonValue(), targets: fc.jsonValue() }),
	fc
		.record({
			tempo: fc.oneof(notNumber, fc.double({ max: 39.9 }), fc.double({ min: 300.1 }))
		})
		.map((b) => ({ ...DRILL, ...b })),
	fc.constant({ ...DRILL, targets: [] }),
	fc.integer({ min: 4, max: 1000 }).map((beat) => ({ ...DRILL, targets: [{ input: 'pad-1', beat, beats: 1 }] })),
	fc
		.string({ minLength: 1, maxLength: 20 })
		.filter((s) => !/^pad-\d+$/.test(s.trim()))
		.map((input) => ({ ...DRILL, targets: [{ input, beat: 0, beats: 1 }] }))
);
/** A name over 120 characters even after trimming (names are trimmed before their length is checked). */
const tooLongName = fc.string({ minLength: 121 }).filter((s) => s.trim().length > 120);
/** An id that names nothing (the fixtures' ids are UUIDs). */
const unknownId = fc.string({ minLength: 1, maxLength: 30 });
const rawBody = (json: fc.Arbitrary<unknown>) =>
	fc.oneof(
		notJson,
		notObject.map((v) => JSON.stringify(v)),
		json.map((v) => JSON.stringify(v))
	);

interface Endpoint {
	name: string;
	method: 'POST' | 'PUT' | 'PATCH';
	path: () => string;
	body: fc.Arbitrary<string>;
	type?: fc.Arbitrary<string>;
	/** Who sends it: Kai (a student) unless it is a teacher's endpoint. */
	as?: 'teacher';
}

const ENDPOINTS: Endpoint[] = [
	{
		name: 'create a mapping (file import)',
		method: 'POST',
		path: () => '/api/mappings',
		body: rawBody(
			fc.oneof(
				fc.record({ document: notDocument, name: fc.option(fc.string({ maxLength: 20 })) }),
				fc.record({ document: notDocument, visibility: fc.string() }),
				fc.record({ name: tooLongName, document: notDocument })
			)
		)
	},
	{
		// Without baseVersion nothing is saved, not even a valid document.
		name: 'save a mapping version without a base version',
		method: 'PUT',
		path: () => `/api/mappings/${ids.mapping}`,
		body: rawBody(
			fc.record({
				document: fc.oneof(
					notDocument,
					fc.constant(null).map(() => document)
				)
			})
		)
	},
	{
		name: 'change a mapping’s visibility',
		method: 'PATCH',
		path: () => `/api/mappings/${ids.mapping}`,
		body: rawBody(
			fc.record({
				visibility: fc.oneof(
					notString,
					fc.string().filter((s) => s !== 'private' && s !== 'public')
				)
			})
		)
	},
	{
		name: 'start a recording',
		method: 'POST',
		path: () => '/api/sessions',
		body: rawBody(
			fc.oneof(
				fc.record({
					mappingId: fc.constant(null).map(() => ids.mapping),
					tempo: fc.oneof(notNumber, fc.double({ max: 39.9 }), fc.double({ min: 300.1 }))
				}),
				fc.record({ mappingId: notString, tempo: fc.integer({ min: 40, max: 300 }) }),
				fc.record({ mappingId: fc.string({ minLength: 1, maxLength: 30 }), tempo: fc.integer({ min: 40, max: 300 }) }),
				fc.record({ tempo: fc.integer({ min: 40, max: 300 }), startedAt: fc.string() })
			)
		)
	},
	{
		name: 'import a session document (file import)',
		method: 'POST',
		path: () => '/api/sessions',
		body: fc
			.record({ session: notDocument, name: fc.option(fc.string({ maxLength: 20 })) })
			.map((b) => JSON.stringify({ ...b, mappingId: ids.mapping }))
	},
	{
		name: 'rename or finish a session',
		method: 'PATCH',
		path: () => `/api/sessions/${ids.session}`,
		body: rawBody(
			fc.oneof(
				fc.record({ name: fc.oneof(notString, fc.constant(''), fc.constant('   '), tooLongName) }),
				fc.record({ finish: notBoolean })
			)
		)
	},
	{
		name: 'send a chunk',
		method: 'POST',
		path: () => `/api/sessions/${ids.recording}/chunks`,
		body: rawBody(
			fc.oneof(
				fc.record({
					seq: fc.oneof(notNumber, fc.integer({ max: -1 }), fc.double({ min: 0.1, max: 9, noInteger: true })),
					events: fc.jsonValue()
				}),
				fc.record({
					seq: fc.integer({ min: 1, max: 1000 }),
					// Events that are no list, or a list of things that are no events (an empty list is a valid chunk).
					events: fc.oneof(
						notObject.filter((v) => !Array.isArray(v)),
						fc.array(notObject, { minLength: 1 })
					)
				}),
				// Chunk 0 is held already: the same number with other events is a conflict.
				fc.record({ seq: fc.constant(0), events: fc.constant([{ t: 2, input: null }]) })
			)
		)
	},
	{
		name: 'save a mapping version from a base version',
		method: 'PUT',
		path: () => `/api/mappings/${ids.mapping}`,
		body: rawBody(
			fc.oneof(
				fc.record({
					document: fc.constant(null).map(() => document),
					baseVersion: fc.oneof(notNumber, fc.integer({ max: 0 }), fc.double({ min: 1.1, max: 9, noInteger: true }))
				}),
				// A base version that is not the newest: a conflict, and nothing is overwritten.
				fc.record({
					document: fc.constant(null).map(() => document),
					baseVersion: fc.integer({ min: 1000, max: 1_000_000 })
				}),
				fc.record({ document: notDocument, baseVersion: fc.constant(1) })
			)
		)
	},
	{
		name: 'rename a mapping',
		method: 'PATCH',
		path: () => `/api/mappings/${ids.mapping}`,
		body: rawBody(fc.record({ name: fc.oneof(notString, fc.constant(''), fc.constant('   '), tooLongName) }))
	},
	{
		name: 'fork a mapping',
		method: 'POST',
		path: () => `/api/mappings/${ids.publicMapping}/fork`,
		// An empty body is a fork with the source's name, so every body here has something in it.
		body: rawBody(fc.record({ name: fc.oneof(notString, fc.constant(''), fc.constant('   '), tooLongName) })).filter(
			(b) => b.trim() !== ''
		)
	},
	{
		name: 'save a learned controller layout',
		method: 'POST',
		path: () => '/api/controllers',
		body: rawBody(
			fc.oneof(
				fc.record({ profile: fc.jsonValue() }),
				fc.record({
					profile: fc.record({
						name: fc.oneof(notString, fc.constant('')),
						inputs: fc.oneof(fc.jsonValue(), fc.array(notObject, { minLength: 1, maxLength: 3 }))
					})
				})
			)
		)
	},
	{
		name: 'create a drill (file import)',
		method: 'POST',
		path: () => '/api/drills',
		as: 'teacher',
		body: rawBody(
			fc.oneof(
				fc.record({ mappingId: notString, document: fc.constant(DRILL) }),
				fc.record({ mappingId: fc.constant(null).map(() => ids.publicMapping), document: notDrill }),
				fc.record({ mappingId: unknownId, document: fc.constant(DRILL) })
			)
		)
	},
	{
		name: 'score a take of a drill',
		method: 'POST',
		path: () => '/api/drill-takes',
		body: rawBody(
			fc.oneof(
				fc.record({
					rehearsalId: fc.constant(null).map(() => ids.take),
					drillId: fc.constant(null).map(() => ids.drill),
					zero: fc.oneof(notNumber, fc.double({ max: -0.001 }), fc.double({ min: 86_400_000.1 }))
				}),
				fc.record({ rehearsalId: notString, drillId: notString, zero: fc.integer({ min: 0, max: 1000 }) }),
				fc.record({
					rehearsalId: unknownId,
					drillId: fc.constant(null).map(() => ids.drill),
					zero: fc.integer({ min: 0, max: 1000 })
				}),
				fc.record({
					rehearsalId: fc.constant(null).map(() => ids.take),
					drillId: unknownId,
					zero: fc.integer({ min: 0, max: 1000 })
				})
			)
		)
	},
	{
		name: 'upload audio (file import)',
		method: 'PUT',
		path: () => `/api/sessions/${ids.session}/audio`,
		body: fc.oneof(fc.constant(''), fc.string({ maxLength: 200 })),
		type: fc.oneof(
			fc.constantFrom('text/plain', 'application/json', 'image/png', 'application/octet-stream', ''),
			fc.string({ maxLength: 30 }).filter((s) => !s.trim().toLowerCase().startsWith('audio/'))
		)
	}
];

for (const endpoint of ENDPOINTS) {
	test(`bad bodies for “${endpoint.name}” are refused and change nothing`, async () => {
		test.setTimeout(180_000);
		const db = await databaseChecksum();
		const files = uploadsChecksum();
		await fc.assert(
			fc.asyncProperty(endpoint.body, endpoint.type ?? fc.constant('application/json'), async (body, type) => {
				const response = await (endpoint.as === 'teacher' ? tomas : kai).fetch(endpoint.path(), {
					method: endpoint.method,
					headers: { 'content-type': type },
					data: Buffer.from(body)
				});
				const status = response.status();
				const text = await response.text();
				expect(
					status,
					`${endpoint.method} ${endpoint.path()} ${body.slice(0, 200)} → ${text.slice(0, 200)}`
				).toBeGreaterThanOrEqual(400);
				expect(status).toBeLessThan(500);
				const answer = JSON.parse(text) as { error: unknown; problems: unknown };
				expect(typeof answer.error).toBe('string');
				expect((answer.error as string).length).toBeGreaterThan(0);
				expect(Array.isArray(answer.problems)).toBe(true);
			}),
			{ numRuns: RUNS }
		);
		expect(await databaseChecksum()).toBe(db);
		expect(uploadsChecksum()).toBe(files);
	});
}

// ---- file imports through forms: refused with a 4xx page, nothing stored ----

interface FormImport {
	name: string;
	path: () => string;
	as?: 'teacher';
	body: fc.Arbitrary<Record<string, string | { name: string; mimeType: string; buffer: Buffer }>>;
}

/** Bytes that are no audio file: text, JSON, a PNG signature, nothing. */
const notAudio = fc.oneof(
	// Text that does not open with an audio signature (ID3, OggS, RIFF, fLaC, ftyp at 4, EBML).
	fc
		.string({ maxLength: 300 })
		.filter((s) => !/^(ID3|OggS|RIFF|fLaC|.{4}ftyp)/s.test(s) && !s.startsWith('\u001a'))
		.map((s) => Buffer.from(s)),
	fc.jsonValue().map((v) => Buffer.from(JSON.stringify(v) ?? 'null')),
	fc.constant(Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13])) // PNG signature (ISO/IEC 15948)
);

const FORM_IMPORTS: FormImport[] = [
	{
		name: 'hand in a take with an audio file',
		path: () => `/assignments/${ids.assignment}?/submit`,
		body: fc.oneof(
			// A file that is no audio, with Kai's real take.
			fc
				.record({ bytes: notAudio, mimeType: fc.constantFrom('audio/webm', 'audio/ogg', 'text/plain', '') })
				.map(({ bytes, mimeType }) => ({
					rehearsalId: ids.take,
					audio: { name: 'take.webm', mimeType: mimeType || 'application/octet-stream', buffer: bytes }
				})),
			// Real audio with a take that is not Kai's take of this drill (none, unknown, another session).
			fc
				.oneof(
					unknownId,
					fc.constant(''),
					fc.constant(null).map(() => ids.session)
				)
				.map((rehearsalId) => ({
					rehearsalId,
					audio: { name: 'take.webm', mimeType: 'audio/webm', buffer: SMALL_WEBM }
				}))
		)
	},
	{
		name: 'import a drill file',
		path: () => '/drills?/import',
		as: 'teacher',
		body: fc.oneof(
			fc
				.oneof(
					notJson,
					notDrill.map((d) => JSON.stringify(d))
				)
				.map((text) => ({ mappingId: ids.publicMapping, text })),
			unknownId.map((mappingId) => ({ mappingId, text: JSON.stringify(DRILL) }))
		)
	}
];

for (const form of FORM_IMPORTS) {
	test(`bad files for “${form.name}” are refused and change nothing`, async () => {
		test.setTimeout(180_000);
		const db = await databaseChecksum();
		const files = uploadsChecksum();
		await fc.assert(
			fc.asyncProperty(form.body, async (multipart) => {
				const response = await (form.as === 'teacher' ? tomas : kai).post(form.path(), {
					multipart,
					headers: { accept: 'text/html' }
				});
				const status = response.status();
				const summary = JSON.stringify(multipart, (_k, v) => (v?.type === 'Buffer' ? `<${v.data.length} bytes>` : v));
				expect(status, `${form.path()} ${summary.slice(0, 200)}`).toBeGreaterThanOrEqual(400);
				expect(status).toBeLessThan(500);
				// The page says what was wrong, in the form's message.
				expect(await response.text()).toContain('role="alert"');
			}),
			{ numRuns: RUNS }
		);
		expect(await databaseChecksum()).toBe(db);
		expect(uploadsChecksum()).toBe(files);
	});
}
