import { describe, expect, it } from 'vitest';
import {
	ADMIN_DECISIONS,
	allowedDecisions,
	approvalProblems,
	calendarDaysBetween,
	canQuote,
	canViewInstallerDocument,
	DEFAULT_MIN_PUBLIC_LIABILITY_CENTS,
	expiryStep,
	isInsuranceLapsed,
	isProfilePublic,
	localDate,
	missingParts,
	nextStatus,
	stageOf,
	VETTING_STATUSES,
	type ApplicationFacts,
	type VettingAction,
	type VettingStage,
	mayRemoveDocument
} from './vetting';

// Australia/Adelaide facts from the IANA tz database ('australasia', rule AS): UTC+9:30 standard,
// UTC+10:30 daylight; 2026 daylight saving ends Sun 5 April 03:00 → 02:00 local and starts
// Sun 4 October 02:00 → 03:00 local.
const ZONE = 'Australia/Adelaide';

const STAGES: VettingStage[] = [
	'draft',
	'applied',
	'waiting_on_installer',
	'approved',
	'rejected',
	'suspended'
];
const ACTIONS: VettingAction[] = ['submit', ...ADMIN_DECISIONS, 'pause'];

describe('vetting state machine', () => {
	it('allows exactly the intended transitions', () => {
		const allowed: string[] = [];
		for (const stage of STAGES) {
			for (const action of ACTIONS) {
				for (const paused of [false, true]) {
					const to = nextStatus(stage, action, paused);
					if (to) allowed.push(`${stage}${paused ? '(paused)' : ''} -${action}-> ${to}`);
				}
			}
		}
		expect(allowed.sort()).toEqual(
			[
				'draft -submit-> applied',
				'draft(paused) -submit-> applied',
				'waiting_on_installer -submit-> applied',
				'waiting_on_installer(paused) -submit-> applied',
				'applied -approve-> approved',
				'applied(paused) -approve-> approved',
				'waiting_on_installer -approve-> approved',
				'waiting_on_installer(paused) -approve-> approved',
				'applied -request-info-> waiting_on_installer',
				'applied(paused) -request-info-> waiting_on_installer',
				'applied -reject-> rejected',
				'applied(paused) -reject-> rejected',
				'waiting_on_installer -reject-> rejected',
				'waiting_on_installer(paused) -reject-> rejected',
				'approved -suspend-> suspended',
				'approved(paused) -suspend-> suspended',
				'suspended -reinstate-> approved',
				'suspended(paused) -reinstate-> approved',
				'approved(paused) -approve-insurance-> approved',
				'approved -pause-> approved'
			].sort()
		);
	});

	it('refuses the illegal moves an admin or installer might try', () => {
		expect(nextStatus('draft', 'approve')).toBeNull(); // never sent
		expect(nextStatus('approved', 'approve')).toBeNull(); // twice
		expect(nextStatus('approved', 'reject')).toBeNull(); // suspend instead
		expect(nextStatus('rejected', 'approve')).toBeNull(); // rejected is final
		expect(nextStatus('rejected', 'submit')).toBeNull();
		expect(nextStatus('applied', 'submit')).toBeNull(); // already in the queue
		expect(nextStatus('applied', 'suspend')).toBeNull();
		expect(nextStatus('approved', 'reinstate')).toBeNull();
		expect(nextStatus('approved', 'approve-insurance', false)).toBeNull(); // nothing to lift
		expect(nextStatus('approved', 'pause', true)).toBeNull(); // already paused
	});

	it('offers the admin only the open decisions', () => {
		expect(allowedDecisions('applied')).toEqual(['approve', 'request-info', 'reject']);
		expect(allowedDecisions('waiting_on_installer')).toEqual(['approve', 'reject']);
		expect(allowedDecisions('approved')).toEqual(['suspend']);
		expect(allowedDecisions('approved', true)).toEqual(['suspend', 'approve-insurance']);
		expect(allowedDecisions('suspended')).toEqual(['reinstate']);
		expect(allowedDecisions('rejected')).toEqual([]);
		expect(allowedDecisions('draft')).toEqual([]);
	});

	it('reads a never-sent row as a draft and lets only unpaused approved installers quote', () => {
		expect(stageOf({ vettingStatus: 'applied', submittedAt: null })).toBe('draft');
		expect(stageOf({ vettingStatus: 'applied', submittedAt: new Date() })).toBe('applied');
		expect(canQuote({ vettingStatus: 'approved', pausedReason: null })).toBe(true);
		expect(canQuote({ vettingStatus: 'approved', pausedReason: 'lapsed' })).toBe(false);
		expect(canQuote({ vettingStatus: 'suspended', pausedReason: null })).toBe(false);
	});
});

describe('approval rules', () => {
	const ticked = { identityMatches: true, insuranceCurrent: true, abnValidAndActive: true };
	const facts: ApplicationFacts = {
		coverCents: 20_000_000_00,
		insuranceExpiresOn: '2026-12-31',
		documentKinds: ['insurance', 'photo-id'],
		today: '2026-06-01',
		minCoverCents: DEFAULT_MIN_PUBLIC_LIABILITY_CENTS
	};

	it('approves a complete, current application with every box ticked', () => {
		expect(DEFAULT_MIN_PUBLIC_LIABILITY_CENTS).toBe(1_000_000_000); // $10 million in cents
		expect(approvalProblems(ticked, facts)).toEqual([]);
	});

	it('names each unticked check', () => {
		const problems = approvalProblems({ ...ticked, identityMatches: false }, facts);
		expect(problems).toHaveLength(1);
		expect(problems[0]).toContain('Photo ID matches');
	});

	it('refuses cover below the minimum even when ticked', () => {
		const problems = approvalProblems(ticked, { ...facts, coverCents: 5_000_000_00 });
		expect(problems.join(' ')).toMatch(/below the minimum of \$10,000,000/);
		expect(approvalProblems(ticked, { ...facts, coverCents: 10_000_000_00 })).toEqual([]);
	});

	it('refuses a certificate that has expired, or missing documents', () => {
		expect(approvalProblems(ticked, { ...facts, insuranceExpiresOn: '2026-06-01' })).toEqual([
			'The insurance has expired or has no expiry date.'
		]);
		expect(approvalProblems(ticked, { ...facts, documentKinds: ['insurance'] })).toEqual([
			'There is no photo ID.'
		]);
		expect(approvalProblems(ticked, { ...facts, documentKinds: ['photo-id'] })).toEqual([
			'There is no insurance certificate.'
		]);
	});
});

describe('missingParts', () => {
	const complete = {
		hasProfile: true,
		abn: '51824753556',
		phone: '0412345678',
		skills: ['parking-mode'],
		insurer: 'Gumleaf Mutual',
		insuranceExpiresOn: '2027-01-01',
		coverCents: 20_000_000_00,
		documentKinds: ['insurance', 'photo-id'] as const,
		hoursCount: 5
	};

	it('is empty for a complete application and names each gap otherwise', () => {
		expect(missingParts(complete)).toEqual([]);
		expect(missingParts({ ...complete, documentKinds: ['insurance'], hoursCount: 0 })).toEqual([
			{ step: 'documents', what: 'Photo ID' },
			{ step: 'hours', what: 'Your weekly working hours' }
		]);
		expect(missingParts({ ...complete, hasProfile: false }).map((m) => m.step)).toEqual([
			'application',
			'documents',
			'hours'
		]);
	});
});

describe('canViewInstallerDocument', () => {
	const doc = { installerId: 'inst-1', kind: 'insurance' as const, profilePublic: true };

	it('lets the installer and admins in, keeps owners, other installers and anonymous out', () => {
		expect(canViewInstallerDocument({ id: 'inst-1', role: 'installer' }, doc)).toBe('allowed');
		expect(canViewInstallerDocument({ id: 'adm', role: 'admin' }, doc)).toBe('allowed');
		expect(canViewInstallerDocument({ id: 'inst-2', role: 'installer' }, doc)).toBe('forbidden');
		expect(canViewInstallerDocument({ id: 'own', role: 'owner' }, doc)).toBe('forbidden');
		expect(canViewInstallerDocument(null, doc)).toBe('sign-in');
	});

	it('shows gallery photos to anyone while the profile is public', () => {
		const gallery = { installerId: 'inst-1', kind: 'gallery' as const, profilePublic: true };
		expect(canViewInstallerDocument(null, gallery)).toBe('allowed');
		expect(canViewInstallerDocument({ id: 'own', role: 'owner' }, gallery)).toBe('allowed');
	});

	it('keeps gallery photos to the installer and admins while the profile is not public', () => {
		const gallery = { installerId: 'inst-1', kind: 'gallery' as const, profilePublic: false };
		expect(canViewInstallerDocument(null, gallery)).toBe('sign-in');
		expect(canViewInstallerDocument({ id: 'own', role: 'owner' }, gallery)).toBe('forbidden');
		expect(canViewInstallerDocument({ id: 'inst-1', role: 'installer' }, gallery)).toBe('allowed');
		expect(canViewInstallerDocument({ id: 'adm', role: 'admin' }, gallery)).toBe('allowed');
	});

	it('makes only approved profiles public', () => {
		expect(isProfilePublic('approved')).toBe(true);
		for (const status of VETTING_STATUSES.filter((s) => s !== 'approved'))
			expect(isProfilePublic(status)).toBe(false);
		expect(isProfilePublic(null)).toBe(false);
	});
});

describe('local dates around Adelaide daylight saving', () => {
	it('turns an instant into the Adelaide calendar date with the offset in force', () => {
		// 4 Oct 2026 00:00 local is still standard time (+9:30) = 3 Oct 14:30 UTC (IANA tz, rule AS).
		expect(localDate(new Date('2026-10-03T14:29:00Z'), ZONE)).toBe('2026-10-03');
		expect(localDate(new Date('2026-10-03T14:30:00Z'), ZONE)).toBe('2026-10-04');
		// After the jump, midnight of 5 Oct is at +10:30 = 4 Oct 13:30 UTC; a fixed +9:30 would
		// still say 23:00 on the 4th.
		expect(localDate(new Date('2026-10-04T13:29:00Z'), ZONE)).toBe('2026-10-04');
		expect(localDate(new Date('2026-10-04T13:30:00Z'), ZONE)).toBe('2026-10-05');
		// 5 Apr 2026 00:00 local is still daylight time (+10:30) = 4 Apr 13:30 UTC; 6 Apr 00:00 is
		// at +9:30 = 5 Apr 14:30 UTC (IANA tz, rule AS).
		expect(localDate(new Date('2026-04-04T13:30:00Z'), ZONE)).toBe('2026-04-05');
		expect(localDate(new Date('2026-04-05T14:29:00Z'), ZONE)).toBe('2026-04-05');
		expect(localDate(new Date('2026-04-05T14:30:00Z'), ZONE)).toBe('2026-04-06');
	});

	it('counts calendar days, not 24-hour blocks, across a 23- and a 25-hour day', () => {
		// 4 Oct 2026 has 23 hours in Adelaide and 5 Apr 2026 has 25 (IANA tz, rule AS).
		expect(calendarDaysBetween('2026-10-03', '2026-10-05')).toBe(2);
		expect(calendarDaysBetween('2026-04-04', '2026-04-06')).toBe(2);
		expect(calendarDaysBetween('2026-10-11', '2026-10-04')).toBe(-7);
		expect(() => calendarDaysBetween('2026-02-30', '2026-03-01')).toThrow(RangeError);
	});
});

describe('expiryStep', () => {
	// The daily job runs at 06:00 Adelaide time.
	const sixAmOct4 = new Date('2026-10-03T19:30:00Z'); // 06:00 at +10:30 on the 23-hour day
	const sixAmApr5 = new Date('2026-04-04T20:30:00Z'); // 06:00 at +9:30 on the 25-hour day

	it('sends the 7-day reminder on the spring-forward day, counted on local dates', () => {
		// At that moment the UTC date is still 3 October: counting from it would say 8 days and
		// miss the reminder.
		expect(localDate(sixAmOct4, ZONE)).toBe('2026-10-04');
		expect(expiryStep('2026-10-11', sixAmOct4, ZONE)).toEqual({
			daysLeft: 7,
			remind: 7,
			lapsed: false
		});
	});

	it('sends the 30-day reminder across the spring-forward change', () => {
		expect(expiryStep('2026-11-03', sixAmOct4, ZONE)).toEqual({
			daysLeft: 30,
			remind: 30,
			lapsed: false
		});
		expect(expiryStep('2026-11-04', sixAmOct4, ZONE).remind).toBeNull(); // 31 days: not yet
	});

	it('sends the 7-day reminder on the fall-back day', () => {
		expect(localDate(sixAmApr5, ZONE)).toBe('2026-04-05');
		expect(expiryStep('2026-04-12', sixAmApr5, ZONE)).toEqual({
			daysLeft: 7,
			remind: 7,
			lapsed: false
		});
	});

	it('sends each reminder once and catches up a missed day with the nearest one only', () => {
		expect(expiryStep('2026-11-02', sixAmOct4, ZONE).remind).toBe(30); // 29 days, none sent
		expect(expiryStep('2026-11-02', sixAmOct4, ZONE, [30]).remind).toBeNull();
		expect(expiryStep('2026-10-09', sixAmOct4, ZONE).remind).toBe(7); // 5 days: never a late 30
		expect(expiryStep('2026-10-09', sixAmOct4, ZONE, [7]).remind).toBeNull();
	});

	it('lapses from the start of the expiry date, local time', () => {
		// 23:59 on 10 Oct at +10:30 = 13:29 UTC; midnight of 11 Oct = 13:30 UTC.
		expect(expiryStep('2026-10-11', new Date('2026-10-10T13:29:00Z'), ZONE)).toMatchObject({
			daysLeft: 1,
			lapsed: false
		});
		expect(expiryStep('2026-10-11', new Date('2026-10-10T13:30:00Z'), ZONE)).toEqual({
			daysLeft: 0,
			remind: null,
			lapsed: true
		});
		expect(isInsuranceLapsed('2026-10-11', '2026-10-12')).toBe(true);
		expect(isInsuranceLapsed('2026-10-11', '2026-10-10')).toBe(false);
	});
});

describe('mayRemoveDocument', () => {
	it('lets vetting documents go only before sending or while an admin waits on the installer', () => {
		// Source: the product rule in src/lib/people/vetting.ts (an application an admin read keeps its documents).
		expect(mayRemoveDocument('insurance', 'draft')).toBe(true);
		expect(mayRemoveDocument('photo-id', 'waiting_on_installer')).toBe(true);
		expect(mayRemoveDocument('insurance', 'applied')).toBe(false);
		expect(mayRemoveDocument('photo-id', 'approved')).toBe(false);
		expect(mayRemoveDocument('gallery', 'approved')).toBe(true);
	});
});
