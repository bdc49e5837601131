import {
	bigint,
	boolean,
	doublePrecision,
	index,
	integer,
	pgEnum,
	pgTable,
	text,
	timestamp,
	uuid,
	varchar
} from 'drizzle-orm/pg-core';

/** Who a person is on Tapline; one role per account. */
export const userRole = pgEnum('user_role', ['owner', 'installer', 'admin']);

/** Where an installer's application stands with the admins. */
export const vettingStatus = pgEnum('vetting_status', [
	'applied',
	'waiting_on_installer',
	'approved',
	'rejected',
	'suspended'
]);

const createdAt = () => timestamp('created_at', { withTimezone: true }).notNull().defaultNow();

export const user = pgTable('user', {
	id: text('id').primaryKey(),
	email: text('email').notNull().unique(),
	passwordHash: text('password_hash').notNull(),
	role: userRole('role').notNull(),
	displayName: text('display_name').notNull(),
	emailVerifiedAt: timestamp('email_verified_at', { withTimezone: true }),
	createdAt: createdAt()
});

export const session = pgTable(
	'session',
	{
		id: text('id').primaryKey(),
		userId: text('user_id')
			.notNull()
			.references(() => user.id, { onDelete: 'cascade' }),
		expiresAt: timestamp('expires_at', { withTimezone: true, mode: 'date' }).notNull()
	},
	(t) => [index('session_user_idx').on(t.userId)]
);

/** One-time links sent by e-mail; only the SHA-256 of the token is stored. */
export const emailToken = pgTable(
	'email_token',
	{
		tokenHash: text('token_hash').primaryKey(),
		userId: text('user_id')
			.notNull()
			.references(() => user.id, { onDelete: 'cascade' }),
		purpose: text('purpose', { enum: ['verify-email', 'reset-password'] }).notNull(),
		expiresAt: timestamp('expires_at', { withTimezone: true }).notNull(),
		usedAt: timestamp('used_at', { withTimezone: true }),
		createdAt: createdAt()
	},
	(t) => [index('email_token_user_idx').on(t.userId, t.purpose)]
);

/**
 * Transactional outbox: a message is written in the same transaction as the change that causes it,
 * and a background worker delivers it, so an SMTP outage loses nothing.
 */
export const emailOutbox = pgTable(
	'email_outbox',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		toAddress: text('to_address').notNull(),
		template: text('template').notNull(),
		subject: text('subject').notNull(),
		html: text('html').notNull(),
		text: text('text').notNull(),
		attempts: integer('attempts').notNull().default(0),
		lastError: text('last_error'),
		sentAt: timestamp('sent_at', { withTimezone: true }),
		createdAt: createdAt()
	},
	(t) => [index('email_outbox_unsent_idx').on(t.createdAt)]
);

export const installerProfile = pgTable(
	'installer_profile',
	{
		userId: text('user_id')
			.primaryKey()
			.references(() => user.id, { onDelete: 'cascade' }),
		businessName: text('business_name').notNull(),
		suburb: text('suburb').notNull(),
		postcode: varchar('postcode', { length: 4 }).notNull(),
		latitude: doublePrecision('latitude').notNull(),
		longitude: doublePrecision('longitude').notNull(),
		serviceRadiusKm: integer('service_radius_km').notNull().default(25),
		offersMobile: boolean('offers_mobile').notNull().default(true),
		offersWorkshop: boolean('offers_workshop').notNull().default(false),
		vettingStatus: vettingStatus('vetting_status').notNull().default('applied'),
		createdAt: createdAt()
	},
	(t) => [index('installer_profile_lat_lng_idx').on(t.latitude, t.longitude)]
);

/** Table layout expected by rate-limiter-flexible's RateLimiterPostgres (created here, not by it). */
export const rateLimit = pgTable('rate_limit', {
	key: varchar('key', { length: 255 }).primaryKey(),
	points: integer('points').notNull().default(0),
	expire: bigint('expire', { mode: 'number' })
});

export type User = typeof user.$inferSelect;
export type Role = (typeof userRole.enumValues)[number];
export type InstallerProfile = typeof installerProfile.$inferSelect;
