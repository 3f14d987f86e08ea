import { sql } from 'drizzle-orm';
import { index, integer, primaryKey, real, sqliteTable, text, uniqueIndex } from 'drizzle-orm/sqlite-core';
import { user } from './auth.schema';
import type { SessionClock, SessionStart } from '../../engine/types';

export * from './auth.schema';

const now = () =>
	integer({ mode: 'timestamp_ms' })
		.default(sql`(cast(unixepoch('subsecond') * 1000 as integer))`)
		.notNull();

/** A mapping document's home; its content lives in versions, the newest being `currentVersion`. */
export const mapping = sqliteTable(
	'mapping',
	{
		id: text().primaryKey(),
		ownerId: text()
			.notNull()
			.references(() => user.id, { onDelete: 'cascade' }),
		name: text().notNull(),
		visibility: text({ enum: ['private', 'public'] })
			.default('private')
			.notNull(),
		demoSlug: text().unique(),
		currentVersion: integer().notNull().default(1),
		/** Set when the owner deletes it: in the trash for 30 days, then purged (see server/trash.ts). */
		deletedAt: integer({ mode: 'timestamp_ms' }),
		createdAt: now(),
		updatedAt: now().$onUpdate(() => new Date())
	},
	(t) => [index('mapping_owner_idx').on(t.ownerId)]
);

/** Every change of a mapping's document is a new version; sessions pin the one they used. */
export const mappingVersion = sqliteTable(
	'mapping_version',
	{
		id: text().primaryKey(),
		mappingId: text()
			.notNull()
			.references(() => mapping.id, { onDelete: 'cascade' }),
		version: integer().notNull(),
		document: text({ mode: 'json' }).notNull(),
		/** How many lint findings the document has; written with the version (null: not yet counted). */
		lintCount: integer(),
		createdAt: now()
	},
	(t) => [index('mapping_version_idx').on(t.mappingId, t.version)]
);

/** Version 1 mapping documents as they were stored before the upgrade to version 2 rewrote them. */
export const mappingVersionV1 = sqliteTable('mapping_version_v1', {
	versionId: text()
		.primaryKey()
		.references(() => mappingVersion.id, { onDelete: 'cascade' }),
	document: text({ mode: 'json' }).notNull(),
	archivedAt: now()
});

/** One recorded rehearsal (a "session" in the product; the auth tables own that table name). */
export const rehearsal = sqliteTable(
	'rehearsal',
	{
		id: text().primaryKey(),
		ownerId: text()
			.notNull()
			.references(() => user.id, { onDelete: 'cascade' }),
		mappingId: text().references(() => mapping.id, { onDelete: 'set null' }),
		mappingVersionId: text().references(() => mappingVersion.id, { onDelete: 'set null' }),
		mappingName: text().notNull(),
		name: text().notNull(),
		tempo: real().notNull(),
		startedAt: text().notNull(),
		// The beat clock and the rig as they stood when recording began (session version 2).
		clock: text({ mode: 'json' }).$type<SessionClock>(),
		initial: text({ mode: 'json' }).$type<SessionStart>(),
		status: text({ enum: ['recording', 'saved'] })
			.default('recording')
			.notNull(),
		eventCount: integer().notNull().default(0),
		durationMs: real().notNull().default(0),
		findingCount: integer().notNull().default(0),
		audioFile: text(),
		audioType: text(),
		audioBytes: integer(),
		/** Set when the owner deletes it: in the trash for 30 days, then purged (see server/trash.ts). */
		deletedAt: integer({ mode: 'timestamp_ms' }),
		createdAt: now(),
		updatedAt: now().$onUpdate(() => new Date())
	},
	(t) => [index('rehearsal_owner_idx').on(t.ownerId)]
);

/** Events arrive in numbered chunks; (rehearsal, seq) is unique so a resent chunk is kept once. */
export const rehearsalChunk = sqliteTable(
	'rehearsal_chunk',
	{
		rehearsalId: text()
			.notNull()
			.references(() => rehearsal.id, { onDelete: 'cascade' }),
		seq: integer().notNull(),
		events: text({ mode: 'json' }).notNull(),
		eventCount: integer().notNull(),
		receivedAt: now()
	},
	(t) => [primaryKey({ columns: [t.rehearsalId, t.seq] })]
);

/** Controller layouts a user learned with MIDI learn, kept with the account. */
export const controllerLayout = sqliteTable(
	'controller_layout',
	{
		id: text().primaryKey(),
		ownerId: text()
			.notNull()
			.references(() => user.id, { onDelete: 'cascade' }),
		name: text().notNull(),
		profile: text({ mode: 'json' }).notNull(),
		createdAt: now(),
		updatedAt: now().$onUpdate(() => new Date())
	},
	(t) => [uniqueIndex('controller_layout_owner_name_idx').on(t.ownerId, t.name)]
);

/**
 * Counters of the sign-in throttle (see `src/lib/server/throttle.ts`): one row per bucket, e.g.
 * `account:kai@mixlab.example` or `address:203.0.113.7`, kept in the database so that several app
 * instances share them.
 */
export const authThrottle = sqliteTable('auth_throttle', {
	bucket: text().primaryKey(),
	hits: integer().notNull(),
	windowStartedAt: integer().notNull()
});

// ---- Classes, drills, assignments and submissions (teaching) ----

/** A teacher's class; students join by invitation or by its join code. */
export const schoolClass = sqliteTable(
	'school_class',
	{
		id: text().primaryKey(),
		teacherId: text()
			.notNull()
			.references(() => user.id, { onDelete: 'cascade' }),
		name: text().notNull(),
		joinCode: text().notNull().unique(),
		createdAt: now()
	},
	(t) => [index('school_class_teacher_idx').on(t.teacherId)]
);

export const classMember = sqliteTable(
	'class_member',
	{
		classId: text()
			.notNull()
			.references(() => schoolClass.id, { onDelete: 'cascade' }),
		userId: text()
			.notNull()
			.references(() => user.id, { onDelete: 'cascade' }),
		joinedAt: now()
	},
	(t) => [primaryKey({ columns: [t.classId, t.userId] }), index('class_member_user_idx').on(t.userId)]
);

/** An e-mail invitation; its token is the link. Accepted once, by whoever signs in with it. */
export const classInvite = sqliteTable('class_invite', {
	token: text().primaryKey(),
	classId: text()
		.notNull()
		.references(() => schoolClass.id, { onDelete: 'cascade' }),
	email: text().notNull(),
	createdAt: now(),
	acceptedAt: integer({ mode: 'timestamp_ms' }),
	acceptedBy: text().references(() => user.id, { onDelete: 'set null' })
});

/** A mapping shared with a class: its members may open and rehearse it. */
export const classMapping = sqliteTable(
	'class_mapping',
	{
		classId: text()
			.notNull()
			.references(() => schoolClass.id, { onDelete: 'cascade' }),
		mappingId: text()
			.notNull()
			.references(() => mapping.id, { onDelete: 'cascade' }),
		sharedAt: now()
	},
	(t) => [primaryKey({ columns: [t.classId, t.mappingId] })]
);

/** A drill (DESIGN.md §4.8): its document, and the mapping version it is played on. */
export const drill = sqliteTable(
	'drill',
	{
		id: text().primaryKey(),
		ownerId: text()
			.notNull()
			.references(() => user.id, { onDelete: 'cascade' }),
		mappingId: text()
			.notNull()
			.references(() => mapping.id, { onDelete: 'cascade' }),
		mappingVersionId: text()
			.notNull()
			.references(() => mappingVersion.id, { onDelete: 'cascade' }),
		name: text().notNull(),
		document: text({ mode: 'json' }).notNull(),
		createdAt: now(),
		updatedAt: now().$onUpdate(() => new Date())
	},
	(t) => [index('drill_owner_idx').on(t.ownerId)]
);

/** A drill given to a class with a due date. */
export const assignment = sqliteTable(
	'assignment',
	{
		id: text().primaryKey(),
		classId: text()
			.notNull()
			.references(() => schoolClass.id, { onDelete: 'cascade' }),
		drillId: text()
			.notNull()
			.references(() => drill.id, { onDelete: 'cascade' }),
		dueAt: integer({ mode: 'timestamp_ms' }).notNull(),
		createdAt: now()
	},
	(t) => [index('assignment_class_idx').on(t.classId)]
);

/** One try at a drill in the rehearsal room: the session, where its beat 0 fell, and its score. */
export const drillTake = sqliteTable(
	'drill_take',
	{
		rehearsalId: text()
			.primaryKey()
			.references(() => rehearsal.id, { onDelete: 'cascade' }),
		drillId: text()
			.notNull()
			.references(() => drill.id, { onDelete: 'cascade' }),
		userId: text()
			.notNull()
			.references(() => user.id, { onDelete: 'cascade' }),
		zero: real().notNull(),
		score: text({ mode: 'json' }).notNull(),
		hitRate: real().notNull(),
		pass: integer({ mode: 'boolean' }).notNull(),
		createdAt: now()
	},
	(t) => [index('drill_take_user_idx').on(t.userId, t.drillId)]
);

/** A student's session handed in for an assignment, with an optional audio file and the teacher's review. */
export const submission = sqliteTable(
	'submission',
	{
		id: text().primaryKey(),
		assignmentId: text()
			.notNull()
			.references(() => assignment.id, { onDelete: 'cascade' }),
		studentId: text()
			.notNull()
			.references(() => user.id, { onDelete: 'cascade' }),
		rehearsalId: text()
			.notNull()
			.references(() => rehearsal.id, { onDelete: 'cascade' }),
		submittedAt: now(),
		late: integer({ mode: 'boolean' }).notNull(),
		score: text({ mode: 'json' }).notNull(),
		hitRate: real().notNull(),
		pass: integer({ mode: 'boolean' }).notNull(),
		// What the score was counted against when it was handed in: beat 0 on the session clock, the
		// drill document and the mapping version. Null for hand-ins from before they were kept.
		zero: real(),
		drillDocument: text({ mode: 'json' }),
		mappingVersionId: text(),
		audioFile: text(),
		audioType: text(),
		grade: text(),
		comment: text(),
		gradedAt: integer({ mode: 'timestamp_ms' })
	},
	(t) => [
		index('submission_assignment_idx').on(t.assignmentId),
		uniqueIndex('submission_one_per_student').on(t.assignmentId, t.studentId)
	]
);
