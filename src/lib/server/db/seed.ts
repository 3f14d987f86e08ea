// Demo data of our own invention: the Mixlab evening school, its teacher's public demo mappings
// and one class with a drill given to it, created once, idempotent (also when several instances
// start together: fixed ids and inserts that do nothing on conflict).
import { hashPassword } from 'better-auth/crypto';
import { and, eq, inArray } from 'drizzle-orm';
import { randomBytes, randomUUID } from 'node:crypto';
import type { DrillDocument } from '$lib/engine';
import { newJoinCode } from '../classes';
import { seedDemoMappings } from '../mappings';
import type { Role } from '../roles';
import type { Database } from './index';
import {
	account,
	assignment,
	classMapping,
	classMember,
	drill,
	mapping,
	mappingVersion,
	schoolClass,
	user
} from './schema';

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
	if (teacher) {
		await seedDemoMappings(db, teacher.id);
		await seedDemoClass(db, teacher.id);
	}
	return issued.length;
}

export const DEMO_CLASS = { id: 'demo-class-wednesday', name: 'Wednesday night crew' } as const;
const DEMO_DRILL_ID = 'demo-drill-echo-filter';
const DEMO_ASSIGNMENT_ID = 'demo-assignment-echo-filter';
/** Two of the three demo students; the third (Kai) is in no class, to try joining one. */
const DEMO_CLASS_MEMBERS = ['lena@mixlab.example', 'omar@mixlab.example'];

/** Invented practice material: swap between echo and filter on deck A, on the beat. */
export const DEMO_DRILL: DrillDocument = {
	version: 1,
	name: 'Echo and filter swap',
	tempo: 120,
	countInBars: 1,
	lengthBars: 4,
	windowMs: 60,
	targets: [
		{ input: 'pad-1', beat: 0, beats: 2 },
		{ input: 'pad-3', beat: 4, beats: 2 },
		{ input: 'pad-1', beat: 8, beats: 2 },
		{ input: 'pad-3', beat: 12, beats: 1 },
		{ input: 'pad-13', beat: 14, beats: 1 }
	],
	pass: { hitRate: 0.8, findings: 0 }
};

/**
 * The demo teacher's class, with two students, the two-deck demo mapping shared and one drill
 * given to it, due a week after the demo was first set up. Made once; a class the teacher
 * deleted stays deleted until the database is new.
 */
async function seedDemoClass(db: Database, teacherId: string): Promise<void> {
	const [twoDeck] = await db
		.select({ id: mapping.id, versionId: mappingVersion.id })
		.from(mapping)
		.innerJoin(
			mappingVersion,
			and(eq(mappingVersion.mappingId, mapping.id), eq(mappingVersion.version, mapping.currentVersion))
		)
		.where(eq(mapping.demoSlug, 'two-deck'));
	if (!twoDeck?.versionId) return;
	const made = await db
		.insert(schoolClass)
		.values({ id: DEMO_CLASS.id, teacherId, name: DEMO_CLASS.name, joinCode: newJoinCode() })
		.onConflictDoNothing()
		.returning({ id: schoolClass.id });
	if (!made.length) return;
	const members = await db.select({ id: user.id }).from(user).where(inArray(user.email, DEMO_CLASS_MEMBERS));
	if (members.length)
		await db
			.insert(classMember)
			.values(members.map((m) => ({ classId: DEMO_CLASS.id, userId: m.id })))
			.onConflictDoNothing();
	await db.insert(classMapping).values({ classId: DEMO_CLASS.id, mappingId: twoDeck.id }).onConflictDoNothing();
	await db
		.insert(drill)
		.values({
			id: DEMO_DRILL_ID,
			ownerId: teacherId,
			mappingId: twoDeck.id,
			mappingVersionId: twoDeck.versionId,
			name: DEMO_DRILL.name,
			document: DEMO_DRILL
		})
		.onConflictDoNothing();
	const week = 7 * 24 * 3600 * 1000;
	await db
		.insert(assignment)
		.values({
			id: DEMO_ASSIGNMENT_ID,
			classId: DEMO_CLASS.id,
			drillId: DEMO_DRILL_ID,
			dueAt: new Date(Date.now() + week)
		})
		.onConflictDoNothing();
}
