/**
 * Vetting: the admins' decisions on installer applications, the vetting queue and review page,
 * and the daily insurance-expiry check. Every decision locks the installer's profile row, checks
 * the standing the admin saw, writes the audit event and queues the e-mail in one transaction.
 */
import {
	and,
	asc,
	count,
	desc,
	eq,
	inArray,
	isNotNull,
	isNull,
	notInArray,
	sql,
	type SQL
} from 'drizzle-orm';
import { isValidAbn } from '$lib/people/abn';
import {
	allowedDecisions,
	approvalProblems,
	DECISIONS_NEEDING_MESSAGE,
	expiryStep,
	insuranceProblems,
	localDate,
	nextStatus,
	stageOf,
	type AdminDecision,
	type Checklist,
	type QueueSort,
	type VettingAction
} from '$lib/people/vetting';
import { db, type Tx } from '../db';
import { getWeeklyHours } from '../work/diary';
import { documentKinds, listInstallerDocuments } from './documents';
import {
	installerProfile,
	insuranceReminder,
	job,
	quote,
	user,
	vettingEvent,
	type InstallerProfile,
	type VettingStatus
} from '../db/schema';
import { DECISION_LABELS } from '$lib/labels';
import { appUrl } from '../mail/app-url';
import { withMail, type Mail } from '../mail/outbox';
import { titleOrUntitled } from '$lib/marketplace/posted-job';
import { refuse, type Refusal } from '../refusal';
import { getMarketSettings } from '../money/settings';
import type { EmailTemplate, VettingMailData } from '../mail/templates';

const statusPageUrl = () => appUrl('/installer');

/** A decision or submission that went through, or why not. */
export type VettingOutcome = { ok: true } | Refusal;

export async function lockProfile(tx: Tx, installerId: string) {
	const [row] = await tx
		.select({
			profile: installerProfile,
			email: user.email,
			displayName: user.displayName,
			closedAt: user.deletedAt
		})
		.from(installerProfile)
		.innerJoin(user, eq(user.id, installerProfile.userId))
		.where(eq(installerProfile.userId, installerId))
		.for('update', { of: installerProfile });
	return row ?? null;
}

export function mailData(row: { displayName: string; profile: InstallerProfile }): VettingMailData {
	return {
		displayName: row.displayName,
		businessName: row.profile.businessName,
		url: statusPageUrl()
	};
}

export async function recordEvent(
	tx: Tx,
	event: {
		installerId: string;
		actorId: string | null;
		action: VettingAction | 'insurance-updated' | 'service-area-moved' | 'account-closed';
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
		return refuse(400, 'Write the message or reason the installer will read.');
	}
	return withMail(async (tx, mail) => {
		const [admin] = await tx
			.select({ role: user.role })
			.from(user)
			.where(eq(user.id, input.adminId));
		if (admin?.role !== 'admin') return refuse(409, 'Only an admin can decide applications.');
		const row = await lockProfile(tx, input.installerId);
		if (!row) return refuse(404, 'There is no such application.');
		if (row.closedAt) {
			return refuse(409, 'This installer closed their account; their record stays as it is.');
		}
		const { profile } = row;
		const stage = stageOf(profile);
		const paused = profile.pausedReason !== null;
		if (stage === 'draft') return refuse(409, 'This application has not been sent yet.');
		if (stage !== input.expectedStatus) {
			return refuse(
				409,
				'Another admin changed this application while you were looking at it. Reload to see where it stands now.'
			);
		}
		const to = nextStatus(stage, input.decision, paused);
		if (!to) {
			return refuse(
				409,
				`“${DECISION_LABELS[input.decision]}” is not possible for an application in this standing.`
			);
		}
		const facts = {
			coverCents: profile.coverCents,
			insuranceExpiresOn: profile.insuranceExpiresOn,
			documentKinds: await documentKinds(tx, input.installerId),
			today: localDate(new Date(), profile.timeZone),
			minCoverCents: (await getMarketSettings(tx)).minPublicLiabilityCents
		};
		if (input.decision === 'approve') {
			const problems = approvalProblems(input.checklist, facts);
			if (!profile.abn || !isValidAbn(profile.abn)) problems.push('The ABN fails the check.');
			if (problems.length > 0) return refuse(400, problems.join(' '));
		}
		if (input.decision === 'reinstate' || input.decision === 'approve-insurance') {
			const problems = insuranceProblems(facts);
			if (problems.length > 0) return refuse(400, problems.join(' '));
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
		await mail.send(row.email, decisionEmail(input.decision, mailData(row), message));
		if (input.decision === 'suspend') await withdrawLiveQuotes(tx, mail, row.profile);
		return { ok: true };
	});
}

/**
 * Withdraws a suspended (or departing) installer's open quotes and tells each owner, in the caller's
 * transaction (the profile row is locked, so no quote or booking of theirs slips in between).
 */
export async function withdrawLiveQuotes(tx: Tx, mail: Mail, profile: InstallerProfile) {
	const withdrawn = await tx
		.update(quote)
		.set({ status: 'withdrawn', updatedAt: new Date() })
		.where(and(eq(quote.installerId, profile.userId), eq(quote.status, 'live')))
		.returning({ jobId: quote.jobId });
	if (withdrawn.length === 0) return;
	const owners = await tx
		.select({ jobId: job.id, title: job.title, email: user.email, displayName: user.displayName })
		.from(job)
		.innerJoin(user, eq(user.id, job.ownerId))
		.where(
			and(
				inArray(
					job.id,
					withdrawn.map((w) => w.jobId)
				),
				isNull(user.deletedAt)
			)
		);
	for (const owner of owners) {
		await mail.send(owner.email, {
			template: 'quote-withdrawn-suspended',
			data: {
				displayName: owner.displayName,
				businessName: profile.businessName,
				title: titleOrUntitled(owner.title),
				url: appUrl(`/owner/jobs/${owner.jobId}/quotes`)
			}
		});
	}
}

export const QUEUE_PAGE_SIZE = 20;

/** Sent applications for the admin queue, filtered by standing, sorted and paginated. */
export async function listVettingQueue(query: {
	status: VettingStatus | null;
	sort: QueueSort;
	page: number;
}) {
	const where = and(
		isNotNull(installerProfile.submittedAt),
		query.status ? eq(installerProfile.vettingStatus, query.status) : undefined,
		// A closed account's application waits for nobody; its record stays on its own page.
		notInArray(
			installerProfile.userId,
			db.select({ id: user.id }).from(user).where(isNotNull(user.deletedAt))
		)
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
		minCoverCents: (await getMarketSettings()).minPublicLiabilityCents,
		abnPassesCheck: row.profile.abn ? isValidAbn(row.profile.abn) : false
	};
}

// ——— Insurance expiry ———

/**
 * The daily insurance check for vetted installers: sends the 30- and 7-day reminders (each once
 * per expiry date: the insurance_reminder primary key refuses a second row) and pauses quoting
 * on the expiry date. Each installer is handled in its own transaction, so one failure does not
 * hold back the rest. Each installer's e-mails are queued with its own changes.
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
	let reminded = 0;
	let paused = 0;
	for (const { id } of candidates) {
		await withMail(async (tx, mail) => {
			const row = await lockProfile(tx, id);
			const expiresOn = row?.profile.insuranceExpiresOn;
			if (!row || row.closedAt || !expiresOn || row.profile.vettingStatus !== 'approved') return;
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
					await mail.send(row.email, {
						template: 'insurance-reminder',
						data: { ...mailData(row), expiresOn, daysBefore: step.remind }
					});
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
				await mail.send(row.email, {
					template: 'insurance-paused',
					data: { ...mailData(row), reason }
				});
			}
		});
	}
	return { reminded, paused };
}
