/**
 * The words people see for every status and option Tapline stores. One label per value, used on
 * every page and in every e-mail; no raw enum value reaches a screen.
 */
import type { BoardSort } from './marketplace/board';
import type { DisputeReason, SettlementOutcome } from './work/disputes';
import type { ReviewAspect } from './work/reviews';
import type { TimeWindow } from './forms/job';
import { formatDay } from './time';
import type { FuseFamily } from './scope/fuses';
import type { BodyStyle, CameraSetup, PowerMode } from './scope/request';
// Types only (erased at build): the database enums are the one list of each status.
import type { BookingStatus, JobStatus, LedgerKind, QuoteStatus, UserRole } from './statuses';
import type { LedgerAccountName, PaymentStep } from './work/timeline';
import type {
	AdminDecision,
	ChecklistItem,
	DocumentKind,
	InstallerSkill,
	QueueSort,
	VettingAction,
	VettingStage
} from './people/vetting';

/** Who an account is on Tapline. */
export const ROLE_LABELS: Record<UserRole, string> = {
	owner: 'Car owner',
	installer: 'Installer',
	admin: 'Admin'
};

/** Whether an account may sign in. */
export const ACCOUNT_STANDING_LABELS: Record<'active' | 'suspended', string> = {
	active: 'Active',
	suspended: 'Suspended'
};

/** The market settings, as the admin's settings page and its audit trail name them. */
export const MARKET_SETTING_LABELS: Record<string, string> = {
	feePercentBasisPoints: "Tapline's fee",
	feeMinimumCents: 'Minimum fee',
	lateCancelFeeCents: 'Late-cancellation fee',
	minPublicLiabilityCents: 'Minimum public liability cover',
	confirmationWindowHours: 'Confirmation window',
	labourRateCentsPerHour: 'Labour rate guide'
};

/** The admin actions the account audit trail records. */
export const ADMIN_ACTION_LABELS: Record<string, string> = {
	suspend: 'Suspended the account',
	reinstate: 'Lifted the suspension',
	'force-password-reset': 'Asked for a new password',
	settings: 'Changed the market settings',
	'admin-invite': 'Made an admin account',
	'dispute-note': 'Added a note to a dispute',
	'dispute-settle': 'Settled a dispute',
	release: 'Released held funds to the installer',
	refund: 'Refunded held funds to the owner'
};

export const STAGE_LABELS: Record<VettingStage, string> = {
	draft: 'Not sent yet',
	applied: 'Waiting for an admin',
	waiting_on_installer: 'Waiting on the installer',
	approved: 'Approved',
	rejected: 'Rejected',
	suspended: 'Suspended'
};

export const SKILL_LABELS: Record<InstallerSkill, string> = {
	'parking-mode': 'Hard-wired parking mode',
	'tailgate-rear': 'Rear camera through tailgates',
	'vans-utes': 'Vans and utes',
	'obd-power': 'OBD power',
	'cabin-camera': 'Cabin cameras'
};

export const DOCUMENT_KIND_LABELS: Record<DocumentKind, string> = {
	insurance: 'Public liability insurance certificate',
	'photo-id': 'Photo ID',
	qualification: 'Electrical or auto-electrical qualification',
	gallery: 'Photo of a past fit (shown on your public profile)'
};

export const DECISION_LABELS: Record<AdminDecision, string> = {
	approve: 'Approve',
	'request-info': 'Ask for more',
	reject: 'Reject',
	suspend: 'Suspend',
	reinstate: 'Reinstate',
	'approve-insurance': 'Approve new insurance'
};

export const CHECKLIST_LABELS: Record<ChecklistItem, string> = {
	identityMatches: 'Photo ID matches the contact name and business',
	insuranceCurrent: 'Insurance certificate is current and the cover meets the minimum',
	abnValidAndActive: 'ABN is valid and active on the public register'
};

/** Orders of the admin queue, as offered in its sort menu. */
export const QUEUE_SORT_LABELS: Record<QueueSort, string> = {
	oldest: 'Waiting longest',
	newest: 'Newest first',
	name: 'Business name',
	expiry: 'Insurance expiring soonest'
};

export const JOB_STATUS_LABELS: Record<JobStatus, string> = {
	drafting: 'Draft',
	collecting_quotes: 'Open for quotes',
	booked: 'Booked',
	fitted: 'Fitted',
	settled: 'Settled',
	withdrawn: 'Withdrawn'
};

export const BOARD_SORT_LABELS: Record<BoardSort, string> = {
	distance: 'Nearest first',
	newest: 'Newest first',
	date: 'Soonest preferred date',
	quotes: 'Fewest quotes so far'
};

/** Short words for the board's columns and filters. */
export const BODY_STYLE_LABELS: Record<BodyStyle, string> = {
	hatchback: 'Hatchback',
	sedan: 'Sedan',
	wagon: 'Wagon',
	suv: 'SUV',
	ute: 'Ute',
	van: 'Van',
	'people-mover': 'People mover'
};
export const CAMERA_LABELS: Record<CameraSetup, string> = {
	front: 'Front',
	'front-rear': 'Front + rear',
	'front-rear-cabin': 'Front + rear + cabin'
};
export const POWER_LABELS: Record<PowerMode, string> = {
	socket: 'Accessory socket',
	'hardwired-switched': 'Hard-wired, switched',
	'hardwired-parking': 'Hard-wired, parking mode',
	obd: 'OBD with cut-off',
	'battery-pack': 'Battery pack'
};

/** Blade fuse families, as a fit note names them. */
export const FUSE_FAMILY_LABELS: Record<string, string> = {
	standard: 'Standard blade',
	mini: 'Mini blade',
	'low-profile-mini': 'Low-profile mini',
	micro2: 'Micro2',
	micro3: 'Micro3'
};

/**
 * What an owner reads before posting about Tapline installers' experience with their kind of
 * vehicle: a count only, never an installer's notes.
 */
export function bodyStyleFitsText(fits: number, bodyStyle: BodyStyle): string {
	const style = BODY_STYLE_LABELS[bodyStyle].toLowerCase();
	if (fits === 0) {
		return `No ${style} fits reported on Tapline in the last year yet; installers quote from the scope sheet.`;
	}
	return `Tapline installers reported ${String(fits)} fit${fits === 1 ? '' : 's'} of this body style (${style}) in the last year.`;
}

/** Another installer's mark on a fit note. */
export const FIT_NOTE_VERDICT_LABELS: Record<'confirmed' | 'wrong', string> = {
	confirmed: 'Confirmed on my fit',
	wrong: 'Wrong on my fit'
};

/** A label from one of the maps above, or the raw value when it is not in it. */
export function labelOf(labels: Record<string, string>, value: string): string {
	return labels[value] ?? value;
}

/** Where a quote stands, in the words both sides read. */
export const QUOTE_STATUS_LABELS: Record<QuoteStatus, string> = {
	live: 'Open',
	accepted: 'Booked',
	declined: 'Not chosen',
	withdrawn: 'Withdrawn',
	lapsed: 'Expired'
};

/** A live quote whose installer is paused or suspended: kept on file, not bookable. */
export const QUOTE_ON_HOLD_LABEL = 'On hold';
/** Why an on-hold quote has no booking form. */
export const INSTALLER_ON_HOLD_TEXT =
	'This quote is on hold: the installer cannot take bookings just now. Choose another quote or check back later.';

/** Where a booking stands. */
export const BOOKING_STATUS_LABELS: Record<BookingStatus, string> = {
	awaiting_payment: 'Provisional: waiting for payment',
	confirmed: 'Confirmed',
	cancelled: 'Cancelled',
	lapsed: 'Lapsed: the hold ran out'
};

/** Where a proposal of a new time stands. */
export const PROPOSAL_STATUS_LABELS = {
	open: 'Waiting for an answer',
	accepted: 'Accepted',
	declined: 'Declined',
	withdrawn: 'Withdrawn'
} as const;

/** What happened in an installer's vetting history, as an audit line. */
export const VETTING_ACTION_LABELS: Record<
	VettingAction | 'insurance-updated' | 'service-area-moved' | 'account-closed',
	string
> = {
	submit: 'Application sent',
	approve: 'Approved',
	'request-info': 'Asked for more',
	reject: 'Rejected',
	suspend: 'Suspended',
	reinstate: 'Reinstated',
	'approve-insurance': 'New insurance approved',
	pause: 'Quoting paused',
	'insurance-updated': 'Insurance details changed',
	'service-area-moved': 'Service area moved',
	'account-closed': 'The installer closed their account'
};

/** Where the owner's car is fitted, in the owner's words. */
export const FIT_PLACE_LABELS: Record<'mobile' | 'workshop', string> = {
	mobile: 'At your place',
	workshop: 'At the installer’s workshop'
};

/** Who brings the camera to a fit. */
export const CAMERA_SUPPLY_LABELS: Record<'owner' | 'installer', string> = {
	owner: 'I supply the camera',
	installer: 'The installer supplies the camera'
};

/** How an installer works, or where a job is fitted. */
export const WORK_MODE_LABELS: Record<'mobile' | 'workshop', string> = {
	mobile: 'Mobile (at the owner’s place)',
	workshop: 'At the installer’s workshop'
};

/**
 * Said when a message had contact details hidden. Messages are masked until a booking with that
 * installer is confirmed; what was hidden stays hidden, later messages are not masked.
 */
export const CONTACTS_HIDDEN_NOTE =
	'Phone numbers, e-mail addresses and links in it were hidden: Tapline hides contact details until a booking is confirmed by payment. Messages sent after that are not hidden.';

/** A preferred time of day in a sentence ('Tue 8 Dec, morning'); the hours are in TIME_WINDOWS. */
export const TIME_WINDOW_WORDS: Record<TimeWindow, string> = {
	morning: 'morning',
	midday: 'middle of the day',
	afternoon: 'afternoon'
};

/** A preferred day and time of day the way every page writes it: 'Tue 8 Dec, morning'. */
export function preferredWindowText(w: { date: string; window: string }, now?: Date): string {
	return `${formatDay(w.date, undefined, now)}, ${labelOf(TIME_WINDOW_WORDS, w.window)}`;
}

/** How an installer works, every mode they offer in its label ('—' for none). */
export function workModesText(p: { offersMobile: boolean; offersWorkshop: boolean }): string {
	const modes = [
		p.offersMobile && WORK_MODE_LABELS.mobile,
		p.offersWorkshop && WORK_MODE_LABELS.workshop
	];
	return modes.filter(Boolean).join('; ') || '—';
}

/** Why an installer with a vetted profile cannot quote yet: payouts are not set up. */
export const PAYOUTS_NEEDED_TEXT =
	'Set up payouts before you quote: owners pay into held funds, and we need an account to pay you from them. It takes a few minutes under Payouts.';

/** What a line of the held-funds ledger records, as shown on receipts and statements. */
export const LEDGER_KIND_LABELS: Record<LedgerKind, string> = {
	payment: 'Paid into held funds',
	release: 'Released to the installer',
	refund: 'Refunded',
	late_fee: 'Late-cancellation fee to the installer',
	reversal: 'Correction'
};

/** A step of a booking's payment, as a line of the admin's booking timeline. */
export const PAYMENT_STEP_LABELS: Record<PaymentStep, string> = {
	'checkout-opened': 'Checkout opened',
	paid: 'Paid into held funds',
	'refunded-after-lapse': 'Paid after the hold ran out: refunded in full',
	'release-requested': 'Release of held funds asked for',
	released: 'Held funds released to the installer'
};

/** The booking's own lines of the admin's booking timeline. */
export const BOOKING_STEP_LABELS: Record<'booked' | 'hold-ends', string> = {
	booked: 'Booked (provisional until paid)',
	'hold-ends': 'Hold on the slot ends'
};

/** A ledger account, as the admin's booking timeline names it. */
export const LEDGER_ACCOUNT_LABELS: Record<LedgerAccountName, string> = {
	platform_cash: 'Money held at the payment provider',
	owner_funds_held: 'Owner’s funds held',
	installer_payable: 'Owed to the installer',
	fee_revenue: 'Tapline fee',
	gst_payable: 'GST on the fee'
};

/** The payment provider's events Tapline acts on, as lines of the admin's booking timeline. */
const PAYMENT_EVENT_LABELS: Record<string, string> = {
	'checkout.session.completed': 'Provider: checkout completed',
	'payment_intent.succeeded': 'Provider: payment succeeded',
	'payment_intent.payment_failed': 'Provider: payment failed',
	'charge.refunded': 'Provider: charge refunded'
};

/** A payment provider's event in words; one Tapline only records says which it was. */
export function paymentEventLabel(type: string): string {
	return PAYMENT_EVENT_LABELS[type] ?? `Provider: other event (${type})`;
}

/** The fuse families a fit report names (the job's "not sure" is settled on the day). */
export const FIT_FUSE_FAMILY_LABELS: Record<FuseFamily, string> = {
	standard: 'Standard blade',
	mini: 'Mini blade',
	'low-profile-mini': 'Low-profile mini blade',
	micro2: 'Micro2',
	micro3: 'Micro3'
};

/** The aspects each side of a booking rates the other on ($lib/work/reviews). */
export const REVIEW_ASPECT_LABELS: Record<ReviewAspect, string> = {
	workmanship: 'Workmanship',
	tidiness: 'Tidiness',
	communication: 'Communication',
	punctuality: 'Punctuality',
	vehicleReady: 'Vehicle ready and accessible',
	accurateJob: 'Accurate job description'
};

/** Why an owner raised a problem, as both sides and admins read it. */
export const DISPUTE_REASON_LABELS: Record<DisputeReason, string> = {
	'not-recording': 'The camera is not recording',
	'parking-mode': 'Parking mode is not working',
	'battery-drained': 'The battery went flat',
	'cable-visible': 'Cable visible or trim damaged',
	'vehicle-damage': 'Damage to the vehicle',
	'not-as-quoted': 'Work not done as quoted',
	other: 'Something else'
};

/** How a dispute was settled. */
export const DISPUTE_OUTCOME_LABELS: Record<SettlementOutcome, string> = {
	release: 'Released in full to the installer',
	partial_refund: 'Part refunded to the owner, the rest released',
	full_refund: 'Refunded in full to the owner',
	return_visit: 'Return visit by the installer'
};

/** Where a dispute stands. */
export const DISPUTE_STATUS_LABELS: Record<'open' | 'settled', string> = {
	open: 'Open: with a Tapline admin',
	settled: 'Settled'
};

/** A line of a dispute's timeline. */
export const DISPUTE_EVENT_LABELS: Record<
	'opened' | 'owner_evidence' | 'installer_response' | 'admin_note' | 'settlement',
	string
> = {
	opened: 'Problem raised by the owner',
	owner_evidence: 'More from the owner',
	installer_response: 'The installer’s response',
	admin_note: 'Note from Tapline',
	settlement: 'Settled by Tapline'
};
