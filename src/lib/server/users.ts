import { and, asc, count, eq, exists, inArray, isNull, ne, or, sql, type Column } from 'drizzle-orm';
import { removeClasses, removeDrills, removeFiles, removeMappings, removeSessions, removeSubmissions } from './cleanup';
import { writeTransaction, type Database, type Tx } from './db';
import {
	apikey,
	classInvite,
	classMapping,
	classMember,
	controllerLayout,
	drill,
	drillTake,
	mapping,
	mappingVersion,
	rehearsal,
	schoolClass,
	submission,
	user
} from './db/schema';
import type { Role } from './roles';

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

/**
 * Why this account may not be disabled or deleted, or null: the last active admin stays. The check
 * runs in a write transaction (`begin immediate`) like `changeRole`'s. With `claim`, an admin that
 * passes is marked disabled in that same transaction, before the caller disables or deletes it:
 * of two admins disabling or deleting each other at once (also across app instances), the second
 * check then sees the first as gone and refuses. The caller undoes the mark with `releaseClaim`
 * when the disabling or deletion then fails.
 */
export async function lastAdminProblem(
	db: Database,
	userId: string,
	{ claim = false }: { claim?: boolean } = {}
): Promise<string | null> {
	return writeTransaction(db, async (tx) => {
		const [target] = await tx.select({ role: user.role, banned: user.banned }).from(user).where(eq(user.id, userId));
		if (target?.role !== 'admin') return null;
		if ((await otherActiveAdmins(tx, userId)) === 0) return LAST_ADMIN;
		if (claim && !target.banned) await tx.update(user).set({ banned: true }).where(eq(user.id, userId));
		return null;
	});
}

/** Takes back the mark `lastAdminProblem({ claim: true })` set, when disabling or deleting did not happen. */
export async function releaseClaim(db: Database, userId: string) {
	await writeTransaction(db, (tx) =>
		tx
			.update(user)
			.set({ banned: false })
			.where(and(eq(user.id, userId), eq(user.role, 'admin'), isNull(user.banReason)))
	);
}

/** Mappings of `userId` that others rely on: their drills are played on them, or their sessions replay against public or class-shared ones. */
async function reliedOn(tx: Tx, userId: string): Promise<string[]> {
	const versions = tx
		.select({ id: mappingVersion.id })
		.from(mappingVersion)
		.where(eq(mappingVersion.mappingId, mapping.id));
	const othersSessions = tx
		.select({ id: rehearsal.id })
		.from(rehearsal)
		.where(
			and(
				ne(rehearsal.ownerId, userId),
				or(eq(rehearsal.mappingId, mapping.id), inArray(rehearsal.mappingVersionId, versions))
			)
		);
	const othersDrills = tx
		.select({ id: drill.id })
		.from(drill)
		.where(
			and(ne(drill.ownerId, userId), or(eq(drill.mappingId, mapping.id), inArray(drill.mappingVersionId, versions)))
		);
	const sharedWithClass = tx
		.select({ id: classMapping.mappingId })
		.from(classMapping)
		.where(eq(classMapping.mappingId, mapping.id));
	const rows = await tx
		.select({ id: mapping.id })
		.from(mapping)
		.where(
			and(
				eq(mapping.ownerId, userId),
				or(
					exists(othersDrills),
					and(or(eq(mapping.visibility, 'public'), exists(sharedWithClass)), exists(othersSessions))
				)
			)
		);
	return rows.map((r) => r.id);
}

/**
 * Deletes everything a person made before their account goes, in one write transaction that
 * removes every dependent row itself (it does not rely on foreign-key cascades, a per-connection
 * setting in SQLite): their classes (with members, invitations, assignments and the submissions to
 * them), their drills, what they handed in as a student (submissions, scored takes, memberships),
 * their sessions (also ones handed in: the person asked for their data to go), mappings, learned
 * controller layouts and API tokens; then the audio files of all of it.
 *
 * Mappings others rely on pass to `heirId` (an admin), so that those keep working: ones other
 * people's drills are played on, and public or class-shared ones other people's sessions replay
 * against. Without an heir they go too: other sessions lose the link, other drills on them go.
 */
export async function deleteAccountData(db: Database, userId: string, heirId: string | null) {
	const { files, kept } = await writeTransaction(db, async (tx) => {
		const keep = heirId ? await reliedOn(tx, userId) : [];
		if (keep.length) await tx.update(mapping).set({ ownerId: heirId! }).where(inArray(mapping.id, keep));

		const files = [
			...(await removeClasses(tx, eq(schoolClass.teacherId, userId))),
			...(await removeDrills(tx, eq(drill.ownerId, userId))),
			...(await removeSubmissions(tx, eq(submission.studentId, userId)))
		];
		await tx.delete(drillTake).where(eq(drillTake.userId, userId));
		await tx.delete(classMember).where(eq(classMember.userId, userId));
		await tx.update(classInvite).set({ acceptedBy: null }).where(eq(classInvite.acceptedBy, userId));
		// The files held at the moment of deletion, also one an upload attached just before.
		files.push(...(await removeSessions(tx, eq(rehearsal.ownerId, userId))).files);
		files.push(...(await removeMappings(tx, eq(mapping.ownerId, userId))).files);
		await tx.delete(controllerLayout).where(eq(controllerLayout.ownerId, userId));
		await tx.delete(apikey).where(eq(apikey.referenceId, userId));
		return { files, kept: keep.length };
	});
	await removeFiles(files);
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
