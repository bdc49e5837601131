/**
 * Installer applications and their vetting: the installer's own details, documents, service area
 * and hours, the admins' decisions, and the daily insurance-expiry check. Every decision locks the
 * installer's profile row, checks the standing the admin saw, writes the audit event and queues
 * the e-mail in one transaction; callers ask for delivery after commit.
 */
import { and, asc, count, desc, eq, inArray, isNotNull, sql, type SQL } from 'drizzle-orm';
import { env } from '$env/dynamic/private';
import { isValidAbn } from '$lib/abn';
import type { WeeklyHours, Weekday } from '$lib/schedule';
import {
	allowedDecisions,
	approvalProblems,
	canViewInstallerDocument,
	DECISIONS_NEEDING_MESSAGE,
	DEFAULT_MIN_PUBLIC_LIABILITY_CENTS,
	expiryStep,
	insuranceProblems,
	localDate,
	missingParts,
	nextStatus,
	QUEUE_SORT_LABELS,
	stageOf,
	type AdminDecision,
	type Checklist,
	type DocumentKind,
	type DocumentViewer,
	type VettingAction,
	type VettingStage
} from '$lib/vetting';
import { db, type Tx } from './db';
import {
	installerBlockedDate,
	installerDocument,
	installerHours,
	installerProfile,
	insuranceReminder,
	user,
	vettingEvent,
	type InstallerProfile,
	type VettingStatus
} from './db/schema';
import { queueEmail } from './mail';
import type { EmailTemplate, VettingMailData } from './mail-templates';
import type { StoredUpload } from './uploads';

/** A suburb and the point the installer works from, as the geocoder or the map gave it. */
export interface BasePlace {
	suburb: string;
	postcode: string;
	latitude: number;
	longitude: number;
}

/** Smallest accepted public liability cover, from MIN_PUBLIC_LIABILITY_CENTS or the default. */
export function minCoverCents(): number {
	const configured = Number(env.MIN_PUBLIC_LIABILITY_CENTS);
	return Number.isSafeInteger(configured) && configured > 0
		? configured
		: DEFAULT_MIN_PUBLIC_LIABILITY_CENTS;
}

const statusPageUrl = () => `${env.ORIGIN ?? 'http://127.0.0.1:3000'}/installer`;

/** A failed decision or submission, with the HTTP status a page should answer with. */
export type VettingProblem = { ok: false; status: 400 | 404 | 409; message: string };
export type VettingOutcome = { ok: true; emailIds: string[] } | VettingProblem;

const problem = (status: VettingProblem['status'], message: string): VettingProblem => ({
	ok: false,
	status,
	message
});

async function lockProfile(tx: Tx, installerId: string) {
	const [row] = await tx
		.select({ profile: installerProfile, email: user.email, displayName: user.displayName })
		.from(installerProfile)
		.innerJoin(user, eq(user.id, installerProfile.userId))
		.where(eq(installerProfile.userId, installerId))
		.for('update', { of: installerProfile });
	return row ?? null;
}

async function documentKinds(tx: Tx | typeof db, installerId: string): Promise<DocumentKind[]> {
	const rows = await tx
		.selectDistinct({ kind: installerDocument.kind })
		.from(installerDocument)
		.where(eq(installerDocument.installerId, installerId));
	return rows.map((r) => r.kind);
}

function mailData(row: { displayName: string; profile: InstallerProfile }): VettingMailData {
	return {
		displayName: row.displayName,
		businessName: row.profile.businessName,
		url: statusPageUrl()
	};
}

async function recordEvent(
	tx: Tx,
	event: {
		installerId: string;
		actorId: string | null;
		action: VettingAction | 'insurance-updated';
		fromStatus: VettingStatus | null;
		toStatus: VettingStatus | null;
		reason?: string | null;
		checklist?: Checklist | null;
	}
) {
	await tx.insert(vettingEvent).values({
		...event,
		reason: event.reason ?? null,
		checklist: event.checklist ?? null
	});
}

// ——— Installer side ———

/** The application as the installer edits it. */
export interface ApplicationInput {
	businessName: string;
	contactName: string;
	phone: string;
	abn: string;
	/** Registered for GST: the installer's quotes carry GST only then. */
	gstRegistered: boolean;
	yearsInTrade: number;
	skills: string[];
	offersMobile: boolean;
	offersWorkshop: boolean;
	workshopAddress: string | null;
}

/** The installer's profile row, or null before the first save. */
export async function getInstallerProfile(installerId: string): Promise<InstallerProfile | null> {
	const [row] = await db
		.select()
		.from(installerProfile)
		.where(eq(installerProfile.userId, installerId));
	return row ?? null;
}

/** Stages in which the installer may change the application itself. */
const EDITABLE_STAGES: readonly VettingStage[] = ['draft', 'waiting_on_installer', 'approved'];

/**
 * Creates the profile on the first save, updates it afterwards. `place` is the geocoded base
 * suburb: required on the first save (the row needs a point), optional later (only when the
 * installer changed the suburb). Once approved, the business name and ABN are what the admin
 * checked and stay as they are.
 */
export async function saveApplication(
	installerId: string,
	input: ApplicationInput,
	place: BasePlace | null
): Promise<'saved' | 'locked' | 'needs-place'> {
	return db.transaction(async (tx) => {
		const [existing] = await tx
			.select({ status: installerProfile.vettingStatus, submittedAt: installerProfile.submittedAt })
			.from(installerProfile)
			.where(eq(installerProfile.userId, installerId))
			.for('update');
		const fields = {
			contactName: input.contactName,
			phone: input.phone,
			// Not locked on approval like the ABN: registration changes as a business grows.
			gstRegistered: input.gstRegistered,
			yearsInTrade: input.yearsInTrade,
			skills: input.skills,
			offersMobile: input.offersMobile,
			offersWorkshop: input.offersWorkshop,
			workshopAddress: input.offersWorkshop ? input.workshopAddress : null,
			...(place
				? {
						suburb: place.suburb,
						postcode: place.postcode,
						latitude: place.latitude,
						longitude: place.longitude
					}
				: {})
		};
		if (!existing) {
			if (!place) return 'needs-place';
			await tx.insert(installerProfile).values({
				userId: installerId,
				businessName: input.businessName,
				abn: input.abn,
				...fields,
				suburb: place.suburb,
				postcode: place.postcode,
				latitude: place.latitude,
				longitude: place.longitude
			});
			return 'saved';
		}
		const stage = stageOf({ vettingStatus: existing.status, submittedAt: existing.submittedAt });
		if (!EDITABLE_STAGES.includes(stage)) return 'locked';
		await tx
			.update(installerProfile)
			.set({
				...fields,
				...(stage === 'approved' ? {} : { businessName: input.businessName, abn: input.abn }),
				updatedAt: new Date()
			})
			.where(eq(installerProfile.userId, installerId));
		return 'saved';
	});
}

/** Insurance details as typed from the certificate. */
export interface InsuranceInput {
	insurer: string;
	policyNumber: string;
	coverCents: number;
	expiresOn: string;
}

/**
 * Saves the insurance details. For a vetted installer a change pauses quoting until an admin
 * approves the new certificate: typed details alone must never extend cover nobody has seen.
 */
export async function saveInsuranceDetails(
	installerId: string,
	input: InsuranceInput
): Promise<{ ok: true; paused: boolean; emailIds: string[] } | VettingProblem> {
	return db.transaction(async (tx) => {
		const row = await lockProfile(tx, installerId);
		if (!row) return problem(404, 'Save your application details first.');
		const { profile } = row;
		const stage = stageOf(profile);
		if (stage === 'applied' || stage === 'rejected') {
			return problem(409, 'Your application is with an admin; it cannot be changed just now.');
		}
		const changed =
			profile.insurer !== input.insurer ||
			profile.policyNumber !== input.policyNumber ||
			profile.coverCents !== input.coverCents ||
			profile.insuranceExpiresOn !== input.expiresOn;
		const pauseNow = changed && stage === 'approved' && profile.pausedReason === null;
		const pausedReason = 'Your new insurance details are waiting for an admin to check them.';
		await tx
			.update(installerProfile)
			.set({
				insurer: input.insurer,
				policyNumber: input.policyNumber,
				coverCents: input.coverCents,
				insuranceExpiresOn: input.expiresOn,
				...(pauseNow ? { pausedReason } : {}),
				updatedAt: new Date()
			})
			.where(eq(installerProfile.userId, installerId));
		const emailIds: string[] = [];
		if (changed && stage === 'approved') {
			await recordEvent(tx, {
				installerId,
				actorId: installerId,
				action: 'insurance-updated',
				fromStatus: profile.vettingStatus,
				toStatus: profile.vettingStatus,
				reason: `New expiry ${input.expiresOn}`
			});
		}
		if (pauseNow) {
			emailIds.push(
				await queueEmail(tx, row.email, {
					template: 'insurance-paused',
					data: { ...mailData(row), reason: pausedReason }
				})
			);
		}
		return { ok: true, paused: pauseNow, emailIds };
	});
}

/** Records an uploaded document against the installer; null when there is no profile yet. */
export async function addInstallerDocument(
	installerId: string,
	kind: DocumentKind,
	stored: StoredUpload
): Promise<string | null> {
	const [exists] = await db
		.select({ id: installerProfile.userId })
		.from(installerProfile)
		.where(eq(installerProfile.userId, installerId));
	if (!exists) return null;
	const [row] = await db
		.insert(installerDocument)
		.values({
			installerId,
			kind,
			objectKey: stored.objectKey,
			thumbKey: stored.thumbKey,
			contentType: stored.contentType,
			bytes: stored.bytes,
			originalName: stored.originalName
		})
		.returning({ id: installerDocument.id });
	return row?.id ?? null;
}

/** An installer's documents, newest first (never the storage keys). */
export async function listInstallerDocuments(installerId: string, kinds?: DocumentKind[]) {
	return db
		.select({
			id: installerDocument.id,
			kind: installerDocument.kind,
			contentType: installerDocument.contentType,
			originalName: installerDocument.originalName,
			bytes: installerDocument.bytes,
			hasThumb: sql<boolean>`${installerDocument.thumbKey} is not null`,
			createdAt: installerDocument.createdAt
		})
		.from(installerDocument)
		.where(
			and(
				eq(installerDocument.installerId, installerId),
				kinds ? inArray(installerDocument.kind, kinds) : undefined
			)
		)
		.orderBy(desc(installerDocument.createdAt));
}

/**
 * A document the viewer may fetch, or why not: 'not-found', 'sign-in' (anonymous) or 'forbidden'.
 * Unknown ids answer 'not-found' only to those who could see a document at all, so ids cannot be
 * probed anonymously.
 */
export async function findViewableDocument(viewer: DocumentViewer | null, id: string) {
	const valid = /^[0-9a-f-]{36}$/i.test(id);
	const [doc] = valid
		? await db
				.select({
					id: installerDocument.id,
					installerId: installerDocument.installerId,
					kind: installerDocument.kind,
					objectKey: installerDocument.objectKey,
					thumbKey: installerDocument.thumbKey,
					contentType: installerDocument.contentType,
					originalName: installerDocument.originalName
				})
				.from(installerDocument)
				.where(eq(installerDocument.id, id))
		: [];
	if (!doc) return viewer ? ('not-found' as const) : ('sign-in' as const);
	const decision = canViewInstallerDocument(viewer, doc);
	return decision === 'allowed' ? doc : decision;
}

/** Service area as set on the map. */
export interface ServiceAreaInput {
	latitude: number;
	longitude: number;
	serviceRadiusKm: number;
	freeRadiusKm: number;
	travelFeeCentsPerKm: number;
	/** The suburb around the new point, when the geocoder knew one. */
	place: BasePlace | null;
}

/** Saves the base point, radius and travel fee; false when there is no profile yet. */
export async function saveServiceArea(
	installerId: string,
	input: ServiceAreaInput
): Promise<boolean> {
	const rows = await db
		.update(installerProfile)
		.set({
			latitude: input.latitude,
			longitude: input.longitude,
			serviceRadiusKm: input.serviceRadiusKm,
			freeRadiusKm: Math.min(input.freeRadiusKm, input.serviceRadiusKm),
			travelFeeCentsPerKm: input.travelFeeCentsPerKm,
			...(input.place ? { suburb: input.place.suburb, postcode: input.place.postcode } : {}),
			updatedAt: new Date()
		})
		.where(eq(installerProfile.userId, installerId))
		.returning({ id: installerProfile.userId });
	return rows.length > 0;
}

const toHhMm = (minute: number) =>
	`${String(Math.floor(minute / 60)).padStart(2, '0')}:${String(minute % 60).padStart(2, '0')}`;
const toMinute = (hhmm: string) => Number(hhmm.slice(0, 2)) * 60 + Number(hhmm.slice(3, 5));

/** The installer's weekly hours as wall-clock blocks, and their zone. */
export async function getWeeklyHours(installerId: string): Promise<WeeklyHours> {
	const rows = await db
		.select()
		.from(installerHours)
		.where(eq(installerHours.installerId, installerId))
		.orderBy(asc(installerHours.weekday), asc(installerHours.startMinute));
	return rows.map((r) => ({
		weekday: r.weekday as Weekday,
		start: toHhMm(r.startMinute),
		end: toHhMm(r.endMinute)
	}));
}

/** Replaces the weekly hours (already validated with validateWeeklyHours). */
export async function saveWeeklyHours(installerId: string, hours: WeeklyHours): Promise<void> {
	await db.transaction(async (tx) => {
		await tx.delete(installerHours).where(eq(installerHours.installerId, installerId));
		if (hours.length === 0) return;
		await tx.insert(installerHours).values(
			hours.map((h) => ({
				installerId,
				weekday: h.weekday,
				startMinute: toMinute(h.start),
				endMinute: toMinute(h.end)
			}))
		);
	});
}

/** Local dates the installer does not work, soonest first. */
export async function listBlockedDates(installerId: string) {
	return db
		.select({ day: installerBlockedDate.day, note: installerBlockedDate.note })
		.from(installerBlockedDate)
		.where(eq(installerBlockedDate.installerId, installerId))
		.orderBy(asc(installerBlockedDate.day));
}

/** Blocks a local date (a second block of the same date just updates its note). */
export async function blockDate(installerId: string, day: string, note: string | null) {
	await db
		.insert(installerBlockedDate)
		.values({ installerId, day, note })
		.onConflictDoUpdate({
			target: [installerBlockedDate.installerId, installerBlockedDate.day],
			set: { note }
		});
}

/** Unblocks a local date. */
export async function unblockDate(installerId: string, day: string) {
	await db
		.delete(installerBlockedDate)
		.where(
			and(eq(installerBlockedDate.installerId, installerId), eq(installerBlockedDate.day, day))
		);
}

/** Everything the installer's status page shows. */
export async function getApplicationStatus(installerId: string) {
	const profile = await getInstallerProfile(installerId);
	const [kinds, [hours], [lastMessage]] = await Promise.all([
		documentKinds(db, installerId),
		db
			.select({ n: count() })
			.from(installerHours)
			.where(eq(installerHours.installerId, installerId)),
		profile
			? db
					.select({
						action: vettingEvent.action,
						reason: vettingEvent.reason,
						at: vettingEvent.createdAt
					})
					.from(vettingEvent)
					.where(
						and(
							eq(vettingEvent.installerId, installerId),
							inArray(vettingEvent.action, ['request-info', 'reject', 'suspend'])
						)
					)
					.orderBy(desc(vettingEvent.createdAt))
					.limit(1)
			: []
	]);
	const missing = missingParts({
		hasProfile: profile !== null,
		abn: profile?.abn ?? null,
		phone: profile?.phone ?? null,
		skills: profile?.skills ?? [],
		insurer: profile?.insurer ?? null,
		insuranceExpiresOn: profile?.insuranceExpiresOn ?? null,
		coverCents: profile?.coverCents ?? null,
		documentKinds: kinds,
		hoursCount: hours?.n ?? 0
	});
	return {
		profile,
		stage: profile ? stageOf(profile) : ('draft' as const),
		missing,
		lastMessage: lastMessage ?? null
	};
}

/**
 * Sends the application (first time, or again after an admin asked for more). Refuses while
 * anything is missing or when the application is not the installer's to send.
 */
export async function submitApplication(installerId: string): Promise<VettingOutcome> {
	const status = await getApplicationStatus(installerId);
	if (!status.profile) return problem(404, 'Fill in the application first.');
	if (status.missing.length > 0) {
		return problem(400, `Still missing: ${status.missing.map((m) => m.what).join('; ')}.`);
	}
	return db.transaction(async (tx) => {
		const row = await lockProfile(tx, installerId);
		if (!row) return problem(404, 'Fill in the application first.');
		const stage = stageOf(row.profile);
		const to = nextStatus(stage, 'submit');
		if (!to) return problem(409, 'This application has already been sent.');
		await tx
			.update(installerProfile)
			.set({ vettingStatus: to, submittedAt: new Date(), updatedAt: new Date() })
			.where(eq(installerProfile.userId, installerId));
		await recordEvent(tx, {
			installerId,
			actorId: installerId,
			action: 'submit',
			fromStatus: stage === 'draft' ? null : stage,
			toStatus: to
		});
		const emailId = await queueEmail(tx, row.email, {
			template: 'vetting-received',
			data: mailData(row)
		});
		return { ok: true, emailIds: [emailId] };
	});
}

// ——— Admin side ———

/** One admin decision, with the standing the admin was looking at when they made it. */
export interface DecisionInput {
	adminId: string;
	installerId: string;
	decision: AdminDecision;
	expectedStatus: VettingStatus;
	message: string | null;
	checklist: Checklist;
}

function decisionEmail(
	decision: AdminDecision,
	data: VettingMailData,
	message: string
): EmailTemplate {
	switch (decision) {
		case 'approve':
			return { template: 'vetting-approved', data };
		case 'request-info':
			return { template: 'vetting-more-info', data: { ...data, message } };
		case 'reject':
			return { template: 'vetting-rejected', data: { ...data, reason: message } };
		case 'suspend':
			return { template: 'vetting-suspended', data: { ...data, reason: message } };
		case 'reinstate':
			return { template: 'vetting-reinstated', data };
		case 'approve-insurance':
			return { template: 'insurance-approved', data };
	}
}

/**
 * Applies an admin's decision. Locks the profile row (SELECT … FOR UPDATE), so two admins
 * deciding at once are served one after the other; the second finds the standing changed and
 * gets a 409 instead of overwriting the first decision.
 */
export async function decideApplication(input: DecisionInput): Promise<VettingOutcome> {
	const message = input.message?.trim() ?? '';
	if (DECISIONS_NEEDING_MESSAGE.includes(input.decision) && message === '') {
		return problem(400, 'Write the message or reason the installer will read.');
	}
	return db.transaction(async (tx) => {
		const [admin] = await tx
			.select({ role: user.role })
			.from(user)
			.where(eq(user.id, input.adminId));
		if (admin?.role !== 'admin') return problem(409, 'Only an admin can decide applications.');
		const row = await lockProfile(tx, input.installerId);
		if (!row) return problem(404, 'There is no such application.');
		const { profile } = row;
		const stage = stageOf(profile);
		const paused = profile.pausedReason !== null;
		if (stage === 'draft') return problem(409, 'This application has not been sent yet.');
		if (stage !== input.expectedStatus) {
			return problem(
				409,
				'Another admin changed this application while you were looking at it. Reload to see where it stands now.'
			);
		}
		const to = nextStatus(stage, input.decision, paused);
		if (!to) {
			return problem(
				409,
				`“${input.decision}” is not possible for an application in this standing.`
			);
		}
		const facts = {
			coverCents: profile.coverCents,
			insuranceExpiresOn: profile.insuranceExpiresOn,
			documentKinds: await documentKinds(tx, input.installerId),
			today: localDate(new Date(), profile.timeZone),
			minCoverCents: minCoverCents()
		};
		if (input.decision === 'approve') {
			const problems = approvalProblems(input.checklist, facts);
			if (!profile.abn || !isValidAbn(profile.abn)) problems.push('The ABN fails the check.');
			if (problems.length > 0) return problem(400, problems.join(' '));
		}
		if (input.decision === 'reinstate' || input.decision === 'approve-insurance') {
			const problems = insuranceProblems(facts);
			if (problems.length > 0) return problem(400, problems.join(' '));
		}
		const liftsPause = ['approve', 'reinstate', 'approve-insurance'].includes(input.decision);
		await tx
			.update(installerProfile)
			.set({
				vettingStatus: to,
				...(liftsPause ? { pausedReason: null } : {}),
				updatedAt: new Date()
			})
			.where(eq(installerProfile.userId, input.installerId));
		await recordEvent(tx, {
			installerId: input.installerId,
			actorId: input.adminId,
			action: input.decision,
			fromStatus: stage,
			toStatus: to,
			reason: message || null,
			checklist: input.decision === 'approve' ? input.checklist : null
		});
		const emailId = await queueEmail(
			tx,
			row.email,
			decisionEmail(input.decision, mailData(row), message)
		);
		return { ok: true, emailIds: [emailId] };
	});
}

export const QUEUE_SORTS = Object.keys(QUEUE_SORT_LABELS) as (keyof typeof QUEUE_SORT_LABELS)[];
export type QueueSort = (typeof QUEUE_SORTS)[number];
export const QUEUE_PAGE_SIZE = 20;

/** Sent applications for the admin queue, filtered by standing, sorted and paginated. */
export async function listVettingQueue(query: {
	status: VettingStatus | null;
	sort: QueueSort;
	page: number;
}) {
	const where = and(
		isNotNull(installerProfile.submittedAt),
		query.status ? eq(installerProfile.vettingStatus, query.status) : undefined
	);
	const order: SQL[] = {
		oldest: [asc(installerProfile.submittedAt)],
		newest: [desc(installerProfile.submittedAt)],
		name: [asc(installerProfile.businessName)],
		expiry: [sql`${installerProfile.insuranceExpiresOn} asc nulls last`]
	}[query.sort];
	const [rows, [total]] = await Promise.all([
		db
			.select({
				id: installerProfile.userId,
				businessName: installerProfile.businessName,
				contactName: installerProfile.contactName,
				suburb: installerProfile.suburb,
				status: installerProfile.vettingStatus,
				pausedReason: installerProfile.pausedReason,
				submittedAt: installerProfile.submittedAt,
				insuranceExpiresOn: installerProfile.insuranceExpiresOn
			})
			.from(installerProfile)
			.where(where)
			.orderBy(...order, asc(installerProfile.userId))
			.limit(QUEUE_PAGE_SIZE)
			.offset((query.page - 1) * QUEUE_PAGE_SIZE),
		db.select({ n: count() }).from(installerProfile).where(where)
	]);
	const n = total?.n ?? 0;
	return {
		rows,
		total: n,
		page: query.page,
		pageCount: Math.max(1, Math.ceil(n / QUEUE_PAGE_SIZE))
	};
}

/** Everything the admin's application page shows, or null for an unknown installer. */
export async function getApplicationForReview(installerId: string) {
	const [row] = await db
		.select({ profile: installerProfile, email: user.email, displayName: user.displayName })
		.from(installerProfile)
		.innerJoin(user, eq(user.id, installerProfile.userId))
		.where(eq(installerProfile.userId, installerId));
	if (!row) return null;
	const [documents, events, hours] = await Promise.all([
		listInstallerDocuments(installerId),
		db
			.select({
				id: vettingEvent.id,
				action: vettingEvent.action,
				fromStatus: vettingEvent.fromStatus,
				toStatus: vettingEvent.toStatus,
				reason: vettingEvent.reason,
				checklist: vettingEvent.checklist,
				createdAt: vettingEvent.createdAt,
				actorName: user.displayName
			})
			.from(vettingEvent)
			.leftJoin(user, eq(user.id, vettingEvent.actorId))
			.where(eq(vettingEvent.installerId, installerId))
			.orderBy(desc(vettingEvent.createdAt)),
		getWeeklyHours(installerId)
	]);
	const stage = stageOf(row.profile);
	const paused = row.profile.pausedReason !== null;
	return {
		...row,
		stage,
		documents,
		events,
		hours,
		decisions: allowedDecisions(stage, paused),
		today: localDate(new Date(), row.profile.timeZone),
		minCoverCents: minCoverCents(),
		abnPassesCheck: row.profile.abn ? isValidAbn(row.profile.abn) : false
	};
}

// ——— Public profile ———

/**
 * What anyone may see of an installer: never the base point, address, contact details or
 * documents other than gallery photos. Only approved installers have a public profile; the
 * installer themself and admins may preview it before then.
 */
export async function getPublicProfile(installerId: string, viewer: DocumentViewer | null) {
	const [row] = await db
		.select({
			id: installerProfile.userId,
			businessName: installerProfile.businessName,
			suburb: installerProfile.suburb,
			skills: installerProfile.skills,
			offersMobile: installerProfile.offersMobile,
			offersWorkshop: installerProfile.offersWorkshop,
			serviceRadiusKm: installerProfile.serviceRadiusKm,
			yearsInTrade: installerProfile.yearsInTrade,
			vettingStatus: installerProfile.vettingStatus,
			pausedReason: installerProfile.pausedReason
		})
		.from(installerProfile)
		.where(eq(installerProfile.userId, installerId));
	if (!row) return null;
	const mayPreview = viewer?.role === 'admin' || viewer?.id === installerId;
	if (row.vettingStatus !== 'approved' && !mayPreview) return null;
	const gallery = await listInstallerDocuments(installerId, ['gallery']);
	const { pausedReason, vettingStatus, ...shown } = row;
	return {
		...shown,
		vetted: vettingStatus === 'approved' && pausedReason === null,
		gallery: gallery.map((g) => ({ id: g.id, name: g.originalName }))
	};
}

// ——— Insurance expiry ———

/**
 * The daily insurance check for vetted installers: sends the 30- and 7-day reminders (each once
 * per expiry date: the insurance_reminder primary key refuses a second row) and pauses quoting
 * on the expiry date. Each installer is handled in its own transaction, so one failure does not
 * hold back the rest. Returns the queued e-mail ids for delivery after commit.
 */
export async function runInsuranceExpiryCheck(now: Date = new Date()) {
	const candidates = await db
		.select({ id: installerProfile.userId })
		.from(installerProfile)
		.where(
			and(
				eq(installerProfile.vettingStatus, 'approved'),
				isNotNull(installerProfile.insuranceExpiresOn)
			)
		);
	const emailIds: string[] = [];
	let reminded = 0;
	let paused = 0;
	for (const { id } of candidates) {
		await db.transaction(async (tx) => {
			const row = await lockProfile(tx, id);
			const expiresOn = row?.profile.insuranceExpiresOn;
			if (!row || !expiresOn || row.profile.vettingStatus !== 'approved') return;
			const sent = await tx
				.select({ daysBefore: insuranceReminder.daysBefore })
				.from(insuranceReminder)
				.where(
					and(eq(insuranceReminder.installerId, id), eq(insuranceReminder.expiresOn, expiresOn))
				);
			const step = expiryStep(
				expiresOn,
				now,
				row.profile.timeZone,
				sent.map((s) => s.daysBefore)
			);
			if (step.remind !== null) {
				const inserted = await tx
					.insert(insuranceReminder)
					.values({ installerId: id, expiresOn, daysBefore: step.remind })
					.onConflictDoNothing()
					.returning({ d: insuranceReminder.daysBefore });
				if (inserted.length > 0) {
					reminded++;
					emailIds.push(
						await queueEmail(tx, row.email, {
							template: 'insurance-reminder',
							data: { ...mailData(row), expiresOn, daysBefore: step.remind }
						})
					);
				}
			}
			if (step.lapsed && row.profile.pausedReason === null) {
				const reason = `Your public liability insurance expired on ${expiresOn}, so quoting is paused.`;
				await tx
					.update(installerProfile)
					.set({ pausedReason: reason, updatedAt: new Date() })
					.where(eq(installerProfile.userId, id));
				await recordEvent(tx, {
					installerId: id,
					actorId: null,
					action: 'pause',
					fromStatus: 'approved',
					toStatus: 'approved',
					reason
				});
				paused++;
				emailIds.push(
					await queueEmail(tx, row.email, {
						template: 'insurance-paused',
						data: { ...mailData(row), reason }
					})
				);
			}
		});
	}
	return { reminded, paused, emailIds };
}
