import { pgEnum } from 'drizzle-orm/pg-core';
import {
	USER_ROLE_VALUES,
	VETTING_STATUS_VALUES,
	JOB_STATUS_VALUES,
	QUOTE_STATUS_VALUES,
	BOOKING_STATUS_VALUES,
	FIT_STAGE_VALUES,
	ACCEPTED_BY_VALUES,
	PROPOSAL_STATUS_VALUES,
	LEDGER_ACCOUNT_VALUES,
	LEDGER_KIND_VALUES,
	REVIEW_SIDE_VALUES,
	DISPUTE_STATUS_VALUES,
	DISPUTE_OUTCOME_VALUES,
	DISPUTE_EVENT_KIND_VALUES
} from '../../../statuses';

/** Who a person is on Tapline; one role per account. */
export const userRole = pgEnum('user_role', USER_ROLE_VALUES);

/** Where an installer's application stands with the admins. */
export const vettingStatus = pgEnum('vetting_status', VETTING_STATUS_VALUES);

/** Where an owner's job stands. Names are Tapline's own. */
export const jobStatus = pgEnum('job_status', JOB_STATUS_VALUES);

/** Where a quote stands. Names are Tapline's own. */
export const quoteStatus = pgEnum('quote_status', QUOTE_STATUS_VALUES);

/** Where a booking stands: provisional until paid into held funds. */
export const bookingStatus = pgEnum('booking_status', BOOKING_STATUS_VALUES);

/**
 * Where the work of a paid booking stands (see $lib/work/lifecycle for the legal moves):
 * to fit → reported (fit report filed; the owner's confirmation window runs) → accepted (owner
 * confirmed, or the window closed; held funds are released) — or reported → disputed → settled.
 */
export const fitStage = pgEnum('fit_stage', FIT_STAGE_VALUES);

/** How a booking's work came to be accepted. */
export const acceptedBy = pgEnum('accepted_by', ACCEPTED_BY_VALUES);

/** Where a proposal of a new time stands. */
export const proposalStatus = pgEnum('proposal_status', PROPOSAL_STATUS_VALUES);

/** Ledger accounts (debits positive, credits negative). */
export const ledgerAccount = pgEnum('ledger_account', LEDGER_ACCOUNT_VALUES);

/** What a ledger transaction records. */
export const ledgerKind = pgEnum('ledger_kind', LEDGER_KIND_VALUES);

/** Which side of a booking wrote a review ($lib/work/reviews). */
export const reviewSide = pgEnum('review_side', REVIEW_SIDE_VALUES);

/** Where a dispute stands: open until an admin settles it; a settled one is never reopened. */
export const disputeStatus = pgEnum('dispute_status', DISPUTE_STATUS_VALUES);

/** How an admin settled a dispute (see $lib/work/disputes for the money of each). */
export const disputeOutcome = pgEnum('dispute_outcome', DISPUTE_OUTCOME_VALUES);

/** A line of a dispute's timeline, which both sides and admins read. */
export const disputeEventKind = pgEnum('dispute_event_kind', DISPUTE_EVENT_KIND_VALUES);
