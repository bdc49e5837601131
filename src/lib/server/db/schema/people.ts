import {
	bigint,
	boolean,
	date,
	doublePrecision,
	index,
	integer,
	jsonb,
	pgTable,
	primaryKey,
	smallint,
	text,
	timestamp,
	uuid,
	varchar
} from 'drizzle-orm/pg-core';
import { createdAt, updatedAt } from './columns';
import { userRole, vettingStatus } from './enums';

export const user = pgTable('user', {
	id: text('id').primaryKey(),
	email: text('email').notNull().unique(),
	passwordHash: text('password_hash').notNull(),
	role: userRole('role').notNull(),
	displayName: text('display_name').notNull(),
	emailVerifiedAt: timestamp('email_verified_at', { withTimezone: true }),
	/**
	 * When the holder closed the account. The row stays (bookings, quotes, messages and the
	 * append-only vetting trail point at it) with its personal fields overwritten; see
	 * account-closing.ts.
	 */
	deletedAt: timestamp('deleted_at', { withTimezone: true }),
	/** Set by an admin: a suspended account cannot sign in, and its sessions were ended. */
	suspendedAt: timestamp('suspended_at', { withTimezone: true }),
	suspendedReason: text('suspended_reason'),
	createdAt: createdAt()
});

export const session = pgTable(
	'session',
	{
		id: text('id').primaryKey(),
		userId: text('user_id')
			.notNull()
			.references(() => user.id, { onDelete: 'cascade' }),
		expiresAt: timestamp('expires_at', { withTimezone: true, mode: 'date' }).notNull(),
		/** Filled by the database (Lucia writes only id, user and expiry); shown on the account page. */
		createdAt: createdAt()
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
		purpose: text('purpose', {
			enum: ['verify-email', 'reset-password', 'change-email']
		}).notNull(),
		/** For 'change-email': the address that becomes the account's once this link is used. */
		newEmail: text('new_email'),
		expiresAt: timestamp('expires_at', { withTimezone: true }).notNull(),
		usedAt: timestamp('used_at', { withTimezone: true }),
		createdAt: createdAt()
	},
	(t) => [index('email_token_user_idx').on(t.userId, t.purpose)]
);

export const installerProfile = pgTable(
	'installer_profile',
	{
		userId: text('user_id')
			.primaryKey()
			.references(() => user.id, { onDelete: 'cascade' }),
		businessName: text('business_name').notNull(),
		contactName: text('contact_name'),
		phone: text('phone'),
		abn: varchar('abn', { length: 11 }),
		/** Registered for GST: only then do the installer's quotes carry GST (see $lib/money/gst). */
		gstRegistered: boolean('gst_registered').notNull().default(false),
		/** The installer's connected account with the payment provider, made at payouts set-up. */
		payoutAccountId: text('payout_account_id').unique(),
		/** The provider says the account can receive payouts; quoting needs it. */
		payoutsEnabled: boolean('payouts_enabled').notNull().default(false),
		yearsInTrade: smallint('years_in_trade'),
		/** What they fit: see INSTALLER_SKILLS in $lib/people/vetting. */
		skills: text('skills').array().notNull().default([]),
		suburb: text('suburb').notNull(),
		postcode: varchar('postcode', { length: 4 }).notNull(),
		/** Base point of the service circle (never shown publicly beyond the suburb). */
		latitude: doublePrecision('latitude').notNull(),
		longitude: doublePrecision('longitude').notNull(),
		serviceRadiusKm: integer('service_radius_km').notNull().default(25),
		offersMobile: boolean('offers_mobile').notNull().default(true),
		offersWorkshop: boolean('offers_workshop').notNull().default(false),
		workshopAddress: text('workshop_address'),
		/** Mobile travel fee beyond the free radius, integer cents per km (GST-inclusive). */
		travelFeeCentsPerKm: integer('travel_fee_cents_per_km').notNull().default(0),
		freeRadiusKm: integer('free_radius_km').notNull().default(0),
		timeZone: text('time_zone').notNull().default('Australia/Adelaide'),
		insurer: text('insurer'),
		policyNumber: text('policy_number'),
		coverCents: bigint('cover_cents', { mode: 'number' }),
		insuranceExpiresOn: date('insurance_expires_on'),
		/** Set while quoting is paused (e.g. insurance lapsed); cleared when an admin approves anew. */
		pausedReason: text('paused_reason'),
		vettingStatus: vettingStatus('vetting_status').notNull().default('applied'),
		submittedAt: timestamp('submitted_at', { withTimezone: true }),
		createdAt: createdAt(),
		updatedAt: updatedAt()
	},
	(t) => [
		index('installer_profile_lat_lng_idx').on(t.latitude, t.longitude),
		index('installer_profile_status_idx').on(t.vettingStatus)
	]
);

/** Uploaded files of an installer: insurance certificate, photo ID, qualifications, gallery photos. */
export const installerDocument = pgTable(
	'installer_document',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		installerId: text('installer_id')
			.notNull()
			.references(() => installerProfile.userId, { onDelete: 'cascade' }),
		kind: text('kind', { enum: ['insurance', 'photo-id', 'qualification', 'gallery'] }).notNull(),
		objectKey: text('object_key').notNull(),
		thumbKey: text('thumb_key'),
		contentType: text('content_type').notNull(),
		bytes: integer('bytes').notNull(),
		originalName: text('original_name').notNull(),
		createdAt: createdAt()
	},
	(t) => [index('installer_document_installer_idx').on(t.installerId)]
);

/**
 * Every vetting decision, append-only: a database trigger (migration 0001) refuses UPDATE and
 * DELETE on this table, so the trail cannot be edited, even by the app.
 */
export const vettingEvent = pgTable(
	'vetting_event',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		installerId: text('installer_id')
			.notNull()
			.references(() => installerProfile.userId),
		actorId: text('actor_id').references(() => user.id),
		action: text('action').notNull(),
		fromStatus: vettingStatus('from_status'),
		toStatus: vettingStatus('to_status'),
		reason: text('reason'),
		checklist: jsonb('checklist').$type<Record<string, boolean>>(),
		createdAt: createdAt()
	},
	(t) => [index('vetting_event_installer_idx').on(t.installerId, t.createdAt)]
);

/** Weekly working hours, in the installer's time zone; minutes from local midnight. */
export const installerHours = pgTable(
	'installer_hours',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		installerId: text('installer_id')
			.notNull()
			.references(() => installerProfile.userId, { onDelete: 'cascade' }),
		weekday: smallint('weekday').notNull(),
		startMinute: smallint('start_minute').notNull(),
		endMinute: smallint('end_minute').notNull()
	},
	(t) => [index('installer_hours_installer_idx').on(t.installerId)]
);

export const installerBlockedDate = pgTable(
	'installer_blocked_date',
	{
		installerId: text('installer_id')
			.notNull()
			.references(() => installerProfile.userId, { onDelete: 'cascade' }),
		day: date('day').notNull(),
		note: text('note')
	},
	(t) => [primaryKey({ columns: [t.installerId, t.day] })]
);

/** Which insurance-expiry reminders went out, so the daily job never sends one twice. */
export const insuranceReminder = pgTable(
	'insurance_reminder',
	{
		installerId: text('installer_id')
			.notNull()
			.references(() => installerProfile.userId, { onDelete: 'cascade' }),
		expiresOn: date('expires_on').notNull(),
		daysBefore: smallint('days_before').notNull(),
		sentAt: createdAt()
	},
	(t) => [primaryKey({ columns: [t.installerId, t.expiresOn, t.daysBefore] })]
);
