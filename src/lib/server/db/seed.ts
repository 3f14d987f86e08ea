// Demo data of our own invention: the Mixlab evening school and its teacher's public demo
// mappings, created once, idempotent (also when several instances start together).
import { hashPassword } from 'better-auth/crypto';
import { eq } from 'drizzle-orm';
import { randomBytes, randomUUID } from 'node:crypto';
import { seedDemoMappings } from '../mappings';
import type { Role } from '../roles';
import type { Database } from './index';
import { account, user } from './schema';

/** The published password of a local try-it run; never used when the demo runs in production. */
export const DEMO_PASSWORD = 'rehearse-1234';

export const DEMO_USERS: { name: string; email: string; role: Role }[] = [
	{ name: 'Ines Marlow', email: 'ines@mixlab.example', role: 'admin' },
	{ name: 'Tomas Reyes', email: 'tomas@mixlab.example', role: 'teacher' },
	{ name: 'Kai Lindqvist', email: 'kai@mixlab.example', role: 'student' },
	{ name: 'Lena Osei', email: 'lena@mixlab.example', role: 'student' },
	{ name: 'Omar Haddad', email: 'omar@mixlab.example', role: 'student' }
];

export interface SeedOptions {
	/** Give each new account its own random password (production with PADPROOF_DEMO=1). */
	randomPasswords?: boolean;
	/** Where the random passwords are printed, once, when their accounts are created. */
	log?: (line: string) => void;
}

/** Creates the demo accounts that are missing; returns how many were created. */
export async function seedDemo(db: Database, options: SeedOptions = {}): Promise<number> {
	const issued: { email: string; password: string }[] = [];
	for (const demo of DEMO_USERS) {
		const id = randomUUID();
		const inserted = await db
			.insert(user)
			.values({ id, name: demo.name, email: demo.email, role: demo.role, emailVerified: true })
			.onConflictDoNothing()
			.returning({ id: user.id });
		if (!inserted.length) continue;
		const password = options.randomPasswords ? randomBytes(12).toString('base64url') : DEMO_PASSWORD;
		await db.insert(account).values({
			id: randomUUID(),
			accountId: id,
			providerId: 'credential',
			userId: id,
			password: await hashPassword(password)
		});
		issued.push({ email: demo.email, password });
	}
	if (options.randomPasswords && issued.length) {
		const log = options.log ?? console.log;
		log('Demo school created. These passwords are shown this once; note them now:');
		for (const { email, password } of issued) log(`  ${email.padEnd(24)} ${password}`);
	}
	const [teacher] = await db.select({ id: user.id }).from(user).where(eq(user.email, 'tomas@mixlab.example'));
	if (teacher) await seedDemoMappings(db, teacher.id);
	return issued.length;
}
