// The trash: deleted mappings and sessions keep their rows with `deletedAt` set for 30 days, then
// are purged. A mapping that any session still replays against, or any drill is played on, is
// never removed: it leaves the trash but its versions stay, so those sessions keep their findings
// and the drills keep working.
import { and, desc, eq, exists, inArray, isNotNull, lt, notExists, or } from 'drizzle-orm';
import { removeMappings, removeSessions } from './cleanup';
import { writeTransaction, type Database } from './db';
import { drill, mapping, mappingVersion, rehearsal, submission } from './db/schema';
import { Refusal } from './http';

export const TRASH_DAYS = 30;
const DAY_MS = 24 * 60 * 60 * 1000;

export interface TrashItem {
	kind: 'mapping' | 'session';
	id: string;
	name: string;
	detail: string;
	deletedAt: Date;
	/** Whole days before it is purged (0 = on the next purge). */
	daysLeft: number;
}

const cutoff = (now: Date) => new Date(now.getTime() - TRASH_DAYS * DAY_MS);
const daysLeft = (deletedAt: Date, now: Date) =>
	Math.max(0, Math.ceil((deletedAt.getTime() + TRASH_DAYS * DAY_MS - now.getTime()) / DAY_MS));

/** What the user deleted in the last 30 days, newest first. */
export async function listTrash(db: Database, userId: string, now = new Date()): Promise<TrashItem[]> {
	const since = cutoff(now);
	const [maps, sessions] = await Promise.all([
		db
			.select()
			.from(mapping)
			.where(and(eq(mapping.ownerId, userId), isNotNull(mapping.deletedAt)))
			.orderBy(desc(mapping.deletedAt)),
		db
			.select()
			.from(rehearsal)
			.where(and(eq(rehearsal.ownerId, userId), isNotNull(rehearsal.deletedAt)))
			.orderBy(desc(rehearsal.deletedAt))
	]);
	const items: TrashItem[] = [
		...maps.map((m) => ({
			kind: 'mapping' as const,
			id: m.id,
			name: m.name,
			detail: `mapping · v${m.currentVersion}${m.visibility === 'public' ? ' · was public' : ''}`,
			deletedAt: m.deletedAt!
		})),
		...sessions.map((s) => ({
			kind: 'session' as const,
			id: s.id,
			name: s.name,
			detail: `session · ${s.mappingName} · ${s.eventCount} events`,
			deletedAt: s.deletedAt!
		}))
	]
		.filter((item) => item.deletedAt > since)
		.map((item) => ({ ...item, daysLeft: daysLeft(item.deletedAt, now) }));
	return items.sort((a, b) => b.deletedAt.getTime() - a.deletedAt.getTime());
}

/** Takes one item out of the trash; refuses when it is not the user's or was purged already. */
export async function restoreFromTrash(
	db: Database,
	userId: string,
	kind: TrashItem['kind'],
	id: string,
	now = new Date()
): Promise<string> {
	const table = kind === 'mapping' ? mapping : rehearsal;
	const [row] = await db
		.select({ name: table.name, ownerId: table.ownerId, deletedAt: table.deletedAt })
		.from(table)
		.where(eq(table.id, id));
	if (!row || row.ownerId !== userId || !row.deletedAt || row.deletedAt <= cutoff(now))
		throw new Refusal(404, `That ${kind} is not in your trash (it may have been restored or purged already).`);
	await db.update(table).set({ deletedAt: null }).where(eq(table.id, id));
	return row.name;
}

/**
 * Removes what has waited longer than 30 days, in one write transaction that deletes every
 * dependent row itself (server/cleanup.ts). Sessions go with their events; a session handed in
 * for an assignment stays: one trashed before that was refused is taken out of the trash.
 * A mapping goes only when no session and no drill refers to it or to one of its versions; one
 * that is still referred to leaves the trash but keeps its versions. The audio files of what was
 * removed are returned for the caller to remove.
 */
export async function purgeTrash(
	db: Database,
	now = new Date()
): Promise<{ sessions: number; mappings: number; audioFiles: string[] }> {
	const before = cutoff(now);
	const versions = db
		.select({ id: mappingVersion.id })
		.from(mappingVersion)
		.where(eq(mappingVersion.mappingId, mapping.id));
	const unused = and(
		notExists(
			db
				.select({ id: rehearsal.id })
				.from(rehearsal)
				.where(or(eq(rehearsal.mappingId, mapping.id), inArray(rehearsal.mappingVersionId, versions)))
		),
		notExists(
			db
				.select({ id: drill.id })
				.from(drill)
				.where(or(eq(drill.mappingId, mapping.id), inArray(drill.mappingVersionId, versions)))
		)
	)!;
	return writeTransaction(db, async (tx) => {
		// A take handed in and trashed before that was refused comes back: the class keeps it.
		await tx
			.update(rehearsal)
			.set({ deletedAt: null })
			.where(
				and(
					isNotNull(rehearsal.deletedAt),
					exists(tx.select({ id: submission.id }).from(submission).where(eq(submission.rehearsalId, rehearsal.id)))
				)
			);
		const sessions = await removeSessions(
			tx,
			and(
				lt(rehearsal.deletedAt, before),
				notExists(tx.select({ id: submission.id }).from(submission).where(eq(submission.rehearsalId, rehearsal.id)))
			)!
		);
		const mappings = await removeMappings(tx, and(lt(mapping.deletedAt, before), unused)!);
		return {
			sessions: sessions.count,
			mappings: mappings.count,
			audioFiles: [...sessions.files, ...mappings.files]
		};
	});
}
