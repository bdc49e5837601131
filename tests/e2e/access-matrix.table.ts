/**
 * The expected answers of the authorisation matrix (`access-matrix.spec.ts`): for every page,
 * form action and endpoint in src/routes, what each of eight personas gets. A route that is not in
 * this table fails the matrix, so a new route cannot ship without someone writing down who may use
 * it. Pages are asked for twice, as the page and as its data route (`__data.json`); both must give
 * the page's answer.
 *
 * The objects in the paths belong to "owner" and "installer" (see the spec's world): their booking
 * (paid, fit report filed, a problem raised, so disputed), the booked job and its quote, the owner's
 * draft job with a photo, the installer's uploaded document. "otherOwner" and "otherInstaller" are
 * the same kinds of account with none of those objects; their answers are the object-level checks.
 *
 * Answers (what the spec reads from the response):
 *   ok         2xx
 *   away       a redirect somewhere other than the sign-in page (a page that moved the person on)
 *   signin     a redirect to the sign-in page
 *   refused    400, 409, 410 or 422: the route let the person in and refused what was sent (the
 *              matrix posts an empty form), or the state the object is in
 *   forbidden  403
 *   missing    404: the object is not theirs, and Tapline does not say whether it exists
 *   unauthorised 401 (JSON endpoints, which answer a status rather than the sign-in redirect)
 * A cell may list several answers where more than one is right (an action that may move on or
 * refuse an empty form). Sources: the product's own access rules (issues 2–17), written here.
 */

export const PERSONAS = [
	'anonymous',
	'owner',
	'otherOwner',
	'installer',
	'otherInstaller',
	'unvettedInstaller',
	'suspendedInstaller',
	'admin'
] as const;
export type Persona = (typeof PERSONAS)[number];

export type Answer =
	'ok' | 'away' | 'signin' | 'refused' | 'forbidden' | 'missing' | 'unauthorised';
export type Cell = Answer | readonly Answer[];
export type Row = Record<Persona, Cell>;

/** An action the persona may use, sent an empty form: refused, or done and moved on. */
const ACT = ['refused', 'ok', 'away'] as const;
/** An action on a path alone (no form to refuse): done, moved on, or refused by the object's state. */
const DO = ['ok', 'away', 'refused'] as const;

/** Refusals: a cell made only of these must leave every table as it was. */
export const REFUSALS: readonly Answer[] = ['signin', 'forbidden', 'missing', 'unauthorised'];

/** Everyone signed in and not suspended gets `signedIn`; the signed out get the sign-in page. */
const anyAccount = (signedIn: Cell): Row => ({
	anonymous: 'signin',
	owner: signedIn,
	otherOwner: signedIn,
	installer: signedIn,
	otherInstaller: signedIn,
	unvettedInstaller: signedIn,
	// A suspension ends the person's sessions: the next request is a signed-out one.
	suspendedInstaller: 'signin',
	admin: signedIn
});

/** Everyone alike, signed in or not (sign-in, sign-up, public profiles). */
const everyone = (cell: Cell, signedIn: Cell = cell): Row => ({
	...anyAccount(signedIn),
	anonymous: cell,
	suspendedInstaller: cell
});

/** The owner's area, nothing of one owner's in the path: any owner. */
const ownerArea = (owner: Cell): Row => ({
	...anyAccount('forbidden'),
	owner,
	otherOwner: owner
});
/** An owner's own job or booking: another owner gets a 404. */
const ownersOwn = (owner: Cell): Row => ({ ...ownerArea(owner), otherOwner: 'missing' });

/** The installer's area, nothing of one installer's in the path. */
const installerArea = (vetted: Cell, unvetted: Cell = vetted): Row => ({
	...anyAccount('forbidden'),
	installer: vetted,
	otherInstaller: vetted,
	unvettedInstaller: unvetted
});
/** An installer's own booking, payout or fit report: another installer gets a 404. */
const installersOwn = (installer: Cell, unvetted: Cell = 'missing'): Row => ({
	...installerArea(installer, unvetted),
	otherInstaller: 'missing'
});

/** The admin console. */
const adminOnly = (admin: Cell): Row => ({ ...anyAccount('forbidden'), admin });

/** Photos: the signed out are sent to sign in; the parties and admins see it, the rest a 404. */
const media = (rows: Partial<Row>): Row => ({ ...anyAccount('missing'), ...rows });

export const EXPECTED: Record<string, Row> = {
	// ----- Account (every signed-in person) -----
	'POST /account ?/changeEmail': anyAccount(ACT),
	'POST /account ?/changeName': anyAccount(ACT),
	'POST /account ?/changePassword': anyAccount(ACT),
	'POST /account ?/closeAccount': anyAccount(ACT),
	'POST /account ?/endOtherSessions': anyAccount(DO),
	'POST /account ?/endSession': anyAccount(ACT),
	'GET /account (page)': anyAccount('ok'),
	// Confirming a new address: the link from the e-mail proves the mailbox, no sign-in needed.
	'POST /account/email ?/confirm': everyone(ACT),
	'GET /account/email (page)': everyone('ok'),

	// ----- Admin console -----
	'GET /admin (page)': adminOnly('ok'),
	'GET /admin/bookings (page)': adminOnly('ok'),
	'GET /admin/bookings/[id=uuid] (page)': adminOnly('ok'),
	'GET /admin/bookings/bookings.csv': adminOnly('ok'),
	'GET /admin/disputes (page)': adminOnly('ok'),
	'POST /admin/disputes/[id=uuid] ?/note': adminOnly(ACT),
	'POST /admin/disputes/[id=uuid] ?/settle': adminOnly(ACT),
	'GET /admin/disputes/[id=uuid] (page)': adminOnly('ok'),
	'POST /admin/payments ?/refund': adminOnly(ACT),
	'POST /admin/payments ?/release': adminOnly(ACT),
	'GET /admin/payments (page)': adminOnly('ok'),
	'GET /admin/payouts (page)': adminOnly('ok'),
	'GET /admin/payouts/payouts.csv': adminOnly('ok'),
	'POST /admin/settings ?/default': adminOnly(ACT),
	'GET /admin/settings (page)': adminOnly('ok'),
	'POST /admin/team ?/createAdmin': adminOnly(ACT),
	'GET /admin/team (page)': adminOnly('ok'),
	'GET /admin/users (page)': adminOnly('ok'),
	// On a throwaway account of the spec's own.
	'POST /admin/users/[id=uuid] ?/forceReset': adminOnly(DO),
	'POST /admin/users/[id=uuid] ?/reinstate': adminOnly(DO),
	'POST /admin/users/[id=uuid] ?/suspend': adminOnly(DO),
	'GET /admin/users/[id=uuid] (page)': adminOnly('ok'),
	'GET /admin/vetting (page)': adminOnly('ok'),
	'POST /admin/vetting/[id=uuid] ?/decide': adminOnly(ACT),
	'GET /admin/vetting/[id=uuid] (page)': adminOnly('ok'),

	// ----- JSON and other endpoints -----
	// The benchmark's baseline: a constant answer with no data, open to all.
	'GET /api/bench/baseline': everyone('missing'),
	// The job board as JSON: vetted installers only; a status, not the sign-in redirect.
	'GET /api/jobs': {
		...anyAccount('forbidden'),
		anonymous: 'unauthorised',
		suspendedInstaller: 'unauthorised',
		installer: 'ok',
		otherInstaller: 'ok'
	},
	// The place finder (suburbs and postcodes): any signed-in person; the matrix sends no query.
	'GET /api/places': {
		...anyAccount('refused'),
		anonymous: 'signin',
		suspendedInstaller: 'signin'
	},
	'GET /api/places/reverse': {
		...anyAccount('refused'),
		anonymous: 'signin',
		suspendedInstaller: 'signin'
	},
	// The payments provider's webhook: nothing without the provider's signature, from anyone.
	'POST /api/webhooks/stripe': everyone('refused'),

	// ----- Signing in and out (open to all) -----
	'POST /forgot-password ?/default': everyone(ACT),
	'GET /forgot-password (page)': everyone('ok'),
	'POST /reset-password ?/default': everyone(ACT),
	'GET /reset-password (page)': everyone('ok'),
	'POST /sign-in ?/default': everyone(ACT),
	// Someone signed in is sent on to their own start page.
	'GET /sign-in (page)': everyone('ok', 'away'),
	// Sent last: it ends each persona's session.
	'POST /sign-out ?/default': everyone(DO),
	// Signing out is a POST; the address alone sends everyone on.
	'GET /sign-out (page)': everyone('away'),
	'POST /sign-up ?/default': everyone(ACT),
	'GET /sign-up (page)': everyone('ok', 'away'),
	'POST /verify-email ?/confirm': everyone(ACT),
	// Sending the confirmation again needs the account: the signed out are asked to sign in.
	'POST /verify-email ?/resend': anyAccount(DO),
	'GET /verify-email (page)': everyone('ok'),

	// ----- Installer area -----
	'POST /installer ?/submit': installerArea(DO),
	'GET /installer (page)': installerArea('ok'),
	'POST /installer/application ?/default': installerArea(ACT),
	'GET /installer/application (page)': installerArea('ok'),
	'GET /installer/bookings/[id=uuid]/booking.ics': installersOwn('ok'),
	'POST /installer/bookings/[id=uuid]/dispute ?/respond': installersOwn(ACT),
	'GET /installer/bookings/[id=uuid]/dispute (page)': installersOwn('ok'),
	'GET /installer/bookings/[id=uuid]/record (page)': installersOwn('ok'),
	'GET /installer/bookings/[id=uuid]/record.pdf': installersOwn('ok'),
	'POST /installer/bookings/[id=uuid]/report ?/file': installersOwn(ACT),
	'GET /installer/bookings/[id=uuid]/report (page)': installersOwn('ok'),
	'POST /installer/bookings/[id=uuid]/review ?/reply': installersOwn(ACT),
	'POST /installer/bookings/[id=uuid]/review ?/review': installersOwn(ACT),
	'GET /installer/bookings/[id=uuid]/review (page)': installersOwn('ok'),
	'POST /installer/bookings/[id=uuid]/time ?/accept': installersOwn(DO),
	'POST /installer/bookings/[id=uuid]/time ?/decline': installersOwn(DO),
	'POST /installer/bookings/[id=uuid]/time ?/propose': installersOwn(ACT),
	'POST /installer/bookings/[id=uuid]/time ?/withdraw': installersOwn(DO),
	'GET /installer/bookings/[id=uuid]/time (page)': installersOwn('ok'),
	'GET /installer/calendar (page)': installerArea('ok'),
	'POST /installer/documents ?/removeDocument': installerArea(ACT),
	'POST /installer/documents ?/saveInsurance': installerArea(ACT),
	'POST /installer/documents ?/upload': installerArea(ACT),
	'GET /installer/documents (page)': installerArea('ok'),
	// Fit notes are shared among vetted installers; the matrix asks for one that does not exist.
	'GET /installer/fit-notes (page)': installerArea('ok', 'forbidden'),
	'POST /installer/fit-notes/[id=uuid] ?/mark': installerArea('missing', 'forbidden'),
	'POST /installer/fit-notes/[id=uuid] ?/photo': installerArea('missing', 'forbidden'),
	'GET /installer/fit-notes/[id=uuid] (page)': installerArea('missing', 'forbidden'),
	'POST /installer/fit-notes/publish/[id=uuid] ?/default': installersOwn(ACT, 'forbidden'),
	'GET /installer/fit-notes/publish/[id=uuid] (page)': installersOwn('ok', 'forbidden'),
	'GET /installer/fits (page)': installerArea('ok'),
	'POST /installer/hours ?/block': installerArea(ACT),
	'POST /installer/hours ?/saveHours': installerArea(ACT),
	'POST /installer/hours ?/unblock': installerArea(ACT),
	'GET /installer/hours (page)': installerArea('ok'),
	'GET /installer/jobs (page)': installerArea('ok'),
	// The booked job: its installer's; anyone else's board never shows it.
	'POST /installer/jobs/[id=uuid] ?/ask': installersOwn(ACT),
	'POST /installer/jobs/[id=uuid] ?/cancelBooking': installersOwn(DO),
	'POST /installer/jobs/[id=uuid] ?/quote': installersOwn(ACT),
	'POST /installer/jobs/[id=uuid] ?/withdraw': installersOwn(DO),
	'GET /installer/jobs/[id=uuid] (page)': installersOwn('ok'),
	'GET /installer/messages (page)': installerArea('ok'),
	'POST /installer/payouts ?/checkAgain': installerArea(DO),
	'POST /installer/payouts ?/setUp': installerArea(DO),
	'GET /installer/payouts (page)': installerArea('ok'),
	'GET /installer/payouts/[id=uuid] (page)': installersOwn('ok'),
	'GET /installer/quotes (page)': installerArea('ok'),
	'POST /installer/service-area ?/default': installerArea(ACT),
	'GET /installer/service-area (page)': installerArea('ok'),

	// ----- The landing page (lists the demo's pages while the demo accounts exist) -----
	'GET / (page)': everyone('ok'),

	// ----- Public profile (the vetted installer's) -----
	'GET /installers/[id=uuid] (page)': everyone('ok'),

	// ----- Photos and documents -----
	'GET /media/dispute-photos/[id=uuid]/[variant]': media({
		owner: 'ok',
		installer: 'ok',
		admin: 'ok'
	}),
	// None exists in the matrix's world (see fit notes above): a 404 for all.
	'GET /media/fit-note-photos/[id=uuid]/[variant]': media({}),
	'GET /media/fit-report-photos/[id=uuid]/[variant]': media({
		owner: 'ok',
		installer: 'ok',
		admin: 'ok'
	}),
	// A private document (not a gallery photo): the installer and admins; a status for the rest.
	'GET /media/installer-documents/[id=uuid]': {
		...anyAccount('forbidden'),
		anonymous: 'unauthorised',
		suspendedInstaller: 'unauthorised',
		installer: 'ok',
		admin: 'ok'
	},
	'GET /media/job-photos/[id=uuid]/[variant]': media({ owner: 'ok', admin: 'ok' }),

	// ----- Owner area -----
	'GET /owner (page)': ownerArea('ok'),
	'POST /owner/bookings/[id=uuid] ?/cancel': ownersOwn(DO),
	'POST /owner/bookings/[id=uuid] ?/confirm': ownersOwn(DO),
	'POST /owner/bookings/[id=uuid] ?/pay': ownersOwn(DO),
	'GET /owner/bookings/[id=uuid] (page)': ownersOwn('ok'),
	'GET /owner/bookings/[id=uuid]/booking.ics': ownersOwn('ok'),
	'POST /owner/bookings/[id=uuid]/problem ?/addEvidence': ownersOwn(ACT),
	'POST /owner/bookings/[id=uuid]/problem ?/raise': ownersOwn(ACT),
	'GET /owner/bookings/[id=uuid]/problem (page)': ownersOwn('ok'),
	'GET /owner/bookings/[id=uuid]/receipt (page)': ownersOwn('ok'),
	'GET /owner/bookings/[id=uuid]/record (page)': ownersOwn('ok'),
	'GET /owner/bookings/[id=uuid]/record.pdf': ownersOwn('ok'),
	'POST /owner/bookings/[id=uuid]/review ?/review': ownersOwn(ACT),
	'GET /owner/bookings/[id=uuid]/review (page)': ownersOwn('ok'),
	'POST /owner/bookings/[id=uuid]/time ?/accept': ownersOwn(DO),
	'POST /owner/bookings/[id=uuid]/time ?/decline': ownersOwn(DO),
	'POST /owner/bookings/[id=uuid]/time ?/propose': ownersOwn(ACT),
	'POST /owner/bookings/[id=uuid]/time ?/withdraw': ownersOwn(DO),
	'GET /owner/bookings/[id=uuid]/time (page)': ownersOwn('ok'),
	'POST /owner/jobs/[id=uuid] ?/adjust': ownersOwn(ACT),
	'POST /owner/jobs/[id=uuid] ?/withdraw': ownersOwn(ACT),
	'GET /owner/jobs/[id=uuid] (page)': ownersOwn('ok'),
	'POST /owner/jobs/[id=uuid]/cameras ?/default': ownersOwn(ACT),
	'GET /owner/jobs/[id=uuid]/cameras (page)': ownersOwn('ok'),
	'POST /owner/jobs/[id=uuid]/photos ?/next': ownersOwn(DO),
	'POST /owner/jobs/[id=uuid]/photos ?/remove': ownersOwn(ACT),
	'POST /owner/jobs/[id=uuid]/photos ?/upload': ownersOwn(ACT),
	'GET /owner/jobs/[id=uuid]/photos (page)': ownersOwn('ok'),
	'POST /owner/jobs/[id=uuid]/place ?/default': ownersOwn(ACT),
	'GET /owner/jobs/[id=uuid]/place (page)': ownersOwn('ok'),
	'POST /owner/jobs/[id=uuid]/power ?/default': ownersOwn(ACT),
	'GET /owner/jobs/[id=uuid]/power (page)': ownersOwn('ok'),
	'GET /owner/jobs/[id=uuid]/quotes (page)': ownersOwn('ok'),
	'POST /owner/jobs/[id=uuid]/quotes/[installerId=uuid] ?/book': ownersOwn(ACT),
	'POST /owner/jobs/[id=uuid]/quotes/[installerId=uuid] ?/reply': ownersOwn(ACT),
	'GET /owner/jobs/[id=uuid]/quotes/[installerId=uuid] (page)': ownersOwn('ok'),
	'POST /owner/jobs/[id=uuid]/review ?/post': ownersOwn(DO),
	'GET /owner/jobs/[id=uuid]/review (page)': ownersOwn('ok'),
	'POST /owner/jobs/[id=uuid]/vehicle ?/default': ownersOwn(ACT),
	'GET /owner/jobs/[id=uuid]/vehicle (page)': ownersOwn('ok'),
	'POST /owner/jobs/new ?/default': ownerArea(DO),
	'GET /owner/jobs/new (page)': ownerArea('ok'),
	'GET /owner/payments (page)': ownerArea('ok')
};

/**
 * The object-level cases the matrix must hold, named: each is also a cell of the table above, and
 * the spec fails if the table stops expecting it or the app stops giving it.
 */
export const OBJECT_CASES: Array<{
	what: string;
	target: string;
	persona: Persona;
	/** The refusal, when not a 404. */
	answer?: Answer;
}> = [
	{
		what: "another owner's job",
		target: 'GET /owner/jobs/[id=uuid] (page)',
		persona: 'otherOwner'
	},
	{
		what: "another owner's job, changed",
		target: 'POST /owner/jobs/[id=uuid] ?/withdraw',
		persona: 'otherOwner'
	},
	{
		what: "another owner's booking",
		target: 'GET /owner/bookings/[id=uuid] (page)',
		persona: 'otherOwner'
	},
	{
		what: "another owner's booking, cancelled",
		target: 'POST /owner/bookings/[id=uuid] ?/cancel',
		persona: 'otherOwner'
	},
	{
		what: "another owner's receipt",
		target: 'GET /owner/bookings/[id=uuid]/receipt (page)',
		persona: 'otherOwner'
	},
	{
		what: "another owner's dispute",
		target: 'GET /owner/bookings/[id=uuid]/problem (page)',
		persona: 'otherOwner'
	},
	{
		what: "another owner's dispute, added to",
		target: 'POST /owner/bookings/[id=uuid]/problem ?/addEvidence',
		persona: 'otherOwner'
	},
	{
		what: "another owner's job photo",
		target: 'GET /media/job-photos/[id=uuid]/[variant]',
		persona: 'otherOwner'
	},
	{
		what: "another owner's dispute photo",
		target: 'GET /media/dispute-photos/[id=uuid]/[variant]',
		persona: 'otherOwner'
	},
	{
		what: "another installer's document",
		target: 'GET /media/installer-documents/[id=uuid]',
		persona: 'otherInstaller',
		answer: 'forbidden'
	},
	{
		what: "another installer's payout",
		target: 'GET /installer/payouts/[id=uuid] (page)',
		persona: 'otherInstaller'
	},
	{
		what: "another installer's fit report",
		target: 'GET /installer/bookings/[id=uuid]/report (page)',
		persona: 'otherInstaller'
	},
	{
		what: "another installer's fit report, filed over",
		target: 'POST /installer/bookings/[id=uuid]/report ?/file',
		persona: 'otherInstaller'
	},
	{
		what: "another installer's fit report photo",
		target: 'GET /media/fit-report-photos/[id=uuid]/[variant]',
		persona: 'otherInstaller'
	},
	{
		what: "another installer's install record",
		target: 'GET /installer/bookings/[id=uuid]/record.pdf',
		persona: 'otherInstaller'
	},
	{
		what: "another installer's dispute answer",
		target: 'POST /installer/bookings/[id=uuid]/dispute ?/respond',
		persona: 'otherInstaller'
	}
];
