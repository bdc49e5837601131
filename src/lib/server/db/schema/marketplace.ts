import {
	boolean,
	doublePrecision,
	index,
	integer,
	jsonb,
	pgTable,
	primaryKey,
	smallint,
	text,
	timestamp,
	uniqueIndex,
	uuid,
	varchar
} from 'drizzle-orm/pg-core';
import { sql } from 'drizzle-orm';
import type { JobRequestInput } from '../../../scope/request';
import type { ScopeSheet } from '../../../scope';
import { createdAt, updatedAt } from './columns';
import { acceptedBy, bookingStatus, fitStage, jobStatus, quoteStatus } from './enums';
import { installerProfile, user } from './people';

/**
 * Besides the columns below, migration 0013 (hand-written: drizzle-kit cannot spell a PostGIS type)
 * adds generated `geography(Point, 4326)` columns with GiST indexes: `job.location` (the true
 * point; never in an answer to an installer before booking), `job.approx_location` (the cell
 * centre, what matching, distance and the map use) and `installer_profile.base`. They are read
 * only inside SQL ($lib/server/marketplace/matching), so Drizzle's whole-row selects never carry them.
 */
export const job = pgTable(
	'job',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		ownerId: text('owner_id')
			.notNull()
			.references(() => user.id, { onDelete: 'cascade' }),
		status: jobStatus('status').notNull().default('drafting'),
		/** The step the owner reached in the request form, and what they typed so far. */
		draftStep: text('draft_step').notNull().default('vehicle'),
		draft: jsonb('draft').$type<Record<string, unknown>>().notNull().default({}),
		/** The validated request and its scope sheet, set on submission. */
		request: jsonb('request').$type<JobRequestInput>(),
		scope: jsonb('scope').$type<ScopeSheet>(),
		title: text('title'),
		bodyStyle: text('body_style'),
		cameras: text('cameras'),
		power: text('power'),
		locationMode: text('location_mode', { enum: ['mobile', 'workshop'] }),
		suburb: text('suburb'),
		postcode: varchar('postcode', { length: 4 }),
		latitude: doublePrecision('latitude'),
		longitude: doublePrecision('longitude'),
		/**
		 * The centre of the job's 1 km privacy cell (snapToGrid in $lib/geo, mirrored by the SQL
		 * functions of migration 0011): what installers are offered by, shown and measured to.
		 */
		cellLatitude: doublePrecision('cell_latitude').generatedAlwaysAs(
			sql`tapline_cell_lat(latitude)`
		),
		cellLongitude: doublePrecision('cell_longitude').generatedAlwaysAs(
			sql`tapline_cell_lng(latitude, longitude)`
		),
		/** Skills the job needs (requiredSkills in $lib/marketplace/matching), written at posting. */
		requiredSkills: text('required_skills').array(),
		/** The board's one-line scope summary, written at posting (the board never reads `scope`). */
		scopeSummary: text('scope_summary'),
		/** Live quotes, kept by a trigger on quote (migration 0013) in the quote's own transaction. */
		liveQuotes: integer('live_quotes').notNull().default(0),
		/** Owner's street address for a mobile fit; shown to an installer only after booking. */
		addressLine: text('address_line'),
		timeZone: text('time_zone').notNull().default('Australia/Adelaide'),
		preferredWindows: jsonb('preferred_windows')
			.$type<Array<{ date: string; window: 'morning' | 'midday' | 'afternoon' }>>()
			.notNull()
			.default([]),
		/** The earliest preferred date, 'YYYY-MM-DD' ('9999-12-31' when none): the board's date sort. */
		earliestDate: text('earliest_date')
			.notNull()
			.generatedAlwaysAs(sql`tapline_earliest_date(preferred_windows)`),
		/** The owner's note to installers (parking, access, anything to know); masked before booking. */
		ownerNote: text('owner_note'),
		priceLowCents: integer('price_low_cents'),
		priceHighCents: integer('price_high_cents'),
		withdrawnReason: text('withdrawn_reason'),
		/** When the owner was last e-mailed about new quotes (quotes after this are in the next batch). */
		quotesNotifiedAt: timestamp('quotes_notified_at', { withTimezone: true }),
		withdrawnAt: timestamp('withdrawn_at', { withTimezone: true }),
		submittedAt: timestamp('submitted_at', { withTimezone: true }),
		createdAt: createdAt(),
		updatedAt: updatedAt()
	},
	(t) => [
		index('job_owner_idx').on(t.ownerId, t.createdAt),
		index('job_status_lat_lng_idx').on(t.status, t.latitude, t.longitude),
		// The board's keyset paging on (sort key, id), open jobs only; the geography columns and
		// their GiST indexes are in the hand-written migration 0013 (see the note above `job`).
		index('job_open_submitted_idx')
			.on(t.submittedAt, t.id)
			.where(sql`status = 'collecting_quotes'`),
		index('job_open_earliest_date_idx')
			.on(t.earliestDate, t.id)
			.where(sql`status = 'collecting_quotes'`),
		index('job_open_live_quotes_idx')
			.on(t.liveQuotes, t.id)
			.where(sql`status = 'collecting_quotes'`)
	]
);

export const jobPhoto = pgTable(
	'job_photo',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		jobId: uuid('job_id')
			.notNull()
			.references(() => job.id, { onDelete: 'cascade' }),
		kind: text('kind', { enum: ['fuse-box', 'windscreen', 'rear-window'] }).notNull(),
		objectKey: text('object_key').notNull(),
		thumbKey: text('thumb_key').notNull(),
		width: integer('width').notNull(),
		height: integer('height').notNull(),
		bytes: integer('bytes').notNull(),
		createdAt: createdAt()
	},
	(t) => [uniqueIndex('job_photo_job_kind_idx').on(t.jobId, t.kind)]
);

/** One priced line of a quote, in GST-inclusive integer cents. */
export interface QuoteLine {
	kind: 'labour' | 'part' | 'travel' | 'camera';
	label: string;
	quantity: number;
	unitCents: number;
	totalCents: number;
}

/** A proposed time for the fit, as UTC instants (ISO strings). */
export interface QuoteSlot {
	start: string;
	end: string;
}

/**
 * An installer's quote on a job: one per installer per job, revised in place until the owner books
 * (every revision is kept in quote_revision). Amounts are GST-inclusive integer cents.
 */
export const quote = pgTable(
	'quote',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		jobId: uuid('job_id')
			.notNull()
			.references(() => job.id, { onDelete: 'cascade' }),
		installerId: text('installer_id')
			.notNull()
			.references(() => installerProfile.userId),
		status: quoteStatus('status').notNull().default('live'),
		revision: integer('revision').notNull().default(1),
		lines: jsonb('lines').$type<QuoteLine[]>().notNull().default([]),
		labourCents: integer('labour_cents').notNull().default(0),
		partsCents: integer('parts_cents').notNull().default(0),
		travelCents: integer('travel_cents').notNull().default(0),
		totalCents: integer('total_cents').notNull(),
		gstCents: integer('gst_cents').notNull().default(0),
		/**
		 * Whether the installer was registered for GST when this revision was priced (no GST line
		 * otherwise). Quotes written before the column existed were all priced with GST.
		 */
		gstRegistered: boolean('gst_registered').notNull().default(true),
		warrantyMonths: smallint('warranty_months').notNull().default(12),
		cameraSupplied: boolean('camera_supplied').notNull().default(false),
		slots: jsonb('slots').$type<QuoteSlot[]>().notNull().default([]),
		message: text('message'),
		distanceKm: doublePrecision('distance_km'),
		expiresAt: timestamp('expires_at', { withTimezone: true }),
		createdAt: createdAt(),
		updatedAt: updatedAt()
	},
	(t) => [
		uniqueIndex('quote_job_installer_idx').on(t.jobId, t.installerId),
		index('quote_installer_idx').on(t.installerId)
	]
);

/** Every revision of every quote, as it was sent; never updated. */
export const quoteRevision = pgTable(
	'quote_revision',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		quoteId: uuid('quote_id')
			.notNull()
			.references(() => quote.id, { onDelete: 'cascade' }),
		revision: integer('revision').notNull(),
		snapshot: jsonb('snapshot').$type<Record<string, unknown>>().notNull(),
		createdAt: createdAt()
	},
	(t) => [uniqueIndex('quote_revision_quote_rev_idx').on(t.quoteId, t.revision)]
);

/**
 * The owner's choice of one quote and one slot. One booking per job and per quote (unique), and an
 * installer's live bookings may not overlap in time (exclusion constraint in migration 0002).
 */
export const booking = pgTable(
	'booking',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		jobId: uuid('job_id')
			.notNull()
			.references(() => job.id),
		quoteId: uuid('quote_id')
			.notNull()
			.references(() => quote.id),
		installerId: text('installer_id')
			.notNull()
			.references(() => installerProfile.userId),
		ownerId: text('owner_id')
			.notNull()
			.references(() => user.id),
		slotStart: timestamp('slot_start', { withTimezone: true }).notNull(),
		slotEnd: timestamp('slot_end', { withTimezone: true }).notNull(),
		status: bookingStatus('status').notNull().default('awaiting_payment'),
		/** A provisional booking holds the slot until then; the payment step confirms it. */
		holdExpiresAt: timestamp('hold_expires_at', { withTimezone: true }).notNull(),
		totalCents: integer('total_cents').notNull(),
		/** The work's stage; meaningful once the booking is paid (status 'confirmed'). */
		stage: fitStage('stage').notNull().default('to_fit'),
		/** When the latest fit report was filed. */
		reportedAt: timestamp('reported_at', { withTimezone: true }),
		/** The owner may confirm or raise a problem until then; after it the work confirms itself. */
		confirmBy: timestamp('confirm_by', { withTimezone: true }),
		acceptedAt: timestamp('accepted_at', { withTimezone: true }),
		acceptedBy: acceptedBy('accepted_by'),
		/** When the day-before reminders went out for the current slot; cleared by a new time. */
		reminderSentAt: timestamp('reminder_sent_at', { withTimezone: true }),
		/** The calendar file's SEQUENCE: 0 for the booked slot, one more for each new time. */
		calendarSequence: integer('calendar_sequence').notNull().default(0),
		createdAt: createdAt()
	},
	(t) => [
		index('booking_confirm_by_idx')
			.on(t.confirmBy)
			.where(sql`stage = 'reported'`),
		uniqueIndex('booking_live_job_idx')
			.on(t.jobId)
			.where(sql`status in ('awaiting_payment', 'confirmed')`),
		index('booking_installer_idx').on(t.installerId, t.slotStart),
		// The reminder schedule's look-up: paid bookings whose reminder has not gone out.
		index('booking_reminder_due_idx')
			.on(t.slotStart)
			.where(sql`status = 'confirmed' and reminder_sent_at is null`)
	]
);

/**
 * Questions and answers about a job between its owner and one quoting installer. Contact details
 * are masked before storage while the job is unbooked (see $lib/masking).
 */
export const jobMessage = pgTable(
	'job_message',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		jobId: uuid('job_id')
			.notNull()
			.references(() => job.id, { onDelete: 'cascade' }),
		installerId: text('installer_id')
			.notNull()
			.references(() => installerProfile.userId),
		authorId: text('author_id')
			.notNull()
			.references(() => user.id),
		body: text('body').notNull(),
		masked: text('masked').array().notNull().default([]),
		createdAt: createdAt()
	},
	(t) => [
		index('job_message_thread_idx').on(t.jobId, t.installerId, t.createdAt),
		// An installer's threads, most recently active first (the day view and the messages page).
		index('job_message_installer_idx').on(t.installerId, t.createdAt)
	]
);

/** Which jobs an installer has been told about, so digests never repeat a job. */
export const jobNotice = pgTable(
	'job_notice',
	{
		installerId: text('installer_id')
			.notNull()
			.references(() => installerProfile.userId, { onDelete: 'cascade' }),
		jobId: uuid('job_id')
			.notNull()
			.references(() => job.id, { onDelete: 'cascade' }),
		noticedAt: createdAt()
	},
	(t) => [primaryKey({ columns: [t.installerId, t.jobId] })]
);
