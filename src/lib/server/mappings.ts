// Mappings in the database: a row per mapping and a row per version of its document. Only the
// owner changes or deletes a mapping; public mappings can be read (and rehearsed) by everyone.
import { DEMO_MAPPINGS, lintMapping, parseMapping, type Mapping } from '$lib/engine';
import { and, count, desc, eq, inArray, isNotNull, isNull, or } from 'drizzle-orm';
import { randomUUID } from 'node:crypto';
import { limits } from './config';
import type { Database } from './db';
import { classMapping, classMember, mapping, mappingVersion, schoolClass, user } from './db/schema';
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
	/** The names of the user's classes (joined or taught) this mapping is shared with. */
	classes: string[];
}

export interface MappingDetail extends MappingSummary {
	document: Mapping;
	versionId: string;
	versions: { id: string; version: number; createdAt: Date }[];
}

function summarize(
	row: typeof mapping.$inferSelect,
	owner: string,
	userId: string,
	doc: Mapping,
	lintCount: number | null,
	classes: string[] = []
): MappingSummary {
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
		lintCount: lintCount ?? lintMapping(doc).length,
		version: row.currentVersion,
		updatedAt: row.updatedAt,
		classes
	};
}

/**
 * The mappings shared with the classes the user joined or teaches, with the names of those classes.
 * A share counts while its members may read the mapping: it is public, or the class's teacher owns it
 * (the rule of `sharedWith`; a teacher reads their own class's shares by the same rule).
 */
async function classShares(db: Database, userId: string): Promise<Map<string, string[]>> {
	const rows = await db
		.select({ mappingId: classMapping.mappingId, className: schoolClass.name })
		.from(classMapping)
		.innerJoin(schoolClass, eq(schoolClass.id, classMapping.classId))
		.innerJoin(mapping, eq(mapping.id, classMapping.mappingId))
		.leftJoin(classMember, and(eq(classMember.classId, classMapping.classId), eq(classMember.userId, userId)))
		.where(
			and(
				isNull(mapping.deletedAt),
				or(eq(schoolClass.teacherId, userId), isNotNull(classMember.userId)),
				or(eq(mapping.visibility, 'public'), eq(mapping.ownerId, schoolClass.teacherId))
			)
		)
		.orderBy(schoolClass.name);
	const shares = new Map<string, string[]>();
	for (const r of rows) shares.set(r.mappingId, [...(shares.get(r.mappingId) ?? []), r.className]);
	return shares;
}

/**
 * The user's own mappings, the ones shared with their classes (private ones included) and
 * everyone's public ones, newest first. `classes` names the user's classes each one is shared with.
 */
export async function listMappings(db: Database, userId: string): Promise<MappingSummary[]> {
	const shares = await classShares(db, userId);
	const readable = or(
		eq(mapping.ownerId, userId),
		eq(mapping.visibility, 'public'),
		shares.size ? inArray(mapping.id, [...shares.keys()]) : undefined
	);
	const rows = await db
		.select({ m: mapping, owner: user.name, document: mappingVersion.document, lintCount: mappingVersion.lintCount })
		.from(mapping)
		.innerJoin(user, eq(user.id, mapping.ownerId))
		.innerJoin(
			mappingVersion,
			and(eq(mappingVersion.mappingId, mapping.id), eq(mappingVersion.version, mapping.currentVersion))
		)
		.where(and(isNull(mapping.deletedAt), readable))
		.orderBy(desc(mapping.updatedAt));
	return rows.map((r) =>
		summarize(r.m, r.owner, userId, storedDocument(r.document), r.lintCount, shares.get(r.m.id) ?? [])
	);
}

export async function getMapping(db: Database, userId: string, id: string, version?: number): Promise<MappingDetail> {
	const [row] = await db
		.select({ m: mapping, owner: user.name })
		.from(mapping)
		.innerJoin(user, eq(user.id, mapping.ownerId))
		.where(eq(mapping.id, id));
	// A private mapping is also readable by the members of a class it is shared with.
	if (
		!row ||
		row.m.deletedAt ||
		(row.m.ownerId !== userId && row.m.visibility !== 'public' && !(await sharedWith(db, userId, id)))
	) {
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
		...summarize(row.m, row.owner, userId, document, chosen.lintCount),
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
	const [{ owns }] = await db.select({ owns: count() }).from(mapping).where(eq(mapping.ownerId, ownerId));
	const max = limits.mappings();
	if (owns >= max)
		throw new Refusal(
			409,
			`You own ${owns} mappings, the most one person may keep (${max} mapping${max === 1 ? '' : 's'}). Delete one you no longer use first.`
		);
	const id = randomUUID();
	const name = input.name?.trim() || document.name;
	await db.transaction(async (tx) => {
		await tx
			.insert(mapping)
			.values({ id, ownerId, name, visibility: input.visibility ?? 'private', demoSlug: input.demoSlug });
		await tx.insert(mappingVersion).values({
			id: randomUUID(),
			mappingId: id,
			version: 1,
			document: { ...document, name },
			lintCount: lintMapping(document).length
		});
	});
	return id;
}

async function owned(db: Database, userId: string, id: string) {
	const [row] = await db.select().from(mapping).where(eq(mapping.id, id));
	// Those who may read it (public, or shared with their class) are told it is not theirs to change.
	if (
		!row ||
		row.deletedAt ||
		(row.ownerId !== userId && row.visibility !== 'public' && !(await sharedWith(db, userId, id)))
	)
		throw new Refusal(404, 'That mapping does not exist, or it is private to someone else.');
	if (row.ownerId !== userId)
		throw new Refusal(403, 'Only the owner can change this mapping. Fork it to make your own copy.');
	return row;
}

/** A save that started from an older version than the newest: refused, with the newest to compare. */
export class VersionConflict extends Refusal {
	constructor(readonly newest: { version: number; document: Mapping }) {
		super(
			409,
			`This mapping was changed elsewhere: version ${newest.version} is newer than the one you started from. Nothing was overwritten.`
		);
	}
}

/**
 * Saves a changed document as the next version; earlier versions stay for the sessions pinned to
 * them. The save only goes through when `baseVersion` (the version the change started from) is
 * still the newest version: there is no save that overwrites without knowing what it replaces.
 */
export async function saveVersion(
	db: Database,
	userId: string,
	id: string,
	input: unknown,
	baseVersion: number
): Promise<number> {
	await owned(db, userId, id);
	const document = checkDocument(input);
	const base = baseVersion;
	const version = base + 1;
	const saved = await db.transaction(async (tx) => {
		// The compare-and-set on currentVersion is what stops two tabs from both saving "version n+1".
		const moved = await tx
			.update(mapping)
			.set({ currentVersion: version, name: document.name })
			.where(and(eq(mapping.id, id), eq(mapping.currentVersion, base)))
			.returning({ id: mapping.id });
		if (moved.length === 0) return false;
		await tx
			.insert(mappingVersion)
			.values({ id: randomUUID(), mappingId: id, version, document, lintCount: lintMapping(document).length });
		return true;
	});
	if (!saved) {
		const newest = await getMapping(db, userId, id);
		throw new VersionConflict({ version: newest.version, document: newest.document });
	}
	return version;
}

export async function renameMapping(db: Database, userId: string, id: string, name: string) {
	await owned(db, userId, id);
	const current = await getMapping(db, userId, id);
	if (current.document.name === name) return current.version;
	return saveVersion(db, userId, id, { ...current.document, name }, current.version);
}

/** Copies the newest version of a mapping you can read into a new private mapping of your own. */
export async function forkMapping(db: Database, userId: string, id: string, name?: string): Promise<string> {
	const source = await getMapping(db, userId, id);
	return createMapping(db, userId, { document: source.document, name: name ?? source.name });
}

export async function listVersions(db: Database, userId: string, id: string) {
	const detail = await getMapping(db, userId, id);
	return detail.versions.map((v) => ({ version: v.version, createdAt: v.createdAt }));
}

export async function setVisibility(db: Database, userId: string, id: string, visibility: Visibility) {
	await owned(db, userId, id);
	await db.update(mapping).set({ visibility }).where(eq(mapping.id, id));
}

/**
 * Moves a mapping to its owner's trash. Its versions stay, so every session recorded with it (by
 * anyone, when it was public) keeps replaying with its findings. Demo mappings belong to everyone.
 */
export async function deleteMapping(db: Database, userId: string, id: string) {
	const row = await owned(db, userId, id);
	if (row.demoSlug)
		throw new Refusal(403, 'Demo mappings are shared with everyone and cannot be deleted. Fork one to change it.');
	await db.update(mapping).set({ deletedAt: new Date() }).where(eq(mapping.id, id));
}

/** Counts the lint findings of versions saved before the count was kept; returns how many it filled in. */
export async function backfillLintCounts(db: Database): Promise<number> {
	const rows = await db
		.select({ id: mappingVersion.id, document: mappingVersion.document })
		.from(mappingVersion)
		.where(isNull(mappingVersion.lintCount));
	for (const row of rows) {
		const parsed = parseMapping(row.document);
		const lintCount = parsed.ok ? lintMapping(parsed.mapping).length : 0;
		await db.update(mappingVersion).set({ lintCount }).where(eq(mappingVersion.id, row.id));
	}
	return rows.length;
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
