/**
 * Every stored status and option as a value list, shared by the database enums
 * ($lib/server/db/schema/enums.ts) and the pure code and components that name them.
 */

export const USER_ROLE_VALUES = ['owner', 'installer', 'admin'] as const;
export type UserRole = (typeof USER_ROLE_VALUES)[number];

export const VETTING_STATUS_VALUES = [
	'applied',
	'waiting_on_installer',
	'approved',
	'rejected',
	'suspended'
] as const;
export type VettingStatus = (typeof VETTING_STATUS_VALUES)[number];

export const JOB_STATUS_VALUES = [
	'drafting',
	'collecting_quotes',
	'booked',
	'fitted',
	'settled',
	'withdrawn'
] as const;
export type JobStatus = (typeof JOB_STATUS_VALUES)[number];

export const QUOTE_STATUS_VALUES = ['live', 'accepted', 'declined', 'withdrawn', 'lapsed'] as const;
export type QuoteStatus = (typeof QUOTE_STATUS_VALUES)[number];

export const BOOKING_STATUS_VALUES = [
	'awaiting_payment',
	'confirmed',
	'cancelled',
	'lapsed'
] as const;
export type BookingStatus = (typeof BOOKING_STATUS_VALUES)[number];

export const FIT_STAGE_VALUES = ['to_fit', 'reported', 'accepted', 'disputed', 'settled'] as const;
export type FitStage = (typeof FIT_STAGE_VALUES)[number];

export const ACCEPTED_BY_VALUES = ['owner', 'window', 'settlement'] as const;
export type AcceptedBy = (typeof ACCEPTED_BY_VALUES)[number];

export const PROPOSAL_STATUS_VALUES = ['open', 'accepted', 'declined', 'withdrawn'] as const;
export type ProposalStatus = (typeof PROPOSAL_STATUS_VALUES)[number];

export const LEDGER_ACCOUNT_VALUES = [
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
] as const;
export type LedgerAccount = (typeof LEDGER_ACCOUNT_VALUES)[number];

export const LEDGER_KIND_VALUES = ['payment', 'release', 'refund', 'late_fee', 'reversal'] as const;
export type LedgerKind = (typeof LEDGER_KIND_VALUES)[number];

export const REVIEW_SIDE_VALUES = ['owner', 'installer'] as const;
export type ReviewSide = (typeof REVIEW_SIDE_VALUES)[number];

export const DISPUTE_STATUS_VALUES = ['open', 'settled'] as const;
export type DisputeStatus = (typeof DISPUTE_STATUS_VALUES)[number];

export const DISPUTE_OUTCOME_VALUES = [
	'release',
	'partial_refund',
	'full_refund',
	'return_visit'
] as const;
export type DisputeOutcome = (typeof DISPUTE_OUTCOME_VALUES)[number];

export const DISPUTE_EVENT_KIND_VALUES = [
	'opened',
	'owner_evidence',
	'installer_response',
	'admin_note',
	'settlement'
] as const;
export type DisputeEventKind = (typeof DISPUTE_EVENT_KIND_VALUES)[number];
