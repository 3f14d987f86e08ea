// The OpenAPI 3.1 document of the JSON API, generated from the same zod schemas the endpoints
// validate with (zod 4's z.toJSONSchema, JSON Schema 2020-12 as OpenAPI 3.1 uses). Served at
// /api/openapi.json and shown readably at /help/api. A new endpoint adds a row to OPERATIONS.
import { z } from 'zod';
import * as s from './api-schemas';
import { CHUNK_MAX_BYTES, CHUNK_MAX_EVENTS } from '$lib/recorder/limits';
import { tokenRequestsPerMinute } from './config';

type Schema = z.ZodType;

export interface Operation {
	method: 'get' | 'post' | 'put' | 'patch' | 'delete';
	path: string;
	tag: 'Mappings' | 'Sessions' | 'About the API';
	summary: string;
	description?: string;
	query?: { name: string; description: string }[];
	body?: { schema: Schema; type?: string; description?: string };
	ok: { status: number; description: string; schema?: Schema; type?: string };
	refusals: number[];
	public?: boolean;
}

export const REFUSALS: Record<number, string> = {
	400: 'The body is not valid JSON or breaks the schema; `problems` lists each problem.',
	401: 'Not signed in, or the API token is not valid (revoked, expired or mistyped).',
	403: 'Signed in, but not allowed (for example: changing someone else’s mapping).',
	404: 'No such thing, or it is private to someone else.',
	409: 'In conflict with what the server holds (finished session, chunk number used, library full).',
	413: 'Too large for the server’s limits.',
	415: 'A file of a type the server does not take.',
	429: 'Too many requests with this API token in a minute; wait the seconds the Retry-After header gives.'
};

/** Every signed-in operation can be refused with 429 when it is called with an API token. */
const refusalsOf = (op: Operation) => (op.public ? op.refusals : [...new Set([...op.refusals, 429])]);

export const OPERATIONS: Operation[] = [
	{
		method: 'get',
		path: '/api/mappings',
		tag: 'Mappings',
		summary: 'Your mappings and everyone’s public ones, newest first',
		ok: { status: 200, description: 'The list', schema: z.object({ mappings: z.array(s.mappingSummary) }) },
		refusals: [401]
	},
	{
		method: 'post',
		path: '/api/mappings',
		tag: 'Mappings',
		summary: 'Create a mapping from a mapping document',
		body: { schema: s.newMappingBody },
		ok: { status: 201, description: 'Created', schema: z.object({ id: z.string(), notes: s.upgradeNotes }) },
		refusals: [400, 401, 409, 413]
	},
	{
		method: 'get',
		path: '/api/mappings/{id}',
		tag: 'Mappings',
		summary: 'One mapping with its document and versions',
		query: [
			{ name: 'version', description: 'An earlier version number (default: the newest).' },
			{ name: 'download', description: 'Present: answer the bare document as a file to save.' }
		],
		ok: { status: 200, description: 'The mapping (or, with `download`, its document)' },
		refusals: [401, 404]
	},
	{
		method: 'put',
		path: '/api/mappings/{id}',
		tag: 'Mappings',
		summary: 'Save a changed document as the next version (owner only)',
		description:
			'Send `{ document, baseVersion }`, where `baseVersion` is the version your change started from. When it is not ' +
			'the newest version the save is refused with 409, the answer carries `newest: { version, document }`, and ' +
			'nothing is overwritten. Without `baseVersion` the save is refused with 400.',
		body: { schema: s.mappingVersionBody },
		ok: {
			status: 200,
			description: 'Saved',
			schema: z.object({ version: z.number().int(), notes: s.upgradeNotes })
		},
		refusals: [400, 401, 403, 404, 409, 413]
	},
	{
		method: 'patch',
		path: '/api/mappings/{id}',
		tag: 'Mappings',
		summary: 'Make a mapping public or private (owner only)',
		body: { schema: s.mappingVisibilityBody },
		ok: { status: 200, description: 'Changed', schema: z.object({ ok: z.literal(true) }) },
		refusals: [400, 401, 403, 404]
	},
	{
		method: 'delete',
		path: '/api/mappings/{id}',
		tag: 'Mappings',
		summary: 'Delete a mapping (owner only)',
		ok: { status: 204, description: 'Deleted' },
		refusals: [401, 403, 404]
	},
	{
		method: 'get',
		path: '/api/sessions',
		tag: 'Sessions',
		summary: 'Your recorded sessions, newest first',
		query: [{ name: 'q', description: 'Only sessions whose name or mapping name contains this text.' }],
		ok: { status: 200, description: 'The list', schema: z.object({ sessions: z.array(s.sessionRow) }) },
		refusals: [401]
	},
	{
		method: 'post',
		path: '/api/sessions',
		tag: 'Sessions',
		summary: 'Start a recording, or import a session document whole',
		description:
			'Without `session`, starts a recording of the mapping (send its events to /chunks). With `session`, saves the document as a finished session.',
		body: { schema: s.newSessionBody },
		ok: {
			status: 201,
			description: 'Started or imported',
			schema: z.object({ id: z.string(), name: z.string().optional() })
		},
		refusals: [400, 401, 404, 409, 413]
	},
	{
		method: 'get',
		path: '/api/sessions/{id}',
		tag: 'Sessions',
		summary: 'A session as a session document',
		query: [{ name: 'download', description: 'Present: answer it as a file to save.' }],
		ok: { status: 200, description: 'The session document', schema: s.documents.SessionDocument },
		refusals: [401, 404]
	},
	{
		method: 'patch',
		path: '/api/sessions/{id}',
		tag: 'Sessions',
		summary: 'Rename a session, or finish a recording',
		description:
			'`finish: true` closes the recording to new chunks and counts its findings against the mapping version it was played with.',
		body: { schema: s.changeSessionBody },
		ok: {
			status: 200,
			description: 'Done; `findings` when finished',
			schema: z.object({ findings: z.number().int().optional(), ok: z.boolean().optional() })
		},
		refusals: [400, 401, 404]
	},
	{
		method: 'delete',
		path: '/api/sessions/{id}',
		tag: 'Sessions',
		summary: 'Move a session to the trash (purged with its audio after 30 days)',
		description:
			'A session with no events and no audio is removed at once. A take handed in for an assignment is refused with 409 while the assignment keeps it.',
		ok: { status: 204, description: 'In the trash, or removed' },
		refusals: [401, 404, 409]
	},
	{
		method: 'post',
		path: '/api/sessions/{id}/chunks',
		tag: 'Sessions',
		summary: 'Add one numbered chunk of events to a recording',
		description: `Idempotent by \`seq\`: the same chunk again answers \`duplicate: true\`. A different chunk under a used number, or any chunk after finishing, is refused with 409. At most ${CHUNK_MAX_EVENTS} events and ${CHUNK_MAX_BYTES / 1024} KiB per chunk. text/plain bodies are read as JSON too (sendBeacon).`,
		body: { schema: s.chunkSchema },
		ok: { status: 200, description: 'Stored, or already held', schema: s.chunkAnswer },
		refusals: [400, 401, 404, 409, 413]
	},
	{
		method: 'put',
		path: '/api/sessions/{id}/audio',
		tag: 'Sessions',
		summary: 'Upload the sound of a session (the body is the file)',
		body: { schema: z.string().meta({ format: 'binary' }), type: 'audio/webm' },
		ok: { status: 201, description: 'Stored', schema: z.object({ bytes: z.number().int() }) },
		refusals: [400, 401, 404, 413, 415]
	},
	{
		method: 'get',
		path: '/api/sessions/{id}/audio',
		tag: 'Sessions',
		summary: 'Download the sound of a session',
		ok: { status: 200, description: 'The audio file', type: 'audio/*' },
		refusals: [401, 404]
	},
	{
		method: 'get',
		path: '/api/openapi.json',
		tag: 'About the API',
		summary: 'This document',
		ok: { status: 200, description: 'OpenAPI 3.1' },
		refusals: [],
		public: true
	}
];

/** A zod schema as JSON Schema for readers: input shapes, anything unrepresentable left open. */
export function jsonSchema(schema: Schema): Record<string, unknown> {
	const out = z.toJSONSchema(schema, { io: 'input', unrepresentable: 'any' }) as Record<string, unknown>;
	delete out.$schema;
	return out;
}

const ERROR = { $ref: '#/components/schemas/Error' };

export function openApiDocument(origin: string) {
	const paths: Record<string, Record<string, unknown>> = {};
	for (const op of OPERATIONS) {
		const params = [...op.path.matchAll(/\{(\w+)\}/g)].map(([, name]) => ({
			name,
			in: 'path',
			required: true,
			schema: { type: 'string' }
		}));
		const query = (op.query ?? []).map((q) => ({
			name: q.name,
			in: 'query',
			required: false,
			description: q.description,
			schema: { type: 'string' }
		}));
		const responses: Record<string, unknown> = {
			[op.ok.status]: {
				description: op.ok.description,
				...(op.ok.schema || op.ok.type
					? {
							content: { [op.ok.type ?? 'application/json']: { schema: op.ok.schema ? jsonSchema(op.ok.schema) : {} } }
						}
					: {})
			}
		};
		for (const status of refusalsOf(op))
			responses[status] = { description: REFUSALS[status], content: { 'application/json': { schema: ERROR } } };
		(paths[op.path] ??= {})[op.method] = {
			tags: [op.tag],
			summary: op.summary,
			...(op.description ? { description: op.description } : {}),
			...(params.length || query.length ? { parameters: [...params, ...query] } : {}),
			...(op.body
				? {
						requestBody: {
							required: true,
							content: { [op.body.type ?? 'application/json']: { schema: jsonSchema(op.body.schema) } }
						}
					}
				: {}),
			responses,
			...(op.public ? { security: [] } : {})
		};
	}
	return {
		openapi: '3.1.0',
		info: {
			title: 'Padproof JSON API',
			version: '1',
			description:
				'Mappings and recorded sessions of the signed-in person. Send a personal API token (created on /account) as ' +
				'`Authorization: Bearer <token>`, or the session cookie of a signed-in browser. A token acts with exactly ' +
				`its owner's rights and may make ${tokenRequestsPerMinute()} requests a minute (then 429 with Retry-After). ` +
				'Every refusal has the shape `{ error, problems }`.'
		},
		servers: [{ url: origin }],
		security: [{ token: [] }, { session: [] }],
		tags: [{ name: 'Mappings' }, { name: 'Sessions' }, { name: 'About the API' }],
		paths,
		components: {
			securitySchemes: {
				token: {
					type: 'http',
					scheme: 'bearer',
					description:
						'A personal API token from /account (starts with `pp_`). Only /api/* takes it; pages, forms and /api/auth/* do not.'
				},
				session: { type: 'apiKey', in: 'cookie', name: 'better-auth.session_token', description: 'Set by signing in.' }
			},
			schemas: {
				Error: jsonSchema(s.errorBody),
				MappingDocument: jsonSchema(s.documents.MappingDocument),
				SessionDocument: jsonSchema(s.documents.SessionDocument)
			}
		}
	};
}

/** The operations as plain data for the readable API page. */
export function apiReference() {
	const pretty = (schema?: Schema) => (schema ? JSON.stringify(jsonSchema(schema), null, 2) : null);
	return OPERATIONS.map((op) => ({
		method: op.method.toUpperCase(),
		path: op.path,
		tag: op.tag,
		summary: op.summary,
		description: op.description ?? null,
		query: op.query ?? [],
		body: op.body ? { type: op.body.type ?? 'application/json', schema: pretty(op.body.schema) } : null,
		ok: { status: op.ok.status, description: op.ok.description, schema: pretty(op.ok.schema) },
		refusals: refusalsOf(op).map((status) => ({ status, description: REFUSALS[status] })),
		public: op.public ?? false
	}));
}
