// The trash: deleted mappings and sessions keep their rows with `deletedAt` set for 30 days, then
// are purged. A mapping that any session still replays against is never removed: it leaves the
// trash but its versions stay, so those sessions keep their findings.
import { and, desc, eq, inArray, isNotNull, lt, notExists } from 'drizzle-orm';
import type { Database } from './db';
import { mapping, rehearsal, rehearsalChunk } from './db/schema';
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
 * Removes what has waited longer than 30 days. Sessions go with their events; their audio files
 * are returned for the caller to remove. A mapping goes only when no session refers to it.
 */
export async function purgeTrash(
	db: Database,
	now = new Date()
): Promise<{ sessions: number; mappings: number; audioFiles: string[] }> {
	const before = cutoff(now);
	const expired = await db
		.select({ id: rehearsal.id, audioFile: rehearsal.audioFile })
		.from(rehearsal)
		.where(lt(rehearsal.deletedAt, before));
	const ids = expired.map((r) => r.id);
	// Chunks first and explicitly: a libSQL server or a pooled connection may not enforce foreign keys.
	if (ids.length)
		await db.transaction(async (tx) => {
			await tx.delete(rehearsalChunk).where(inArray(rehearsalChunk.rehearsalId, ids));
			await tx.delete(rehearsal).where(inArray(rehearsal.id, ids));
		});
	const gone = await db
		.delete(mapping)
		.where(
			and(
				lt(mapping.deletedAt, before),
				notExists(db.select({ id: rehearsal.id }).from(rehearsal).where(eq(rehearsal.mappingId, mapping.id)))
			)
		)
		.returning({ id: mapping.id });
	return {
		sessions: expired.length,
		mappings: gone.length,
		audioFiles: expired.flatMap((r) => (r.audioFile ? [r.audioFile] : []))
	};
}
