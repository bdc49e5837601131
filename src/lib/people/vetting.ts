/**
 * Installer vetting, as pure rules: which decisions may follow which standing, what an admin must
 * have checked before approving, what an application still lacks, and when insurance reminders
 * fall due. No I/O, so the pages, the server module and the tests share one source of truth.
 */
import { CHECKLIST_LABELS } from '../labels';
import { formatInZone } from '../time';

/** Where an application stands; mirrors the `vetting_status` enum in the database. */
export const VETTING_STATUSES = [
	'applied',
	'waiting_on_installer',
	'approved',
	'rejected',
	'suspended'
] as const;
export type VettingStatus = (typeof VETTING_STATUSES)[number];

/** A saved but never submitted application is a draft (its row has no `submitted_at`). */
export type VettingStage = VettingStatus | 'draft';

/** What an installer fits, as stored in `installer_profile.skills`. */
export const INSTALLER_SKILLS = [
	'parking-mode',
	'tailgate-rear',
	'vans-utes',
	'obd-power',
	'cabin-camera'
] as const;
export type InstallerSkill = (typeof INSTALLER_SKILLS)[number];

export const DOCUMENT_KINDS = ['insurance', 'photo-id', 'qualification', 'gallery'] as const;
export type DocumentKind = (typeof DOCUMENT_KINDS)[number];

/**
 * Smallest public liability cover Tapline accepts, in cents: $10 million. Trade bodies and
 * dealerships in Australia commonly ask contractors for $10M–$20M [common trade practice; from
 * memory]; the server reads MIN_PUBLIC_LIABILITY_CENTS to change it.
 */
export const DEFAULT_MIN_PUBLIC_LIABILITY_CENTS = 10_000_000_00;

/** Days before expiry on which the installer is reminded, largest first. */
export const REMINDER_DAYS_BEFORE = [30, 7] as const;
export type ReminderDays = (typeof REMINDER_DAYS_BEFORE)[number];

/** Decisions and events on an application. */
export type VettingAction =
	| 'submit'
	| 'approve'
	| 'request-info'
	| 'reject'
	| 'suspend'
	| 'reinstate'
	| 'approve-insurance'
	| 'pause';

/** The decisions an admin can take from the application page. */
export const ADMIN_DECISIONS = [
	'approve',
	'request-info',
	'reject',
	'suspend',
	'reinstate',
	'approve-insurance'
] as const;
export type AdminDecision = (typeof ADMIN_DECISIONS)[number];

/** Decisions whose message goes to the installer and must therefore be written. */
export const DECISIONS_NEEDING_MESSAGE: readonly AdminDecision[] = [
	'request-info',
	'reject',
	'suspend'
];

interface Transition {
	from: readonly VettingStage[];
	to: VettingStatus;
	/** Only while quoting is paused (true) or only while it is not (false); any when absent. */
	paused?: boolean;
}

const TRANSITIONS: Record<VettingAction, Transition> = {
	submit: { from: ['draft', 'waiting_on_installer'], to: 'applied' },
	approve: { from: ['applied', 'waiting_on_installer'], to: 'approved' },
	'request-info': { from: ['applied'], to: 'waiting_on_installer' },
	reject: { from: ['applied', 'waiting_on_installer'], to: 'rejected' },
	suspend: { from: ['approved'], to: 'suspended' },
	reinstate: { from: ['suspended'], to: 'approved' },
	// A lapsed certificate pauses quoting without un-vetting; a new one lifts the pause.
	'approve-insurance': { from: ['approved'], to: 'approved', paused: true },
	pause: { from: ['approved'], to: 'approved', paused: false }
};

/**
 * The standing an action leads to, or null when the action is not allowed from here.
 * @param stage where the application stands now
 * @param action the decision or event
 * @param paused whether quoting is paused now (insurance lapsed)
 */
export function nextStatus(
	stage: VettingStage,
	action: VettingAction,
	paused = false
): VettingStatus | null {
	const t = TRANSITIONS[action];
	if (!t.from.includes(stage)) return null;
	if (t.paused !== undefined && t.paused !== paused) return null;
	return t.to;
}

/**
 * The admin decisions open for an application in this standing.
 * @param stage where the application stands
 * @param paused whether quoting is paused
 */
export function allowedDecisions(stage: VettingStage, paused = false): AdminDecision[] {
	return ADMIN_DECISIONS.filter((d) => nextStatus(stage, d, paused) !== null);
}

/** The stage of a stored profile: a row never submitted is a draft whatever its status column. */
export function stageOf(profile: {
	vettingStatus: VettingStatus;
	submittedAt: Date | null;
}): VettingStage {
	return profile.submittedAt === null ? 'draft' : profile.vettingStatus;
}

/** Whether the installer may see job details and quote. */
export function canQuote(profile: {
	vettingStatus: VettingStatus;
	pausedReason: string | null;
}): boolean {
	return profile.vettingStatus === 'approved' && profile.pausedReason === null;
}

/** The checks an admin ticks before approving. */
export const CHECKLIST_ITEMS = [
	'identityMatches',
	'insuranceCurrent',
	'abnValidAndActive'
] as const;
export type ChecklistItem = (typeof CHECKLIST_ITEMS)[number];
export type Checklist = Record<ChecklistItem, boolean>;

/** What the server knows about an application when an admin decides. */
export interface ApplicationFacts {
	coverCents: number | null;
	insuranceExpiresOn: string | null;
	documentKinds: readonly DocumentKind[];
	/** The installer's local calendar date today, 'YYYY-MM-DD'. */
	today: string;
	minCoverCents: number;
}

/**
 * Reasons an approval cannot go ahead, in words for the admin; empty when it may.
 * The ticks are the admin's judgement; the dates and amounts are checked here as well, so a
 * tick cannot approve a lapsed certificate or too little cover.
 */
export function approvalProblems(checklist: Checklist, facts: ApplicationFacts): string[] {
	const problems: string[] = [];
	for (const item of CHECKLIST_ITEMS) {
		if (!checklist[item])
			problems.push(`Tick “${CHECKLIST_LABELS[item]}” once you have checked it.`);
	}
	problems.push(...insuranceProblems(facts));
	if (!facts.documentKinds.includes('photo-id')) problems.push('There is no photo ID.');
	return problems;
}

/** Reasons the insurance on file is not acceptable today; empty when it is. */
export function insuranceProblems(
	facts: Omit<ApplicationFacts, 'documentKinds'> & {
		documentKinds?: readonly DocumentKind[];
	}
): string[] {
	const problems: string[] = [];
	if (facts.documentKinds && !facts.documentKinds.includes('insurance')) {
		problems.push('There is no insurance certificate.');
	}
	if (facts.coverCents === null || facts.coverCents < facts.minCoverCents) {
		problems.push(
			`The cover is below the minimum of $${(facts.minCoverCents / 100).toLocaleString('en-AU')}.`
		);
	}
	if (!facts.insuranceExpiresOn || isInsuranceLapsed(facts.insuranceExpiresOn, facts.today)) {
		problems.push('The insurance has expired or has no expiry date.');
	}
	return problems;
}

/** Parts of an application, for the status page's "what is missing" list. */
export interface ApplicationParts {
	hasProfile: boolean;
	abn: string | null;
	phone: string | null;
	skills: readonly string[];
	insurer: string | null;
	insuranceExpiresOn: string | null;
	coverCents: number | null;
	documentKinds: readonly DocumentKind[];
	hoursCount: number;
}

export interface MissingPart {
	step: 'application' | 'documents' | 'service-area' | 'hours';
	what: string;
}

/** What an application still lacks before it can be sent; empty when complete. */
export function missingParts(parts: ApplicationParts): MissingPart[] {
	const missing: MissingPart[] = [];
	if (!parts.hasProfile) {
		return [
			{ step: 'application', what: 'Your business details, ABN and skills' },
			{ step: 'documents', what: 'Insurance certificate and details, and photo ID' },
			{ step: 'hours', what: 'Your weekly working hours' }
		];
	}
	if (!parts.abn) missing.push({ step: 'application', what: 'Your ABN' });
	if (!parts.phone) missing.push({ step: 'application', what: 'A phone number' });
	if (parts.skills.length === 0) missing.push({ step: 'application', what: 'What you fit' });
	if (!parts.insurer || !parts.insuranceExpiresOn || parts.coverCents === null) {
		missing.push({ step: 'documents', what: 'Insurer, policy number, cover and expiry date' });
	}
	if (!parts.documentKinds.includes('insurance')) {
		missing.push({ step: 'documents', what: 'Your insurance certificate' });
	}
	if (!parts.documentKinds.includes('photo-id')) {
		missing.push({ step: 'documents', what: 'Photo ID' });
	}
	if (parts.hoursCount === 0) missing.push({ step: 'hours', what: 'Your weekly working hours' });
	return missing;
}

const DATE_RE = /^(\d{4})-(\d{2})-(\d{2})$/;
const MS_PER_DAY = 86_400_000;

function dayNumber(date: string): number {
	const m = DATE_RE.exec(date);
	if (!m) throw new RangeError(`Expected 'YYYY-MM-DD', got '${date}'`);
	const ms = Date.UTC(Number(m[1]), Number(m[2]) - 1, Number(m[3]));
	if (new Date(ms).toISOString().slice(0, 10) !== date) {
		throw new RangeError(`Not a real date: ${date}`);
	}
	return ms / MS_PER_DAY;
}

/**
 * The calendar date an instant falls on in a zone, 'YYYY-MM-DD'.
 * @param instant the moment
 * @param zone IANA zone name, e.g. 'Australia/Adelaide'
 */
export function localDate(instant: Date, zone: string): string {
	return formatInZone(instant, zone, 'yyyy-MM-dd');
}

/**
 * Whole calendar days from one local date to another (negative when `to` is earlier). Counted on
 * dates, not hours, so a 23- or 25-hour day at a daylight-saving change still counts as one day.
 */
export function calendarDaysBetween(from: string, to: string): number {
	return dayNumber(to) - dayNumber(from);
}

/**
 * Whether insurance expiring on `expiresOn` has lapsed on local date `today`. Cover is treated as
 * ended from the start of the expiry date: Australian certificates commonly end cover at 4 pm
 * local time on that date [from memory], so the whole day is not safely covered.
 */
export function isInsuranceLapsed(expiresOn: string, today: string): boolean {
	return calendarDaysBetween(today, expiresOn) <= 0;
}

/** What the daily expiry job should do for one installer. */
export interface ExpiryStep {
	/** Calendar days left until the expiry date. */
	daysLeft: number;
	/** The reminder due today, if any. */
	remind: ReminderDays | null;
	/** Insurance has lapsed: quoting must pause. */
	lapsed: boolean;
}

/**
 * Decides the expiry job's step for one certificate. A reminder is due once the days left reach
 * its threshold and stays due until sent (so a day the job missed is caught up), but only the
 * nearest threshold is sent: at 5 days left the 7-day reminder goes, never a late 30-day one.
 * @param expiresOn the certificate's expiry date, 'YYYY-MM-DD' (a date in the installer's zone)
 * @param now the instant the job runs
 * @param zone the installer's IANA zone
 * @param alreadySent reminders already sent for this expiry date
 */
export function expiryStep(
	expiresOn: string,
	now: Date,
	zone: string,
	alreadySent: readonly number[] = []
): ExpiryStep {
	const daysLeft = calendarDaysBetween(localDate(now, zone), expiresOn);
	if (daysLeft <= 0) return { daysLeft, remind: null, lapsed: true };
	const due = [...REMINDER_DAYS_BEFORE].reverse().find((d) => daysLeft <= d) ?? null;
	return {
		daysLeft,
		remind: due !== null && !alreadySent.includes(due) ? due : null,
		lapsed: false
	};
}

/** Who is asking for a document: the signed-in account, or null when nobody is signed in. */
export interface DocumentViewer {
	id: string;
	role: 'owner' | 'installer' | 'admin';
}

/**
 * Whether an installer's profile is shown to everyone: once vetted (approved), paused or not;
 * never while a draft, under review, declined or suspended.
 */
export const isProfilePublic = (status: VettingStatus | null) => status === 'approved';

/**
 * Whether a viewer may fetch an installer's document. Insurance certificates, photo ID and
 * qualifications are for the installer themself and admins only; gallery photos are what the
 * installer chose to show on the public profile, so anyone may see them while that profile is
 * public (see {@link isProfilePublic}), and only the installer and admins otherwise.
 * @returns 'allowed', 'sign-in' (nobody signed in) or 'forbidden'
 */
export function canViewInstallerDocument(
	viewer: DocumentViewer | null,
	doc: { installerId: string; kind: DocumentKind; profilePublic: boolean }
): 'allowed' | 'sign-in' | 'forbidden' {
	if (doc.kind === 'gallery' && doc.profilePublic) return 'allowed';
	if (!viewer) return 'sign-in';
	if (viewer.role === 'admin' || viewer.id === doc.installerId) return 'allowed';
	return 'forbidden';
}

/** Orders of the admin queue (labels in `$lib/labels`). */
export const QUEUE_SORTS = ['oldest', 'newest', 'name', 'expiry'] as const;
export type QueueSort = (typeof QUEUE_SORTS)[number];

/**
 * Whether an installer may remove one of their documents. Gallery photos may go at any time;
 * vetting documents only before the application is sent or while an admin waits on the
 * installer, since an application an admin has read or decided on keeps what was checked.
 */
export function mayRemoveDocument(kind: DocumentKind, stage: VettingStage): boolean {
	return kind === 'gallery' || stage === 'draft' || stage === 'waiting_on_installer';
}
