// Controller layouts learned with MIDI learn, saved with the user's account (one per name).
import { parseMapping, type ControllerProfile } from '$lib/engine';
import { and, asc, eq } from 'drizzle-orm';
import { randomUUID } from 'node:crypto';
import type { Database } from './db';
import { controllerLayout } from './db/schema';
import { Refusal } from './http';

export interface SavedLayout {
	id: string;
	name: string;
	profile: ControllerProfile;
	updatedAt: Date;
}

/** A layout is checked by the engine's own mapping schema, inside an otherwise empty mapping. */
export function checkLayout(profile: unknown): ControllerProfile {
	const parsed = parseMapping({
		version: 2,
		name: 'layout check',
		decks: 2,
		profile,
		racks: [{ id: 'rack', label: 'Rack' }],
		counters: [],
		bindings: []
	});
	if (parsed.ok) return parsed.mapping.profile;
	const problems = parsed.problems.map((p) => ({ path: p.path.replace(/^profile\.?/, ''), message: p.message }));
	throw new Refusal(400, `This is not a controller layout: ${problems[0].path} ${problems[0].message}`, problems);
}

export async function listLayouts(db: Database, ownerId: string): Promise<SavedLayout[]> {
	const rows = await db
		.select()
		.from(controllerLayout)
		.where(eq(controllerLayout.ownerId, ownerId))
		.orderBy(asc(controllerLayout.name));
	return rows.map((r) => ({ id: r.id, name: r.name, profile: checkLayout(r.profile), updatedAt: r.updatedAt }));
}

/** Adds a layout, or replaces the user's layout of the same name. */
export async function saveLayout(db: Database, ownerId: string, input: unknown): Promise<string> {
	const profile = checkLayout(input);
	const [existing] = await db
		.select({ id: controllerLayout.id })
		.from(controllerLayout)
		.where(and(eq(controllerLayout.ownerId, ownerId), eq(controllerLayout.name, profile.name)));
	if (existing) {
		await db.update(controllerLayout).set({ profile }).where(eq(controllerLayout.id, existing.id));
		return existing.id;
	}
	const id = randomUUID();
	await db.insert(controllerLayout).values({ id, ownerId, name: profile.name, profile });
	return id;
}

export async function deleteLayout(db: Database, ownerId: string, id: string) {
	const gone = await db
		.delete(controllerLayout)
		.where(and(eq(controllerLayout.id, id), eq(controllerLayout.ownerId, ownerId)))
		.returning({ id: controllerLayout.id });
	if (gone.length === 0) throw new Refusal(404, 'That controller layout does not exist, or it is someone else’s.');
}
