import { and, asc, count, eq, ne, or, sql, type Column } from 'drizzle-orm';
import type { Database } from './db';
import { user } from './db/schema';
import type { Role } from './roles';

export interface UserRow {
	id: string;
	name: string;
	email: string;
	role: Role;
	createdAt: Date;
}

const contains = (column: Column, pattern: string) => sql`${column} like ${pattern} escape '\\'`;

export async function listUsers(db: Database, query = ''): Promise<UserRow[]> {
	const q = query.trim();
	const pattern = `%${q.replace(/[%_\\]/g, (c) => '\\' + c)}%`;
	return db
		.select({ id: user.id, name: user.name, email: user.email, role: user.role, createdAt: user.createdAt })
		.from(user)
		.where(q ? or(contains(user.name, pattern), contains(user.email, pattern)) : undefined)
		.orderBy(asc(user.name))
		.limit(500);
}

export class RoleChangeError extends Error {}

/** Gives a user a new role; the school never loses its last admin. */
export async function changeRole(db: Database, userId: string, role: Role): Promise<UserRow> {
	const [target] = await db.select().from(user).where(eq(user.id, userId));
	if (!target) throw new RoleChangeError('That account does not exist any more.');
	if (target.role === 'admin' && role !== 'admin') {
		const [{ admins }] = await db
			.select({ admins: count() })
			.from(user)
			.where(and(eq(user.role, 'admin'), ne(user.id, userId)));
		if (admins === 0) throw new RoleChangeError('The school needs at least one admin: make someone else admin first.');
	}
	const [updated] = await db.update(user).set({ role }).where(eq(user.id, userId)).returning();
	return { id: updated.id, name: updated.name, email: updated.email, role: updated.role, createdAt: updated.createdAt };
}
