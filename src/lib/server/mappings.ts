// Mappings in the database: a row per mapping and a row per version of its document. Only the
// owner changes or deletes a mapping; public mappings can be read (and rehearsed) by everyone.
import { DEMO_MAPPINGS, lintMapping, parseMapping, type Mapping } from '$lib/engine';
import { and, desc, eq, or } from 'drizzle-orm';
import { randomUUID } from 'node:crypto';
import type { Database } from './db';
import { mapping, mappingVersion, user } from './db/schema';
import { sharedWith } from './classes';
import { Refusal } from './http';

export type Visibility = 'private' | 'public';

export interface MappingSummary {
	id: string;
	name: string;
	visibility: Visibility;
	owner: string;
	mine: boolean;
	demo: boolean;
	decks: number;
	pads: number;
	bindings: number;
	lintCount: number;
	version: number;
	updatedAt: Date;
}

export interface MappingDetail extends MappingSummary {
	document: Mapping;
	versionId: string;
	versions: { id: string; version: number; createdAt: Date }[];
}

function summarize(row: typeof mapping.$inferSelect, owner: string, userId: string, doc: Mapping): MappingSummary {
	return {
		id: row.id,
		name: row.name,
		visibility: row.visibility,
		owner,
		mine: row.ownerId === userId,
		demo: row.demoSlug !== null,
		decks: doc.decks,
		pads: doc.profile.inputs.filter((i) => i.kind === 'pad').length,
		bindings: doc.bindings.length,
		lintCount: lintMapping(doc).length,
		version: row.currentVersion,
		updatedAt: row.updatedAt
	};
}

/** The user's own mappings and everyone's public ones, newest first. */
export async function listMappings(db: Database, userId: string): Promise<MappingSummary[]> {
	const rows = await db
		.select({ m: mapping, owner: user.name, document: mappingVersion.document })
		.from(mapping)
		.innerJoin(user, eq(user.id, mapping.ownerId))
		.innerJoin(
			mappingVersion,
			and(eq(mappingVersion.mappingId, mapping.id), eq(mappingVersion.version, mapping.currentVersion))
		)
		.where(or(eq(mapping.ownerId, userId), eq(mapping.visibility, 'public')))
		.orderBy(desc(mapping.updatedAt));
	return rows.map((r) => summarize(r.m, r.owner, userId, storedDocument(r.document)));
}

export async function getMapping(db: Database, userId: string, id: string, version?: number): Promise<MappingDetail> {
	const [row] = await db
		.select({ m: mapping, owner: user.name })
		.from(mapping)
		.innerJoin(user, eq(user.id, mapping.ownerId))
		.where(eq(mapping.id, id));
	// A private mapping is also readable by the members of a class it is shared with.
	if (!row || (row.m.ownerId !== userId && row.m.visibility !== 'public' && !(await sharedWith(db, userId, id)))) {
		throw new Refusal(404, 'That mapping does not exist, or it is private to someone else.');
	}
	const versions = await db
		.select()
		.from(mappingVersion)
		.where(eq(mappingVersion.mappingId, id))
		.orderBy(desc(mappingVersion.version));
	const chosen = versions.find((v) => v.version === (version ?? row.m.currentVersion));
	if (!chosen) throw new Refusal(404, `Version ${version} of this mapping does not exist.`);
	const document = storedDocument(chosen.document);
	return {
		...summarize(row.m, row.owner, userId, document),
		document,
		versionId: chosen.id,
		versions: versions.map((v) => ({ id: v.id, version: v.version, createdAt: v.createdAt }))
	};
}

/** A stored document as the engine reads it: version 2, a version 1 one upgraded on the way. */
export function storedDocument(doc: unknown): Mapping {
	if ((doc as { version?: number }).version === 2) return doc as Mapping;
	return checkDocument(doc);
}

/** Validates a document with the engine's schema; refuses with every problem, in plain words. */
export function checkDocument(input: unknown): Mapping {
	const parsed = parseMapping(input);
	if (parsed.ok) return parsed.mapping;
	const first = parsed.problems[0];
	throw new Refusal(
		400,
		`This is not a valid mapping document: ${first.path ? first.path + ': ' : ''}${first.message}` +
			(parsed.problems.length > 1
				? ` (and ${parsed.problems.length - 1} more problem${parsed.problems.length > 2 ? 's' : ''})`
				: ''),
		parsed.problems
	);
}

export async function createMapping(
	db: Database,
	ownerId: string,
	input: { document: unknown; name?: string; visibility?: Visibility; demoSlug?: string }
): Promise<string> {
	const document = checkDocument(input.document);
	const id = randomUUID();
	const name = input.name?.trim() || document.name;
	await db.transaction(async (tx) => {
		await tx
			.insert(mapping)
			.values({ id, ownerId, name, visibility: input.visibility ?? 'private', demoSlug: input.demoSlug });
		await tx
			.insert(mappingVersion)
			.values({ id: randomUUID(), mappingId: id, version: 1, document: { ...document, name } });
	});
	return id;
}

async function owned(db: Database, userId: string, id: string) {
	const [row] = await db.select().from(mapping).where(eq(mapping.id, id));
	if (!row || (row.ownerId !== userId && row.visibility !== 'public'))
		throw new Refusal(404, 'That mapping does not exist, or it is private to someone else.');
	if (row.ownerId !== userId)
		throw new Refusal(403, 'Only the owner can change this mapping. Fork it to make your own copy.');
	return row;
}

/** Saves a changed document as the next version; earlier versions stay for the sessions pinned to them. */
export async function saveVersion(db: Database, userId: string, id: string, input: unknown): Promise<number> {
	const row = await owned(db, userId, id);
	const document = checkDocument(input);
	const version = row.currentVersion + 1;
	await db.transaction(async (tx) => {
		await tx.insert(mappingVersion).values({ id: randomUUID(), mappingId: id, version, document });
		await tx.update(mapping).set({ currentVersion: version, name: document.name }).where(eq(mapping.id, id));
	});
	return version;
}

export async function setVisibility(db: Database, userId: string, id: string, visibility: Visibility) {
	await owned(db, userId, id);
	await db.update(mapping).set({ visibility }).where(eq(mapping.id, id));
}

export async function deleteMapping(db: Database, userId: string, id: string) {
	await owned(db, userId, id);
	await db.delete(mapping).where(eq(mapping.id, id));
}

/** The demo mappings, owned by the school's teacher and public; created once. */
export async function seedDemoMappings(db: Database, ownerId: string): Promise<number> {
	let created = 0;
	for (const demo of DEMO_MAPPINGS) {
		const [exists] = await db.select({ id: mapping.id }).from(mapping).where(eq(mapping.demoSlug, demo.slug));
		if (exists) continue;
		await createMapping(db, ownerId, {
			document: demo.mapping,
			name: demo.title,
			visibility: 'public',
			demoSlug: demo.slug
		});
		created++;
	}
	return created;
}
