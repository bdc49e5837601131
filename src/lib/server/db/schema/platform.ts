import {
	bigint,
	index,
	integer,
	jsonb,
	pgTable,
	text,
	timestamp,
	uuid,
	varchar
} from 'drizzle-orm/pg-core';
import { createdAt } from './columns';
import { user } from './people';

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

/**
 * The market's settings an admin may change (Tapline's fee and its minimum, the late-cancellation
 * fee, the minimum public liability cover), one row per setting that differs from its default;
 * whole numbers (cents or basis points). Changes are audited in admin_audit.
 */
export const marketSetting = pgTable('market_setting', {
	key: text('key').primaryKey(),
	value: integer('value').notNull(),
	updatedBy: text('updated_by').references(() => user.id),
	updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow()
});

/**
 * Every admin action on an account (suspend, reinstate, force a password reset): who, when, what,
 * and the account's standing before and after. Append-only: a trigger (migration 0006) refuses
 * UPDATE, DELETE and TRUNCATE, as for vetting_event.
 */
export const adminAudit = pgTable(
	'admin_audit',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		actorId: text('actor_id')
			.notNull()
			.references(() => user.id),
		action: text('action').notNull(),
		targetUserId: text('target_user_id').references(() => user.id),
		before: jsonb('before').$type<Record<string, unknown>>(),
		after: jsonb('after').$type<Record<string, unknown>>(),
		reason: text('reason'),
		createdAt: createdAt()
	},
	(t) => [
		index('admin_audit_target_idx').on(t.targetUserId, t.createdAt),
		index('admin_audit_created_idx').on(t.createdAt)
	]
);

/** Table layout expected by rate-limiter-flexible's RateLimiterPostgres (created here, not by it). */
export const rateLimit = pgTable('rate_limit', {
	key: varchar('key', { length: 255 }).primaryKey(),
	points: integer('points').notNull().default(0),
	expire: bigint('expire', { mode: 'number' })
});

/** In-app notices: what happened to someone's booking or payment, newest first on their home page. */
export const notice = pgTable(
	'notice',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		userId: text('user_id')
			.notNull()
			.references(() => user.id, { onDelete: 'cascade' }),
		text: text('text').notNull(),
		link: text('link'),
		createdAt: createdAt()
	},
	(t) => [index('notice_user_idx').on(t.userId, t.createdAt)]
);
