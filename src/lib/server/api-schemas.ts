// The JSON API's request bodies, in one place: the endpoints validate with them and the OpenAPI
// document (./openapi.ts) is generated from them, so the two never disagree.
import { clockSchema, mappingSchema, sessionSchema } from '$lib/engine';
import { z } from 'zod';
import { chunkSchema, newRehearsalSchema } from './rehearsals';

export { chunkSchema, newRehearsalSchema };

const visibility = z.enum(['private', 'public']);

export const newMappingBody = z.object({
	name: z.string().trim().max(120).optional(),
	visibility: visibility.optional(),
	document: z.unknown().meta({ description: 'A mapping document (see MappingDocument).' })
});

/** Answered with a saved mapping document: empty unless a version 1 document was upgraded and may not sound the same. */
export const upgradeNotes = z.array(z.string()).meta({
	description:
		'Sentences about a version 1 document upgraded to version 2: where the upgrade may not keep the exact sound or findings. Empty for a version 2 document.'
});

export const mappingVersionBody = z.object({
	document: z.unknown().meta({ description: 'The changed mapping document, saved as the next version.' }),
	baseVersion: z
		.number({
			error: (issue) =>
				issue.input === undefined
					? 'Send baseVersion: the number of the version your change started from (the `version` that GET /api/mappings/{id} answers), so a newer save is never overwritten.'
					: 'baseVersion must be a version number: a whole number of 1 or more.'
		})
		.int('baseVersion must be a version number: a whole number of 1 or more.')
		.min(1, 'baseVersion must be a version number: a whole number of 1 or more.')
		.meta({
			description:
				'Required: the version the change started from. When a newer version exists the save answers 409 with the newest, and nothing is overwritten.'
		})
});

export const mappingRenameBody = z.object({ name: z.string().trim().min(1, 'A mapping needs a name.').max(120) });

export const mappingVisibilityBody = z.object({ visibility });

export const importSessionBody = z.object({
	mappingId: z.string().min(1).max(64),
	name: z.string().trim().max(120).optional(),
	session: z.unknown().meta({ description: 'A session document (see SessionDocument).' })
});

export const newSessionBody = z.union([importSessionBody, newRehearsalSchema]);

export const changeSessionBody = z.object({
	name: z.string().trim().min(1).max(120).optional(),
	finish: z.boolean().optional(),
	clock: clockSchema.optional() // the take's beat clock with its tempo changes
});

/** Documents the API carries inside bodies, described for readers (validated by the engine). */
export const documents = { MappingDocument: mappingSchema, SessionDocument: sessionSchema };

// ---- answers ----

export const errorBody = z.object({
	error: z.string().meta({ description: 'What was refused, in plain words.' }),
	problems: z.array(z.object({ path: z.string(), message: z.string() }))
});

export const mappingSummary = z.object({
	id: z.string(),
	name: z.string(),
	visibility,
	owner: z.string(),
	mine: z.boolean(),
	demo: z.boolean(),
	decks: z.number().int(),
	pads: z.number().int(),
	bindings: z.number().int(),
	lintCount: z.number().int(),
	version: z.number().int(),
	updatedAt: z.string().meta({ description: 'ISO 8601 time' }),
	classes: z
		.array(z.string())
		.meta({ description: 'The names of your classes (joined or taught) this mapping is shared with.' })
});

export const sessionRow = z.object({
	id: z.string(),
	mappingId: z.string().nullable(),
	mappingName: z.string(),
	name: z.string(),
	tempo: z.number(),
	startedAt: z.string(),
	status: z.enum(['recording', 'saved']),
	eventCount: z.number().int(),
	durationMs: z.number(),
	findingCount: z.number().int(),
	audioType: z.string().nullable(),
	audioBytes: z.number().int().nullable()
});

export const chunkAnswer = z.object({
	stored: z.boolean(),
	duplicate: z.boolean().meta({ description: 'true when the server already held this exact chunk' }),
	eventCount: z.number().int()
});
