// Tables better-auth reads and writes (its documented core schema) with the fields of its admin
// plugin (role, banned, banReason, banExpires; impersonatedBy on session).
import { sql } from 'drizzle-orm';
import { index, integer, sqliteTable, text, uniqueIndex } from 'drizzle-orm/sqlite-core';

const createdAt = () =>
	integer({ mode: 'timestamp_ms' })
		.default(sql`(cast(unixepoch('subsecond') * 1000 as integer))`)
		.notNull();

export const user = sqliteTable('user', {
	id: text().primaryKey(),
	name: text().notNull(),
	email: text().notNull().unique(),
	emailVerified: integer({ mode: 'boolean' }).default(false).notNull(),
	image: text(),
	role: text({ enum: ['admin', 'teacher', 'student'] })
		.default('student')
		.notNull(),
	banned: integer({ mode: 'boolean' }).default(false),
	banReason: text(),
	banExpires: integer({ mode: 'timestamp_ms' }),
	createdAt: createdAt(),
	updatedAt: createdAt().$onUpdate(() => new Date())
});

export const session = sqliteTable(
	'session',
	{
		id: text().primaryKey(),
		expiresAt: integer({ mode: 'timestamp_ms' }).notNull(),
		token: text().notNull().unique(),
		createdAt: createdAt(),
		updatedAt: createdAt().$onUpdate(() => new Date()),
		ipAddress: text(),
		userAgent: text(),
		impersonatedBy: text(),
		userId: text()
			.notNull()
			.references(() => user.id, { onDelete: 'cascade' })
	},
	(t) => [index('session_user_idx').on(t.userId)]
);

export const account = sqliteTable(
	'account',
	{
		id: text().primaryKey(),
		accountId: text().notNull(),
		providerId: text().notNull(),
		userId: text()
			.notNull()
			.references(() => user.id, { onDelete: 'cascade' }),
		accessToken: text(),
		refreshToken: text(),
		idToken: text(),
		accessTokenExpiresAt: integer({ mode: 'timestamp_ms' }),
		refreshTokenExpiresAt: integer({ mode: 'timestamp_ms' }),
		scope: text(),
		password: text(),
		createdAt: createdAt(),
		updatedAt: createdAt().$onUpdate(() => new Date())
	},
	(t) => [index('account_user_idx').on(t.userId)]
);

export const verification = sqliteTable(
	'verification',
	{
		id: text().primaryKey(),
		identifier: text().notNull(),
		value: text().notNull(),
		expiresAt: integer({ mode: 'timestamp_ms' }).notNull(),
		createdAt: createdAt(),
		updatedAt: createdAt().$onUpdate(() => new Date())
	},
	(t) => [index('verification_identifier_idx').on(t.identifier)]
);

/**
 * Personal API tokens: the table of better-auth's API-key plugin (`@better-auth/api-key`, model
 * `apikey`, fields as its schema declares them). Only a hash of each token is kept; `start` is
 * its first characters for the list on /account. `referenceId` is the owner's user id.
 */
export const apikey = sqliteTable(
	'apikey',
	{
		id: text().primaryKey(),
		configId: text().default('default').notNull(),
		name: text(),
		start: text(),
		referenceId: text()
			.notNull()
			.references(() => user.id, { onDelete: 'cascade' }),
		prefix: text(),
		key: text().notNull(),
		refillInterval: integer(),
		refillAmount: integer(),
		lastRefillAt: integer({ mode: 'timestamp_ms' }),
		enabled: integer({ mode: 'boolean' }).default(true),
		rateLimitEnabled: integer({ mode: 'boolean' }).default(true),
		rateLimitTimeWindow: integer(),
		rateLimitMax: integer(),
		requestCount: integer().default(0),
		remaining: integer(),
		lastRequest: integer({ mode: 'timestamp_ms' }),
		expiresAt: integer({ mode: 'timestamp_ms' }),
		createdAt: createdAt(),
		updatedAt: createdAt().$onUpdate(() => new Date()),
		permissions: text(),
		metadata: text()
	},
	(t) => [
		uniqueIndex('apikey_key_idx').on(t.key),
		index('apikey_reference_idx').on(t.referenceId),
		index('apikey_config_idx').on(t.configId)
	]
);
