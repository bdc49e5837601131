import {
	bigint,
	boolean,
	check,
	date,
	doublePrecision,
	index,
	integer,
	jsonb,
	pgEnum,
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
import type { JobRequestInput } from '../../scope/request';
import type { ScopeSheet } from '../../scope';

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
const updatedAt = () => timestamp('updated_at', { withTimezone: true }).notNull().defaultNow();

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
		contactName: text('contact_name'),
		phone: text('phone'),
		abn: varchar('abn', { length: 11 }),
		/** Registered for GST: only then do the installer's quotes carry GST (see $lib/gst). */
		gstRegistered: boolean('gst_registered').notNull().default(false),
		/** The installer's connected account with the payment provider, made at payouts set-up. */
		payoutAccountId: text('payout_account_id').unique(),
		/** The provider says the account can receive payouts; quoting needs it. */
		payoutsEnabled: boolean('payouts_enabled').notNull().default(false),
		yearsInTrade: smallint('years_in_trade'),
		/** What they fit: see INSTALLER_SKILLS in $lib/vetting. */
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

/** Where an owner's job stands. Names are Tapline's own. */
export const jobStatus = pgEnum('job_status', [
	'drafting',
	'collecting_quotes',
	'booked',
	'fitted',
	'settled',
	'withdrawn'
]);

/**
 * Besides the columns below, migration 0013 (hand-written: drizzle-kit cannot spell a PostGIS type)
 * adds generated `geography(Point, 4326)` columns with GiST indexes: `job.location` (the true
 * point; never in an answer to an installer before booking), `job.approx_location` (the cell
 * centre, what matching, distance and the map use) and `installer_profile.base`. They are read
 * only inside SQL ($lib/server/matching), so Drizzle's whole-row selects never carry them.
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
		/** Skills the job needs (requiredSkills in $lib/matching), written at posting. */
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

/** Table layout expected by rate-limiter-flexible's RateLimiterPostgres (created here, not by it). */
export const rateLimit = pgTable('rate_limit', {
	key: varchar('key', { length: 255 }).primaryKey(),
	points: integer('points').notNull().default(0),
	expire: bigint('expire', { mode: 'number' })
});

/** Where a quote stands. Names are Tapline's own. */
export const quoteStatus = pgEnum('quote_status', [
	'live',
	'accepted',
	'declined',
	'withdrawn',
	'lapsed'
]);

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

/** Where a booking stands: provisional until paid into held funds. */
export const bookingStatus = pgEnum('booking_status', [
	'awaiting_payment',
	'confirmed',
	'cancelled',
	'lapsed'
]);

/**
 * Where the work of a paid booking stands (see $lib/lifecycle for the legal moves):
 * to fit → reported (fit report filed; the owner's confirmation window runs) → accepted (owner
 * confirmed, or the window closed; held funds are released) — or reported → disputed → settled.
 */
export const fitStage = pgEnum('fit_stage', [
	'to_fit',
	'reported',
	'accepted',
	'disputed',
	'settled'
]);

/** How a booking's work came to be accepted. */
export const acceptedBy = pgEnum('accepted_by', ['owner', 'window', 'settlement']);

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
		createdAt: createdAt()
	},
	(t) => [
		index('booking_confirm_by_idx')
			.on(t.confirmBy)
			.where(sql`stage = 'reported'`),
		uniqueIndex('booking_live_job_idx')
			.on(t.jobId)
			.where(sql`status in ('awaiting_payment', 'confirmed')`),
		index('booking_installer_idx').on(t.installerId, t.slotStart)
	]
);

/**
 * What the installer filed after fitting: one row per visit (a return visit after a dispute files
 * a second). `details` holds the checked items (circuits, ratings, ground, cut-off voltage,
 * parking-mode test, routing, camera placement), validated by $lib/forms/fit-report; the columns
 * beside it are the ones other features query (the fit time feeds the labour calibration).
 */
export const fitReport = pgTable(
	'fit_report',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		bookingId: uuid('booking_id')
			.notNull()
			.references(() => booking.id),
		/** 1 for the booked fit, 2 for a return visit, and so on. */
		visit: integer('visit').notNull().default(1),
		installerId: text('installer_id')
			.notNull()
			.references(() => installerProfile.userId),
		/** Minutes on the vehicle, as the installer reports them. */
		minutesTaken: integer('minutes_taken').notNull(),
		details: jsonb('details').notNull(),
		notes: text('notes'),
		filedAt: timestamp('filed_at', { withTimezone: true }).notNull().defaultNow()
	},
	(t) => [
		uniqueIndex('fit_report_booking_visit_idx').on(t.bookingId, t.visit),
		index('fit_report_installer_idx').on(t.installerId, t.filedAt)
	]
);

/**
 * Photos filed with a fit report (the install record shows them). Served only to the booking's
 * owner and installer and to admins, through /media/fit-report-photos.
 */
export const fitReportPhoto = pgTable(
	'fit_report_photo',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		fitReportId: uuid('fit_report_id')
			.notNull()
			.references(() => fitReport.id, { onDelete: 'cascade' }),
		/** The order the installer chose them in. */
		position: integer('position').notNull(),
		objectKey: text('object_key').notNull(),
		thumbKey: text('thumb_key').notNull(),
		width: integer('width').notNull(),
		height: integer('height').notNull(),
		bytes: integer('bytes').notNull(),
		createdAt: createdAt()
	},
	(t) => [uniqueIndex('fit_report_photo_report_position_idx').on(t.fitReportId, t.position)]
);

/**
 * What an installer learned fitting one vehicle, published after a fit report for other vetted
 * installers: one note per booking. Vehicle facts only (make, model, year range, body style) and
 * trade know-how; never the owner, plate or address, and free text is refused when it carries
 * contact details ($lib/masking). `vehicleKey` is the normalised make and model
 * (vehicleKey in $lib/fit-notes) that search compares by trigram similarity; its GIN index and the
 * pg_trgm extension are in the hand-written migration fit-note-search.
 */
export const fitNote = pgTable(
	'fit_note',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		bookingId: uuid('booking_id')
			.notNull()
			.unique()
			.references(() => booking.id),
		authorId: text('author_id')
			.notNull()
			.references(() => installerProfile.userId),
		make: text('make').notNull(),
		model: text('model').notNull(),
		vehicleKey: text('vehicle_key').notNull(),
		yearFrom: smallint('year_from').notNull(),
		yearTo: smallint('year_to').notNull(),
		bodyStyle: text('body_style').notNull(),
		fuseBoxLocation: text('fuse_box_location').notNull(),
		fuseBoxAccess: text('fuse_box_access').notNull(),
		switchedFuse: text('switched_fuse').notNull(),
		switchedRatingAmps: smallint('switched_rating_amps').notNull(),
		permanentFuse: text('permanent_fuse'),
		permanentRatingAmps: smallint('permanent_rating_amps'),
		fuseFamily: text('fuse_family').notNull(),
		groundPoints: text('ground_points').notNull(),
		trimRemoval: text('trim_removal').notNull(),
		grommetRoute: text('grommet_route'),
		pitfalls: text('pitfalls'),
		/** From the fit report the note was published after. */
		minutesTaken: integer('minutes_taken').notNull(),
		createdAt: createdAt()
	},
	(t) => [
		index('fit_note_body_year_idx').on(t.bodyStyle, t.yearFrom, t.yearTo),
		index('fit_note_created_idx').on(t.createdAt, t.id)
	]
);

/** Photos on a fit note (re-encoded by the upload pipeline: no EXIF, no GPS). */
export const fitNotePhoto = pgTable(
	'fit_note_photo',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		noteId: uuid('note_id')
			.notNull()
			.references(() => fitNote.id, { onDelete: 'cascade' }),
		objectKey: text('object_key').notNull(),
		thumbKey: text('thumb_key').notNull(),
		width: integer('width').notNull(),
		height: integer('height').notNull(),
		bytes: integer('bytes').notNull(),
		createdAt: createdAt()
	},
	(t) => [index('fit_note_photo_note_idx').on(t.noteId)]
);

/** Another vetted installer's verdict on a note from their own fit: one per installer per note. */
export const fitNoteMark = pgTable(
	'fit_note_mark',
	{
		noteId: uuid('note_id')
			.notNull()
			.references(() => fitNote.id, { onDelete: 'cascade' }),
		installerId: text('installer_id')
			.notNull()
			.references(() => installerProfile.userId),
		verdict: text('verdict', { enum: ['confirmed', 'wrong'] }).notNull(),
		comment: text('comment').notNull(),
		createdAt: createdAt()
	},
	(t) => [primaryKey({ columns: [t.noteId, t.installerId] })]
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

/**
 * Paying a booking into held funds: one row per booking, from the first checkout. The ledger,
 * not this row, says how much is held; this row keeps the provider's ids and what happened.
 */
export const payment = pgTable('payment', {
	bookingId: uuid('booking_id')
		.primaryKey()
		.references(() => booking.id),
	checkoutSessionId: text('checkout_session_id').unique(),
	checkoutUrl: text('checkout_url'),
	paymentIntentId: text('payment_intent_id').unique(),
	chargeId: text('charge_id').unique(),
	paidAt: timestamp('paid_at', { withTimezone: true }),
	/** Why the last attempt failed, in the provider's words for the owner; null after success. */
	lastProblem: text('last_problem'),
	/** Set when the money arrived after the hold lapsed and the slot was gone: refunded in full. */
	refundedAfterLapseAt: timestamp('refunded_after_lapse_at', { withTimezone: true }),
	/** Release was asked for (by completion or an admin); a failed call is retried by the schedule. */
	releaseRequestedAt: timestamp('release_requested_at', { withTimezone: true }),
	releasedAt: timestamp('released_at', { withTimezone: true }),
	transferId: text('transfer_id').unique(),
	feeCents: integer('fee_cents'),
	gstOnFeeCents: integer('gst_on_fee_cents'),
	payoutCents: integer('payout_cents'),
	lastReleaseError: text('last_release_error'),
	createdAt: createdAt()
});

/** Provider events already processed; the primary key makes each event id count once. */
export const paymentEvent = pgTable(
	'payment_event',
	{
		eventId: text('event_id').primaryKey(),
		type: text('type').notNull(),
		/** The booking the event is about (its object's metadata), when that booking exists. */
		bookingId: uuid('booking_id').references(() => booking.id),
		processedAt: createdAt()
	},
	(t) => [index('payment_event_booking_idx').on(t.bookingId, t.processedAt)]
);

/** Ledger accounts (debits positive, credits negative). */
export const ledgerAccount = pgEnum('ledger_account', [
	/** Asset: money the platform holds at the payment provider. */
	'platform_cash',
	/** Liability: an owner's payment held for their booking. */
	'owner_funds_held',
	/** Liability: what Tapline owes an installer until the transfer is made. */
	'installer_payable',
	/** Revenue: Tapline's fee, GST excluded. */
	'fee_revenue',
	/** Liability: GST on Tapline's fee, owed to the Australian Taxation Office. */
	'gst_payable'
]);

/** What a ledger transaction records. */
export const ledgerKind = pgEnum('ledger_kind', [
	'payment',
	'release',
	'refund',
	'late_fee',
	'reversal'
]);

/**
 * One movement of money: two or more entries that sum to zero (checked at commit by a deferred
 * trigger, the ledger-rules migration). Append-only: a mistake is put right by a 'reversal', never an update.
 */
export const ledgerTransaction = pgTable(
	'ledger_transaction',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		kind: ledgerKind('kind').notNull(),
		bookingId: uuid('booking_id').references(() => booking.id),
		/** The provider's object behind it (charge, transfer, refund); at most one per kind. */
		reference: text('reference').notNull(),
		reverses: uuid('reverses'),
		memo: text('memo').notNull(),
		createdAt: createdAt()
	},
	(t) => [
		uniqueIndex('ledger_transaction_kind_reference_idx').on(t.kind, t.reference),
		index('ledger_transaction_booking_idx').on(t.bookingId)
	]
);

export const ledgerEntry = pgTable(
	'ledger_entry',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		transactionId: uuid('transaction_id')
			.notNull()
			.references(() => ledgerTransaction.id),
		account: ledgerAccount('account').notNull(),
		bookingId: uuid('booking_id').references(() => booking.id),
		/** Integer cents; debit positive, credit negative. */
		amountCents: integer('amount_cents').notNull(),
		createdAt: createdAt()
	},
	(t) => [
		index('ledger_entry_transaction_idx').on(t.transactionId),
		index('ledger_entry_booking_account_idx').on(t.bookingId, t.account)
	]
);

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

/** Which side of a booking wrote a review ($lib/reviews). */
export const reviewSide = pgEnum('review_side', ['owner', 'installer']);

/**
 * One side's review of the other after the work was accepted: stars per aspect ($lib/reviews
 * names them), their mean as `overall_stars` (what ratings add up), a few words, and the
 * installer's one public reply to an owner's review. `visible_from` is when it shows to the other
 * side and the public: the window's close when written, brought forward to the second review's
 * time when both sides review (written under the booking's row lock). One per side per booking.
 */
export const review = pgTable(
	'review',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		bookingId: uuid('booking_id')
			.notNull()
			.references(() => booking.id),
		side: reviewSide('side').notNull(),
		authorId: text('author_id')
			.notNull()
			.references(() => user.id),
		subjectId: text('subject_id')
			.notNull()
			.references(() => user.id),
		aspects: jsonb('aspects').$type<Record<string, number>>().notNull(),
		overallStars: doublePrecision('overall_stars').notNull(),
		text: text('text').notNull(),
		visibleFrom: timestamp('visible_from', { withTimezone: true }).notNull(),
		reply: text('reply'),
		repliedAt: timestamp('replied_at', { withTimezone: true }),
		createdAt: createdAt()
	},
	(t) => [
		uniqueIndex('review_booking_side_idx').on(t.bookingId, t.side),
		// An installer's public reviews, newest first, and the ratings summed per installer.
		index('review_subject_idx').on(t.subjectId, t.side, t.createdAt),
		check('review_overall_stars_range', sql`${t.overallStars} between 1 and 5`)
	]
);

export type User = typeof user.$inferSelect;
export type Role = (typeof userRole.enumValues)[number];
export type InstallerProfile = typeof installerProfile.$inferSelect;
export type Job = typeof job.$inferSelect;
export type Quote = typeof quote.$inferSelect;
export type Booking = typeof booking.$inferSelect;
export type FitNote = typeof fitNote.$inferSelect;
export type FitStage = (typeof fitStage.enumValues)[number];
export type Review = typeof review.$inferSelect;
export type LedgerTransaction = typeof ledgerTransaction.$inferSelect;
export type JobStatus = (typeof jobStatus.enumValues)[number];
export type VettingStatus = (typeof vettingStatus.enumValues)[number];
