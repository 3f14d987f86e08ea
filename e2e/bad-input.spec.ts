// Bad input against the built app: generated bodies (fast-check) for every JSON endpoint and
// every file import are refused with a 4xx in the one error shape `{ error, problems }`, never a
// 5xx, and the database and the upload folder are exactly as they were (checksums before and
// after). Bodies are invalid by construction, so none of them may change anything.
import { expect, test, type APIRequestContext } from '@playwright/test';
import fc from 'fast-check';
import { apiAs, createdId, databaseChecksum, demoDocument, demoId, SMALL_WEBM, uploadsChecksum } from './api-support';
import { DEMO } from './support';

const RUNS = Number(process.env.BAD_INPUT_RUNS ?? 60);

let kai: APIRequestContext;
let ids: { mapping: string; publicMapping: string; session: string; recording: string };

test.beforeAll(async () => {
	kai = await apiAs(DEMO.student);
	const document = await demoDocument(kai);
	const mapping = await createdId(await kai.post('/api/mappings', { data: { document, name: 'Bad input target' } }));
	const session = await createdId(await kai.post('/api/sessions', { data: { mappingId: mapping, tempo: 120 } }));
	await kai.post(`/api/sessions/${session}/chunks`, { data: { seq: 0, events: [{ t: 1, input: null }] } });
	await kai.patch(`/api/sessions/${session}`, { data: { finish: true } });
	await kai.put(`/api/sessions/${session}/audio`, { data: SMALL_WEBM, headers: { 'content-type': 'audio/webm' } });
	const recording = await createdId(await kai.post('/api/sessions', { data: { mappingId: mapping, tempo: 120 } }));
	await kai.post(`/api/sessions/${recording}/chunks`, { data: { seq: 0, events: [{ t: 1, input: null }] } });
	ids = { mapping, publicMapping: await demoId(kai), session, recording };
});

test.afterAll(() => kai?.dispose());

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
				fc.record({ name: fc.string({ minLength: 121 }), document: notDocument })
			)
		)
	},
	{
		name: 'save a mapping version',
		method: 'PUT',
		path: () => `/api/mappings/${ids.mapping}`,
		body: rawBody(fc.record({ document: notDocument }))
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
				fc.record({ name: fc.oneof(notString, fc.constant(''), fc.constant('   '), fc.string({ minLength: 121 })) }),
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
					events: fc.oneof(notObject, fc.array(notObject, { minLength: 1 }))
				}),
				// Chunk 0 is held already: the same number with other events is a conflict.
				fc.record({ seq: fc.constant(0), events: fc.constant([{ t: 2, input: null }]) })
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
				const response = await kai.fetch(endpoint.path(), {
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
