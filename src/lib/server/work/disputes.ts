/**
 * Disputes: within the confirmation window the owner raises a problem about reported work
 * ({@link openDispute}); the held funds stay held (the auto-confirm schedule only confirms stage
 * 'reported'); the installer answers with evidence and both sides read one timeline
 * ({@link addDisputeEntry}); an admin who is not party to the booking settles it
 * ({@link settleDispute}): release in full, a partial refund of a stated amount, a full refund, or
 * a return visit on a new date. A settlement moves the money at the provider and posts the ledger
 * in one transaction with the dispute's own rows, the e-mails to both sides and the admin audit;
 * the provider calls carry idempotency keys derived from the dispute, so a retry after a failure
 * pays and refunds once. A settled dispute is never reopened.
 */
import { and, asc, count, desc, eq } from 'drizzle-orm';
import { settlementMoney, type DisputeReason, type SettlementOutcome } from '$lib/work/disputes';
import { DISPUTE_OUTCOME_LABELS, DISPUTE_REASON_LABELS } from '$lib/labels';
import { formatAud } from '$lib/money/money';
import { titleOrUntitled } from '$lib/marketplace/posted-job';
import { formatSlotLabel } from '$lib/work/schedule';
import { formatDayTime } from '$lib/time';
import { checkMove, lockFitBooking } from './completion';
import { db, type Tx } from '../db';
import {
	adminAudit,
	booking,
	dispute,
	disputeEvent,
	disputePhoto,
	installerProfile,
	job,
	notice,
	user,
	type DisputeEventKind
} from '../db/schema';
import type { StoredUpload } from '../files/uploads';
import { heldCents } from '../money/ledger';
import { appUrl } from '../mail/app-url';
import { withMail } from '../mail/outbox';
import { installerOf, lockPayment, refundInTx, releaseInTx } from '../money/payments';
import { refuse, type Refusal } from '../refusal';
import { feeOf, getMarketSettings } from '../money/settings';
import { isProviderOutage } from '../money/stripe';

const NOT_YOURS = 'There is no such booking among yours.';
const NO_DISPUTE = 'There is no such dispute.';
const PROVIDER_DOWN =
	'Our payment provider is not answering just now, so nothing was settled and nothing was written. Try again in a minute.';

/** A photo already stored by the upload pipeline, to attach to a timeline line. */
export type DisputeUpload = Pick<StoredUpload, 'objectKey' | 'thumbKey' | 'bytes'>;

const ownerLink = (bookingId: string) => `/owner/bookings/${bookingId}/problem`;
const installerLink = (bookingId: string) => `/installer/bookings/${bookingId}/dispute`;

async function addEvent(
	tx: Tx,
	disputeId: string,
	kind: DisputeEventKind,
	authorId: string,
	body: string,
	photos: DisputeUpload[],
	now: Date
): Promise<string> {
	const [event] = await tx
		.insert(disputeEvent)
		.values({ disputeId, kind, authorId, body, createdAt: now })
		.returning({ id: disputeEvent.id });
	if (!event) throw new Error('dispute event insert returned no row');
	for (const photo of photos) {
		if (!photo.thumbKey) throw new Error('dispute photos are pictures with a thumbnail');
		await tx.insert(disputePhoto).values({
			disputeId,
			eventId: event.id,
			uploadedBy: authorId,
			objectKey: photo.objectKey,
			thumbKey: photo.thumbKey,
			bytes: photo.bytes,
			createdAt: now
		});
	}
	return event.id;
}

/**
 * The owner raises a problem with reported work, inside the confirmation window: the booking moves
 * to 'disputed' (the funds stay held), the dispute and its first timeline line are written, and
 * the installer is told, in one transaction.
 */
export async function openDispute(
	input: {
		bookingId: string;
		ownerId: string;
		reason: DisputeReason;
		description: string;
		photos?: DisputeUpload[];
	},
	now = new Date()
): Promise<{ ok: true; disputeId: string } | Refusal> {
	return withMail(async (tx, mail) => {
		const row = await lockFitBooking(tx, input.bookingId);
		if (!row || row.booking.ownerId !== input.ownerId) return refuse(404, NOT_YOURS);
		const [settled] = await tx
			.select({ settledAt: dispute.settledAt })
			.from(dispute)
			.where(and(eq(dispute.bookingId, input.bookingId), eq(dispute.status, 'settled')))
			.orderBy(desc(dispute.settledAt))
			.limit(1);
		if (settled && row.booking.stage === 'settled') {
			return refuse(
				409,
				'The problem with this booking was settled by Tapline and cannot be reopened.'
			);
		}
		const check = checkMove(row, 'raise-problem', 'owner', now);
		if (!check.ok) return check;
		const held = await heldCents(tx, input.bookingId);
		const [made] = await tx
			.insert(dispute)
			.values({
				bookingId: input.bookingId,
				openedBy: input.ownerId,
				reason: input.reason,
				description: input.description,
				heldCents: held,
				openedAt: now
			})
			.returning({ id: dispute.id });
		if (!made) throw new Error('dispute insert returned no row');
		await addEvent(
			tx,
			made.id,
			'opened',
			input.ownerId,
			input.description,
			input.photos ?? [],
			now
		);
		await tx.update(booking).set({ stage: check.to }).where(eq(booking.id, input.bookingId));
		const installer = await installerOf(tx, row.booking.installerId);
		const title = titleOrUntitled(row.title);
		const reason = DISPUTE_REASON_LABELS[input.reason];
		await mail.send(installer.email, {
			template: 'dispute-opened',
			data: {
				businessName: installer.businessName,
				title,
				reason: reason.toLowerCase(),
				description: input.description,
				url: appUrl(installerLink(input.bookingId))
			}
		});
		await tx.insert(notice).values([
			{
				userId: row.booking.installerId,
				text: `A problem was raised about the ${title}: ${reason}. Please answer with your evidence.`,
				link: installerLink(input.bookingId)
			},
			{
				userId: input.ownerId,
				text: `Problem raised about the ${title}. The held funds stay held while Tapline looks at it.`,
				link: ownerLink(input.bookingId)
			}
		]);
		return { ok: true as const, disputeId: made.id };
	});
}

/** The dispute with its booking's people, locked for update. */
async function lockDispute(tx: Tx, disputeId: string) {
	const [row] = await tx
		.select({
			dispute,
			ownerId: booking.ownerId,
			installerId: booking.installerId,
			jobTitle: job.title
		})
		.from(dispute)
		.innerJoin(booking, eq(booking.id, dispute.bookingId))
		.innerJoin(job, eq(job.id, booking.jobId))
		.where(eq(dispute.id, disputeId))
		.for('update', { of: dispute });
	return row ?? null;
}

/**
 * The owner adds evidence, or the installer responds, to an open dispute of their booking (text
 * and photos); the other side is told. Another person's dispute is a 404; a settled one a 409.
 */
export async function addDisputeEntry(
	input: {
		bookingId: string;
		userId: string;
		side: 'owner' | 'installer';
		body: string;
		photos?: DisputeUpload[];
	},
	now = new Date()
): Promise<{ ok: true } | Refusal> {
	return withMail(async (tx, mail) => {
		const [latest] = await tx
			.select({ id: dispute.id })
			.from(dispute)
			.innerJoin(booking, eq(booking.id, dispute.bookingId))
			.where(
				and(
					eq(dispute.bookingId, input.bookingId),
					eq(input.side === 'owner' ? booking.ownerId : booking.installerId, input.userId)
				)
			)
			.orderBy(desc(dispute.openedAt))
			.limit(1);
		if (!latest) return refuse(404, 'There is no dispute about a booking of yours here.');
		const row = await lockDispute(tx, latest.id);
		if (!row) return refuse(404, NO_DISPUTE);
		if (row.dispute.status !== 'open') {
			return refuse(409, 'This dispute is settled; nothing more can be added.');
		}
		const kind = input.side === 'owner' ? 'owner_evidence' : 'installer_response';
		await addEvent(tx, row.dispute.id, kind, input.userId, input.body, input.photos ?? [], now);
		const title = titleOrUntitled(row.jobTitle);
		const otherId = input.side === 'owner' ? row.installerId : row.ownerId;
		const [other] = await tx
			.select({ email: user.email, displayName: user.displayName })
			.from(user)
			.where(eq(user.id, otherId));
		const link =
			input.side === 'owner' ? installerLink(input.bookingId) : ownerLink(input.bookingId);
		if (other) {
			await mail.send(other.email, {
				template: 'dispute-added',
				data: {
					greeting: `Hi ${other.displayName}, there is news on the dispute`,
					title,
					who: input.side === 'owner' ? 'The owner' : 'The installer',
					body: input.body,
					url: appUrl(link)
				}
			});
		}
		await tx.insert(notice).values({
			userId: otherId,
			text: `${input.side === 'owner' ? 'The owner' : 'The installer'} added to the dispute about the ${title}.`,
			link
		});
		return { ok: true as const };
	});
}

/** Whether `adminId` is an active admin; and a 403 when they are party to the booking. */
async function adminRefusal(
	tx: Tx,
	adminId: string,
	party: { ownerId: string; installerId: string }
): Promise<Refusal | null> {
	const [me] = await tx
		.select({ role: user.role, deletedAt: user.deletedAt, suspendedAt: user.suspendedAt })
		.from(user)
		.where(eq(user.id, adminId));
	if (!me || me.role !== 'admin' || me.deletedAt || me.suspendedAt) {
		return refuse(403, 'Only an admin can do that.');
	}
	if (adminId === party.ownerId || adminId === party.installerId) {
		return refuse(
			403,
			'You are party to this booking, so another admin has to handle its dispute.'
		);
	}
	return null;
}

/** An admin's note on the timeline (both sides read it), audited. */
export async function addAdminNote(
	disputeId: string,
	adminId: string,
	body: string,
	now = new Date()
): Promise<{ ok: true } | Refusal> {
	return db.transaction(async (tx) => {
		const row = await lockDispute(tx, disputeId);
		if (!row) return refuse(404, NO_DISPUTE);
		const refused = await adminRefusal(tx, adminId, row);
		if (refused) return refused;
		if (row.dispute.status !== 'open') {
			return refuse(409, 'This dispute is settled and cannot be reopened.');
		}
		const eventId = await addEvent(tx, disputeId, 'admin_note', adminId, body, [], now);
		for (const target of [row.ownerId, row.installerId]) {
			await tx.insert(notice).values({
				userId: target,
				text: `Tapline added a note to the dispute about the ${titleOrUntitled(row.jobTitle)}.`,
				link:
					target === row.ownerId
						? ownerLink(row.dispute.bookingId)
						: installerLink(row.dispute.bookingId)
			});
		}
		await tx.insert(adminAudit).values({
			actorId: adminId,
			action: 'dispute-note',
			targetUserId: row.installerId,
			before: null,
			after: { disputeId, bookingId: row.dispute.bookingId, eventId },
			reason: body,
			createdAt: now
		});
		return { ok: true as const };
	});
}

/** What an admin decided. */
export interface Settlement {
	disputeId: string;
	adminId: string;
	outcome: SettlementOutcome;
	/** For a partial refund: the cents back to the owner. */
	refundCents?: number | null;
	/** For a return visit: the new slot. */
	visit?: { start: Date; end: Date } | null;
	/** The admin's explanation, e-mailed to both sides and kept on the timeline. */
	note: string;
}

export type SettleOutcome =
	| {
			ok: true;
			refundCents: number;
			payoutCents: number;
			feeCents: number;
			refundId: string | null;
			transferId: string | null;
	  }
	| Refusal;

/**
 * Settles an open dispute, in one transaction: the money at the provider and in the ledger, the
 * booking's stage, the dispute's outcome and timeline, the e-mails and notices to both sides and
 * the admin audit. The release goes first and the refund second, each with an idempotency key from
 * the dispute: if the provider fails between them, the transaction is rolled back (nothing is
 * written here) and a retry replays the release instead of paying twice. Refusals: 404 unknown,
 * 403 not an admin or party to the booking, 409 already settled (never reopened) or the stage
 * does not allow it, 400 a partial refund not more than $0 and less than the held amount, 503 the
 * provider is down.
 */
export async function settleDispute(s: Settlement, now = new Date()): Promise<SettleOutcome> {
	try {
		return await withMail(async (tx, mail) => {
			const locked = await lockDispute(tx, s.disputeId);
			if (!locked) return refuse(404, NO_DISPUTE);
			const refused = await adminRefusal(tx, s.adminId, locked);
			if (refused) return refused;
			const d = locked.dispute;
			if (d.status !== 'open') {
				return refuse(
					409,
					`This dispute was settled${d.settledAt ? ` on ${formatDayTime(d.settledAt)}` : ''} and cannot be reopened.`
				);
			}
			const row = await lockFitBooking(tx, d.bookingId);
			if (!row) return refuse(404, NO_DISPUTE);
			const move = s.outcome === 'return_visit' ? 'return-visit' : 'settle';
			const check = checkMove(row, move, 'admin', now);
			if (!check.ok) return check;
			const paid = await lockPayment(tx, d.bookingId);
			const held = await heldCents(tx, d.bookingId);
			const money = settlementMoney(
				s.outcome,
				held,
				s.refundCents ?? null,
				feeOf(await getMarketSettings(tx))
			);
			if (!money.ok) return refuse(400, money.message, { fields: { refund: money.message } });
			const installer = await installerOf(tx, row.booking.installerId);
			if (money.releaseCents > 0 && (!installer.payoutAccountId || !installer.payoutsEnabled)) {
				return refuse(409, 'The installer has not finished setting up payouts.');
			}
			if (money.refundCents > 0 && !paid.paymentIntentId) {
				return refuse(409, 'This booking has no payment to refund.');
			}
			const title = titleOrUntitled(row.title);

			if (s.outcome === 'return_visit') {
				const visit = s.visit;
				if (!visit || visit.end.getTime() <= visit.start.getTime()) {
					return refuse(400, 'Choose a day and time for the return visit.');
				}
				if (visit.start.getTime() <= now.getTime()) {
					return refuse(400, 'The return visit has to be in the future.', {
						fields: { visitDate: 'Choose a day from today on' }
					});
				}
				try {
					// A savepoint: the installer's other bookings may already take that time.
					await tx.transaction(async (sp) => {
						await sp
							.update(booking)
							.set({
								stage: check.to,
								slotStart: visit.start,
								slotEnd: visit.end,
								confirmBy: null
							})
							.where(eq(booking.id, d.bookingId));
					});
				} catch (err) {
					if (
						(err as { code?: string }).code === '23P01' ||
						(err as { cause?: { code?: string } }).cause?.code === '23P01'
					) {
						return refuse(409, 'The installer has another booking at that time. Choose another.', {
							fields: { visitTime: 'The installer is booked then' }
						});
					}
					throw err;
				}
			}

			// Release first, then refund (see above); keys derived from the dispute.
			let transferId: string | null = null;
			let payoutCents = 0;
			let feeCents = 0;
			let gstOnFeeCents = 0;
			if (money.releaseCents > 0 && money.split) {
				const released = await releaseInTx(tx, {
					bookingId: d.bookingId,
					amountCents: money.releaseCents,
					payoutAccountId: installer.payoutAccountId!,
					idempotencyKey: `dispute-${d.id}-release-${String(money.releaseCents)}`,
					referenceWithoutTransfer: `dispute-release-without-transfer:${d.id}`,
					now
				});
				transferId = released.transferId;
				payoutCents = released.split.payoutCents;
				feeCents = released.split.feeCents;
				gstOnFeeCents = released.split.gstOnFeeCents;
			}
			let refundId: string | null = null;
			if (money.refundCents > 0) {
				refundId = await refundInTx(
					tx,
					d.bookingId,
					paid.paymentIntentId!,
					money.refundCents,
					`dispute-${d.id}-${String(money.refundCents)}`
				);
			}
			if (s.outcome !== 'return_visit') {
				await tx
					.update(booking)
					.set({ stage: check.to, acceptedAt: now, acceptedBy: 'settlement' })
					.where(eq(booking.id, d.bookingId));
			}
			const settledRow = {
				status: 'settled' as const,
				outcome: s.outcome,
				refundCents: money.refundCents,
				payoutCents,
				feeCents,
				gstOnFeeCents,
				returnVisitStart: s.outcome === 'return_visit' ? (s.visit?.start ?? null) : null,
				returnVisitEnd: s.outcome === 'return_visit' ? (s.visit?.end ?? null) : null,
				settledBy: s.adminId,
				settledAt: now,
				settlementNote: s.note
			};
			await tx.update(dispute).set(settledRow).where(eq(dispute.id, d.id));

			const visitText =
				s.outcome === 'return_visit' && s.visit
					? formatSlotLabel(
							{ start: s.visit.start.toISOString(), end: s.visit.end.toISOString() },
							row.timeZone,
							now
						)
					: null;
			const lines = settlementLines(
				s.outcome,
				held,
				money.refundCents,
				payoutCents,
				feeCents,
				visitText
			);
			await addEvent(tx, d.id, 'settlement', s.adminId, [...lines, s.note].join('\n'), [], now);
			await mail.send(row.ownerEmail, {
				template: 'dispute-settled',
				data: {
					greeting: `Hi ${row.ownerName}, Tapline has settled the problem you raised`,
					title,
					lines,
					note: s.note,
					url: appUrl(ownerLink(d.bookingId))
				}
			});
			await mail.send(installer.email, {
				template: 'dispute-settled',
				data: {
					greeting: `${installer.businessName}, Tapline has settled the dispute`,
					title,
					lines,
					note: s.note,
					url: appUrl(installerLink(d.bookingId))
				}
			});
			const summary = `Dispute about the ${title} settled: ${DISPUTE_OUTCOME_LABELS[s.outcome].toLowerCase()}.`;
			await tx.insert(notice).values([
				{ userId: row.booking.ownerId, text: summary, link: ownerLink(d.bookingId) },
				{ userId: row.booking.installerId, text: summary, link: installerLink(d.bookingId) }
			]);
			// One audit line per person the decision touches, so each account's trail shows it.
			const before = {
				disputeId: d.id,
				bookingId: d.bookingId,
				status: 'open',
				heldCents: held,
				stage: row.booking.stage
			};
			const after = {
				disputeId: d.id,
				bookingId: d.bookingId,
				status: 'settled',
				outcome: s.outcome,
				refundCents: money.refundCents,
				payoutCents,
				feeCents,
				stage: check.to,
				...(s.visit && s.outcome === 'return_visit'
					? { visitStart: s.visit.start.toISOString(), visitEnd: s.visit.end.toISOString() }
					: {})
			};
			await tx.insert(adminAudit).values(
				[row.booking.ownerId, row.booking.installerId].map((targetUserId) => ({
					actorId: s.adminId,
					action: 'dispute-settle',
					targetUserId,
					before,
					after,
					reason: s.note,
					createdAt: now
				}))
			);
			return {
				ok: true as const,
				refundCents: money.refundCents,
				payoutCents,
				feeCents,
				refundId,
				transferId
			};
		});
	} catch (err) {
		if (isProviderOutage(err)) return refuse(503, PROVIDER_DOWN);
		throw err;
	}
}

/** What a settlement did, in words both sides read (e-mail and timeline). */
function settlementLines(
	outcome: SettlementOutcome,
	held: number,
	refund: number,
	payout: number,
	fee: number,
	visit: string | null
): string[] {
	switch (outcome) {
		case 'release':
			return [
				`Decision: the work stands and the ${formatAud(held)} held is released to the installer.`,
				`The installer receives ${formatAud(payout)} after Tapline's fee of ${formatAud(fee)}.`
			];
		case 'partial_refund':
			return [
				`Decision: ${formatAud(refund)} of the ${formatAud(held)} held is refunded to the owner, and the remaining ${formatAud(held - refund)} is released to the installer.`,
				`Tapline's fee of ${formatAud(fee)} is taken from the released part only; the installer receives ${formatAud(payout)}.`,
				'Refunds usually show on the card within 5 to 10 business days.'
			];
		case 'full_refund':
			return [
				`Decision: the ${formatAud(held)} held is refunded in full to the owner. The installer is not paid for this booking.`,
				'Refunds usually show on the card within 5 to 10 business days.'
			];
		case 'return_visit':
			return [
				`Decision: the installer comes back to put the work right${visit ? `, on ${visit}` : ''}.`,
				`The ${formatAud(held)} stays held. After the visit the installer files a new fit report, and the owner again has time to confirm it or raise a problem.`
			];
	}
}

// ------------------------------------------------------------------------------------ reading

/** A dispute's timeline, oldest first, with each line's author and photos. */
async function timelineOf(disputeId: string) {
	const events = await db
		.select({
			id: disputeEvent.id,
			kind: disputeEvent.kind,
			body: disputeEvent.body,
			createdAt: disputeEvent.createdAt,
			authorName: user.displayName,
			authorRole: user.role
		})
		.from(disputeEvent)
		.innerJoin(user, eq(user.id, disputeEvent.authorId))
		.where(eq(disputeEvent.disputeId, disputeId))
		.orderBy(asc(disputeEvent.createdAt), asc(disputeEvent.id));
	const photos = await db
		.select({ id: disputePhoto.id, eventId: disputePhoto.eventId })
		.from(disputePhoto)
		.where(eq(disputePhoto.disputeId, disputeId))
		.orderBy(asc(disputePhoto.createdAt), asc(disputePhoto.id));
	return events.map((e) => ({
		...e,
		photoIds: photos.filter((p) => p.eventId === e.id).map((p) => p.id)
	}));
}

export type DisputeTimeline = Awaited<ReturnType<typeof timelineOf>>;

/**
 * A booking of the owner's or the installer's, as the dispute pages show it: its stage and window,
 * the latest dispute (open or settled) with its timeline. Null when the booking is not theirs.
 */
export async function getDisputeForParty(
	bookingId: string,
	userId: string,
	side: 'owner' | 'installer'
) {
	const [row] = await db
		.select({
			booking,
			title: job.title,
			timeZone: job.timeZone,
			businessName: installerProfile.businessName,
			ownerName: user.displayName
		})
		.from(booking)
		.innerJoin(job, eq(job.id, booking.jobId))
		.innerJoin(installerProfile, eq(installerProfile.userId, booking.installerId))
		.innerJoin(user, eq(user.id, booking.ownerId))
		.where(
			and(
				eq(booking.id, bookingId),
				eq(side === 'owner' ? booking.ownerId : booking.installerId, userId)
			)
		);
	if (!row) return null;
	const [latest] = await db
		.select()
		.from(dispute)
		.where(eq(dispute.bookingId, bookingId))
		.orderBy(desc(dispute.openedAt))
		.limit(1);
	return {
		...row,
		dispute: latest ?? null,
		timeline: latest ? await timelineOf(latest.id) : [],
		held: await heldCents(db, bookingId)
	};
}

/** One dispute for the admin's page: the booking, both people, the money held, the timeline. */
export async function getDisputeForAdmin(disputeId: string) {
	const [row] = await db
		.select({
			dispute,
			booking,
			title: job.title,
			timeZone: job.timeZone,
			businessName: installerProfile.businessName,
			ownerName: user.displayName,
			ownerEmail: user.email
		})
		.from(dispute)
		.innerJoin(booking, eq(booking.id, dispute.bookingId))
		.innerJoin(job, eq(job.id, booking.jobId))
		.innerJoin(installerProfile, eq(installerProfile.userId, booking.installerId))
		.innerJoin(user, eq(user.id, booking.ownerId))
		.where(eq(dispute.id, disputeId));
	if (!row) return null;
	return {
		...row,
		held: await heldCents(db, row.booking.id),
		timeline: await timelineOf(disputeId)
	};
}

/** Page size of the admin's dispute queue. */
export const DISPUTE_PAGE_SIZE = 25;

/**
 * The admin's queue: open disputes oldest first (or settled ones, latest first), a page at a time
 * in SQL on `dispute_status_opened_idx`.
 */
export async function listDisputes(status: 'open' | 'settled', page = 1) {
	const where = eq(dispute.status, status);
	const [rows, [total]] = await Promise.all([
		db
			.select({
				id: dispute.id,
				bookingId: dispute.bookingId,
				reason: dispute.reason,
				openedAt: dispute.openedAt,
				settledAt: dispute.settledAt,
				outcome: dispute.outcome,
				heldCents: dispute.heldCents,
				title: job.title,
				ownerName: user.displayName,
				businessName: installerProfile.businessName
			})
			.from(dispute)
			.innerJoin(booking, eq(booking.id, dispute.bookingId))
			.innerJoin(job, eq(job.id, booking.jobId))
			.innerJoin(user, eq(user.id, booking.ownerId))
			.innerJoin(installerProfile, eq(installerProfile.userId, booking.installerId))
			.where(where)
			.orderBy(
				...(status === 'open'
					? [asc(dispute.openedAt), asc(dispute.id)]
					: [desc(dispute.settledAt), desc(dispute.id)])
			)
			.limit(DISPUTE_PAGE_SIZE)
			.offset((page - 1) * DISPUTE_PAGE_SIZE),
		db.select({ n: count() }).from(dispute).where(where)
	]);
	const n = total?.n ?? 0;
	return { rows, total: n, page, pageCount: Math.max(1, Math.ceil(n / DISPUTE_PAGE_SIZE)) };
}

/** Open disputes, for the count beside the admin navigation. */
export async function countOpenDisputes(): Promise<number> {
	const [row] = await db.select({ n: count() }).from(dispute).where(eq(dispute.status, 'open'));
	return row?.n ?? 0;
}

/**
 * A dispute photo, if `viewer` may see it: the booking's owner and installer, and admins. Anyone
 * else gets null (the route answers 404, so not even its existence leaks).
 */
export async function findViewableDisputePhoto(
	photoId: string,
	viewer: { id: string; role: string }
) {
	const [row] = await db
		.select({
			objectKey: disputePhoto.objectKey,
			thumbKey: disputePhoto.thumbKey,
			ownerId: booking.ownerId,
			installerId: booking.installerId
		})
		.from(disputePhoto)
		.innerJoin(dispute, eq(dispute.id, disputePhoto.disputeId))
		.innerJoin(booking, eq(booking.id, dispute.bookingId))
		.where(eq(disputePhoto.id, photoId));
	if (!row) return null;
	const allowed =
		viewer.role === 'admin' || viewer.id === row.ownerId || viewer.id === row.installerId;
	return allowed ? row : null;
}
