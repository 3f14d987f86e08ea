// Demo data of our own invention: the Mixlab evening school and its teacher's public demo
// mappings, created once, idempotent.
import { hashPassword } from 'better-auth/crypto';
import { eq } from 'drizzle-orm';
import { randomUUID } from 'node:crypto';
import { seedDemoMappings } from '../mappings';
import type { Role } from '../roles';
import type { Database } from './index';
import { account, user } from './schema';

export const DEMO_PASSWORD = 'rehearse-1234';

export const DEMO_USERS: { name: string; email: string; role: Role }[] = [
	{ name: 'Ines Marlow', email: 'ines@mixlab.example', role: 'admin' },
	{ name: 'Tomas Reyes', email: 'tomas@mixlab.example', role: 'teacher' },
	{ name: 'Kai Lindqvist', email: 'kai@mixlab.example', role: 'student' },
	{ name: 'Lena Osei', email: 'lena@mixlab.example', role: 'student' },
	{ name: 'Omar Haddad', email: 'omar@mixlab.example', role: 'student' }
];

/** Creates the demo accounts that are missing; returns how many were created. */
export async function seedDemo(db: Database): Promise<number> {
	let created = 0;
	for (const demo of DEMO_USERS) {
		const existing = await db.select({ id: user.id }).from(user).where(eq(user.email, demo.email));
		if (existing.length) continue;
		const id = randomUUID();
		await db.insert(user).values({ id, name: demo.name, email: demo.email, role: demo.role, emailVerified: true });
		await db.insert(account).values({
			id: randomUUID(),
			accountId: id,
			providerId: 'credential',
			userId: id,
			password: await hashPassword(DEMO_PASSWORD)
		});
		created++;
	}
	const [teacher] = await db.select({ id: user.id }).from(user).where(eq(user.email, 'tomas@mixlab.example'));
	if (teacher) await seedDemoMappings(db, teacher.id);
	return created;
}
