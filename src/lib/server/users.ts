import { and, asc, count, eq, inArray, ne, or, sql, type Column } from 'drizzle-orm';
import { serialWrite, type Database } from './db';
import { apikey, mapping, mappingVersion, rehearsal, rehearsalChunk, user } from './db/schema';
import type { Role } from './roles';
import { uploadStore } from './storage';

export interface UserRow {
	id: string;
	name: string;
	email: string;
	role: Role;
	banned: boolean;
	createdAt: Date;
}

const contains = (column: Column, pattern: string) => sql`${column} like ${pattern} escape '\\'`;

const columns = {
	id: user.id,
	name: user.name,
	email: user.email,
	role: user.role,
	banned: sql<boolean>`coalesce(${user.banned}, 0) = 1`.mapWith(Boolean),
	createdAt: user.createdAt
};

export async function listUsers(db: Database, query = ''): Promise<UserRow[]> {
	const q = query.trim();
	const pattern = `%${q.replace(/[%_\\]/g, (c) => '\\' + c)}%`;
	return db
		.select(columns)
		.from(user)
		.where(q ? or(contains(user.name, pattern), contains(user.email, pattern)) : undefined)
		.orderBy(asc(user.name))
		.limit(500);
}

export async function findUser(db: Database, userId: string): Promise<UserRow | undefined> {
	const [row] = await db.select(columns).from(user).where(eq(user.id, userId));
	return row;
}

export class RoleChangeError extends Error {}

const LAST_ADMIN = 'The school needs at least one admin: make someone else admin first.';

type Reader = Pick<Database, 'select'>;
type Tx = Parameters<Parameters<Database['transaction']>[0]>[0];

const busy = (e: unknown) => /SQLITE_BUSY|database is locked/i.test(String((e as Error)?.message ?? e));

/**
 * A write transaction that takes the write lock first (`begin immediate`), so what it reads cannot
 * change before it writes. Within this process writes queue (`serialWrite`); another process
 * holding the lock makes it wait and try again, for up to 5 s (a transaction's own connection has
 * no busy timeout).
 */
async function writeTransaction<T>(db: Database, work: (tx: Tx) => Promise<T>): Promise<T> {
	const deadline = Date.now() + 5000;
	for (;;) {
		try {
			return await serialWrite(() => db.transaction(work, { behavior: 'immediate' }));
		} catch (e) {
			if (!busy(e) || Date.now() > deadline) throw e;
			await new Promise((r) => setTimeout(r, 10 + Math.random() * 40));
		}
	}
}

/** Admins other than `userId` who can still sign in. */
async function otherActiveAdmins(db: Reader, userId: string): Promise<number> {
	const [{ admins }] = await db
		.select({ admins: count() })
		.from(user)
		.where(and(eq(user.role, 'admin'), ne(user.id, userId), sql`coalesce(${user.banned}, 0) = 0`));
	return admins;
}

/**
 * Gives a user a new role; the school never loses its last admin. The check and the change run in
 * one write transaction (`begin immediate`), so two admins demoting each other at once cannot
 * both succeed, also across app instances sharing the database.
 */
export async function changeRole(db: Database, userId: string, role: Role): Promise<UserRow> {
	return writeTransaction(db, async (tx) => {
		const [target] = await tx.select().from(user).where(eq(user.id, userId));
		if (!target) throw new RoleChangeError('That account does not exist any more.');
		if (target.role === 'admin' && role !== 'admin' && (await otherActiveAdmins(tx, userId)) === 0) {
			throw new RoleChangeError(LAST_ADMIN);
		}
		const [updated] = await tx.update(user).set({ role }).where(eq(user.id, userId)).returning();
		return {
			id: updated.id,
			name: updated.name,
			email: updated.email,
			role: updated.role,
			banned: Boolean(updated.banned),
			createdAt: updated.createdAt
		};
	});
}

/** Why this account may not be disabled or deleted, or null: the last active admin stays. */
export async function lastAdminProblem(db: Database, userId: string): Promise<string | null> {
	const [target] = await db.select({ role: user.role }).from(user).where(eq(user.id, userId));
	if (target?.role !== 'admin') return null;
	return (await otherActiveAdmins(db, userId)) === 0 ? LAST_ADMIN : null;
}

/**
 * Deletes everything a person made before their account goes: sessions (with their chunks and
 * audio files) and mappings. Public mappings that other people's sessions were played with pass
 * to `heirId` (an admin), so those sessions keep working; without an heir they go too.
 * Does not rely on foreign-key cascades (a per-connection setting in SQLite).
 */
export async function deleteAccountData(db: Database, userId: string, heirId: string | null) {
	const files: { file: string | null }[] = [];
	const kept = await writeTransaction(db, async (tx) => {
		const ownRehearsals = tx.select({ id: rehearsal.id }).from(rehearsal).where(eq(rehearsal.ownerId, userId));
		await tx.delete(rehearsalChunk).where(inArray(rehearsalChunk.rehearsalId, ownRehearsals));
		// The files held at the moment of deletion, also one an upload attached just before.
		files.push(
			...(await tx.delete(rehearsal).where(eq(rehearsal.ownerId, userId)).returning({ file: rehearsal.audioFile }))
		);

		const usedByOthers = await tx
			.selectDistinct({ id: mapping.id })
			.from(mapping)
			.innerJoin(rehearsal, eq(rehearsal.mappingId, mapping.id))
			.where(and(eq(mapping.ownerId, userId), eq(mapping.visibility, 'public')));
		const keep = heirId ? usedByOthers.map((m) => m.id) : [];
		if (keep.length) await tx.update(mapping).set({ ownerId: heirId! }).where(inArray(mapping.id, keep));

		const ownMappings = tx.select({ id: mapping.id }).from(mapping).where(eq(mapping.ownerId, userId));
		const ownVersions = tx
			.select({ id: mappingVersion.id })
			.from(mappingVersion)
			.where(inArray(mappingVersion.mappingId, ownMappings));
		await tx.update(rehearsal).set({ mappingVersionId: null }).where(inArray(rehearsal.mappingVersionId, ownVersions));
		await tx.update(rehearsal).set({ mappingId: null }).where(inArray(rehearsal.mappingId, ownMappings));
		await tx.delete(mappingVersion).where(inArray(mappingVersion.mappingId, ownMappings));
		await tx.delete(mapping).where(eq(mapping.ownerId, userId));
		await tx.delete(apikey).where(eq(apikey.referenceId, userId));
		return keep.length;
	});
	for (const { file } of files) if (file) await uploadStore().remove(file);
	return { keptMappings: kept };
}

/** The admin who receives public mappings others rely on: the oldest active admin other than `userId`. */
export async function heirFor(db: Database, userId: string): Promise<string | null> {
	const [heir] = await db
		.select({ id: user.id })
		.from(user)
		.where(and(eq(user.role, 'admin'), ne(user.id, userId), sql`coalesce(${user.banned}, 0) = 0`))
		.orderBy(asc(user.createdAt))
		.limit(1);
	return heir?.id ?? null;
}
