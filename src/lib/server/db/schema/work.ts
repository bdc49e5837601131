import {
	check,
	doublePrecision,
	index,
	integer,
	jsonb,
	pgTable,
	text,
	timestamp,
	uniqueIndex,
	uuid
} from 'drizzle-orm/pg-core';
import { sql } from 'drizzle-orm';
import { createdAt } from './columns';
import {
	disputeEventKind,
	disputeOutcome,
	disputeStatus,
	proposalStatus,
	reviewSide
} from './enums';
import { installerProfile, user } from './people';
import { booking } from './marketplace';

/**
 * A new time for a paid booking, proposed by one side and answered by the other (see
 * rescheduling.ts). At most one open proposal per booking (partial unique index).
 */
export const rescheduleProposal = pgTable(
	'reschedule_proposal',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		bookingId: uuid('booking_id')
			.notNull()
			.references(() => booking.id),
		proposedBy: text('proposed_by')
			.notNull()
			.references(() => user.id),
		proposerSide: text('proposer_side', { enum: ['owner', 'installer'] }).notNull(),
		slotStart: timestamp('slot_start', { withTimezone: true }).notNull(),
		slotEnd: timestamp('slot_end', { withTimezone: true }).notNull(),
		note: text('note'),
		status: proposalStatus('status').notNull().default('open'),
		answeredAt: timestamp('answered_at', { withTimezone: true }),
		createdAt: createdAt()
	},
	(t) => [
		uniqueIndex('reschedule_proposal_open_idx')
			.on(t.bookingId)
			.where(sql`status = 'open'`),
		index('reschedule_proposal_booking_idx').on(t.bookingId, t.createdAt)
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
 * One side's review of the other after the work was accepted: stars per aspect ($lib/work/reviews
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

/**
 * A problem the owner raised about reported work, within the confirmation window. At most one
 * open per booking (partial unique index); settled ones stay for the record. The held funds stay
 * held while it is open (the auto-confirm schedule only confirms stage 'reported'). The settlement
 * columns say what the admin decided and what moved: refund to the owner, payout to the installer
 * and Tapline's fee (with its GST) on the released part.
 */
export const dispute = pgTable(
	'dispute',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		bookingId: uuid('booking_id')
			.notNull()
			.references(() => booking.id),
		openedBy: text('opened_by')
			.notNull()
			.references(() => user.id),
		/** One of DISPUTE_REASONS in $lib/work/disputes. */
		reason: text('reason').notNull(),
		description: text('description').notNull(),
		status: disputeStatus('status').notNull().default('open'),
		/** What the booking held when the dispute was opened, in cents. */
		heldCents: integer('held_cents').notNull(),
		openedAt: timestamp('opened_at', { withTimezone: true }).notNull().defaultNow(),
		outcome: disputeOutcome('outcome'),
		refundCents: integer('refund_cents'),
		payoutCents: integer('payout_cents'),
		feeCents: integer('fee_cents'),
		gstOnFeeCents: integer('gst_on_fee_cents'),
		returnVisitStart: timestamp('return_visit_start', { withTimezone: true }),
		returnVisitEnd: timestamp('return_visit_end', { withTimezone: true }),
		settledBy: text('settled_by').references(() => user.id),
		settledAt: timestamp('settled_at', { withTimezone: true }),
		/** The admin's explanation, e-mailed to both sides. */
		settlementNote: text('settlement_note')
	},
	(t) => [
		uniqueIndex('dispute_open_booking_idx')
			.on(t.bookingId)
			.where(sql`status = 'open'`),
		index('dispute_booking_idx').on(t.bookingId, t.openedAt),
		index('dispute_status_opened_idx').on(t.status, t.openedAt),
		index('dispute_settled_idx').on(t.settledAt)
	]
);

export const disputeEvent = pgTable(
	'dispute_event',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		disputeId: uuid('dispute_id')
			.notNull()
			.references(() => dispute.id),
		kind: disputeEventKind('kind').notNull(),
		authorId: text('author_id')
			.notNull()
			.references(() => user.id),
		body: text('body').notNull(),
		createdAt: createdAt()
	},
	(t) => [index('dispute_event_dispute_idx').on(t.disputeId, t.createdAt)]
);

/** Photos attached to a dispute's timeline line (same upload pipeline as job photos). */
export const disputePhoto = pgTable(
	'dispute_photo',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		disputeId: uuid('dispute_id')
			.notNull()
			.references(() => dispute.id),
		eventId: uuid('event_id')
			.notNull()
			.references(() => disputeEvent.id),
		uploadedBy: text('uploaded_by')
			.notNull()
			.references(() => user.id),
		objectKey: text('object_key').notNull(),
		thumbKey: text('thumb_key').notNull(),
		bytes: integer('bytes').notNull(),
		createdAt: createdAt()
	},
	(t) => [index('dispute_photo_event_idx').on(t.eventId)]
);
