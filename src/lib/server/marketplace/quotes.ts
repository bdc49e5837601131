/**
 * Installers' quotes. A quote is written in one transaction that locks the installer's profile (so
 * a suspension or a second tab waits its turn) and shares the job's row lock (so a booking in
 * progress finishes first and the quote then sees it); every revision is kept in quote_revision.
 * Contact details in quote notes are masked until the job is booked with that installer.
 */
import { consumeQuoteSubmission, slowDownMessage } from '../rate-limit';
import { and, asc, eq, gt, inArray, isNull, lt, or } from 'drizzle-orm';
import { maskContactDetails, type MaskedKind } from '$lib/masking';
import { approximateLocation, matchProblem, reachOf } from '$lib/marketplace/matching';
import { priceQuote, quoteProblems, travelFeeCents } from '$lib/marketplace/pricing';
import { quoteGstNote } from '$lib/money/gst';
import { formatAud } from '$lib/money/money';
import type { Interval } from '$lib/work/schedule';
import { db } from '../db';
import {
	booking,
	installerProfile,
	job,
	quote,
	quoteRevision,
	user,
	type QuoteSlot
} from '../db/schema';
import { loadDiary } from '../work/diary';
import { appUrl } from '../mail/app-url';
import { requestQuoteDigest } from '../boss';
import { withMail } from '../mail/outbox';
import { refuse, type Refusal } from '../refusal';
import { installerRatings } from '../work/reviews';
import { jobReach } from './matching';
import { titleOrUntitled } from '$lib/marketplace/posted-job';
import { canQuote } from '$lib/people/vetting';
import { PAYOUTS_NEEDED_TEXT } from '$lib/labels';

/** What an installer sends, in GST-inclusive cents and UTC instants. */
export interface QuoteInput {
	labourCents: number;
	/** Unit price of each part on the job's scope sheet (camera excluded), in scope order. */
	partUnitCents: number[];
	cameraSupplied: boolean;
	/** The camera's price when the installer supplies it. */
	cameraCents: number;
	warrantyMonths: number;
	slots: Interval[];
	message: string | null;
	expiresAt: Date;
}

export type QuoteOutcome =
	{ ok: true; quoteId: string; jobId: string; revision: number; masked: MaskedKind[] } | Refusal;

/**
 * Sends or revises the installer's quote on a job. Refuses, with a message for the installer, a
 * job that is withdrawn, booked or not offered to them, an installer who is not vetted or is
 * paused, a total of $0 or over $20,000, slots outside their hours or clashing with bookings, and
 * an expiry in the past.
 */
export async function submitQuote(
	installerId: string,
	jobId: string,
	input: QuoteInput,
	now = new Date()
): Promise<QuoteOutcome> {
	const throttle = await consumeQuoteSubmission(installerId);
	if (!throttle.allowed) {
		return refuse(429, slowDownMessage('quotes', throttle.retryAfterSeconds));
	}
	return withMail(async (tx, mail) => {
		const [profile] = await tx
			.select()
			.from(installerProfile)
			.where(eq(installerProfile.userId, installerId))
			.for('update');
		if (!profile || profile.vettingStatus !== 'approved') {
			return refuse(403, 'Only vetted installers can quote. Your application is not approved yet.');
		}
		if (profile.pausedReason) {
			return refuse(403, `Your quoting is paused: ${profile.pausedReason}`);
		}
		if (!profile.payoutsEnabled) return refuse(403, PAYOUTS_NEEDED_TEXT);
		// FOR NO KEY UPDATE, not FOR SHARE: the quote's trigger then updates job.live_quotes, and two
		// transactions both holding a share lock and both upgrading it would deadlock.
		const [row] = await tx.select().from(job).where(eq(job.id, jobId)).for('no key update');
		if (!row || row.status === 'drafting') return refuse(404, 'There is no such job.');
		if (row.status === 'withdrawn') {
			return refuse(409, 'The owner withdrew this job, so it takes no more quotes.');
		}
		if (row.status !== 'collecting_quotes') {
			return refuse(409, 'This job is booked already, so it takes no more quotes.');
		}
		const reach = jobReach(row);
		if (!reach || !row.scope) return refuse(404, 'There is no such job.');
		const base = { lat: profile.latitude, lng: profile.longitude };
		const problem = matchProblem(reach, reachOf(profile));
		if (problem) return refuse(403, problem.message);

		const [existing] = await tx
			.select()
			.from(quote)
			.where(and(eq(quote.jobId, jobId), eq(quote.installerId, installerId)))
			.for('update');
		if (existing?.status === 'accepted') {
			return refuse(409, 'The owner booked this quote; it can no longer change.');
		}

		const scopeParts = row.scope.parts.filter((p) => p.code !== 'camera');
		if (input.partUnitCents.length !== scopeParts.length) {
			return refuse(400, 'Price every part on the scope sheet (enter 0 for any you include free).');
		}
		const distance = approximateLocation(reach.location, base).distanceKm;
		const travel =
			row.locationMode === 'mobile'
				? travelFeeCents(distance, profile.freeRadiusKm, profile.travelFeeCentsPerKm)
				: 0;
		let priced;
		try {
			priced = priceQuote({
				labour: { label: 'Labour', cents: input.labourCents },
				parts: scopeParts.map((p, i) => ({
					label: p.label,
					quantity: p.quantity,
					unitCents: input.partUnitCents[i] ?? 0
				})),
				camera: input.cameraSupplied
					? { label: 'Camera supplied', cents: input.cameraCents }
					: null,
				travelCents: travel,
				travelLabel: `Travel: ${distance.toFixed(1)} km, ${String(profile.freeRadiusKm)} km free, ${formatAud(profile.travelFeeCentsPerKm)}/km after`,
				gstRegistered: profile.gstRegistered
			});
		} catch {
			return refuse(400, 'Enter every amount as dollars and cents of $0 or more.');
		}
		const diary = await loadDiary(installerId, now, tx);
		const problems = quoteProblems({
			totalCents: priced.totalCents,
			slots: input.slots,
			hours: diary.hours,
			blocked: diary.blocked,
			bookings: diary.bookings,
			timeZone: profile.timeZone,
			expiresAt: input.expiresAt,
			now
		});
		if (
			!Number.isInteger(input.warrantyMonths) ||
			input.warrantyMonths < 0 ||
			input.warrantyMonths > 120
		) {
			problems.push('Warranty on workmanship is a whole number of months, 0 to 120.');
		}
		if (problems.length > 0) return refuse(400, problems[0] ?? 'Check the quote.', { problems });

		const masked = input.message ? maskContactDetails(input.message) : null;
		const slots: QuoteSlot[] = [...input.slots]
			.sort((a, b) => a.start.getTime() - b.start.getTime())
			.map((s) => ({ start: s.start.toISOString(), end: s.end.toISOString() }));
		const values = {
			status: 'live' as const,
			lines: priced.lines,
			labourCents: priced.labourCents,
			partsCents: priced.partsCents,
			travelCents: priced.travelCents,
			totalCents: priced.totalCents,
			gstCents: priced.gstCents,
			gstRegistered: profile.gstRegistered,
			warrantyMonths: input.warrantyMonths,
			cameraSupplied: input.cameraSupplied,
			slots,
			message: masked?.text ?? null,
			distanceKm: distance,
			expiresAt: input.expiresAt,
			updatedAt: now
		};
		const revision = existing ? existing.revision + 1 : 1;
		const [saved] = existing
			? await tx
					.update(quote)
					.set({ ...values, revision })
					.where(eq(quote.id, existing.id))
					.returning({ id: quote.id })
			: await tx
					.insert(quote)
					.values({ ...values, jobId, installerId, revision, createdAt: now })
					.returning({ id: quote.id });
		if (!saved) throw new Error('Quote write returned no row');
		await tx.insert(quoteRevision).values({
			quoteId: saved.id,
			revision,
			snapshot: {
				...values,
				expiresAt: input.expiresAt.toISOString(),
				updatedAt: now.toISOString()
			},
			createdAt: now
		});
		// The owner hears of a burst of quotes in one e-mail (debounced per job).
		mail.afterCommit(() => requestQuoteDigest(jobId));
		return { ok: true, quoteId: saved.id, jobId, revision, masked: masked?.masked ?? [] };
	});
}

/** Withdraws the installer's live quote on an open job. */
export async function withdrawQuote(installerId: string, jobId: string) {
	return db.transaction(async (tx) => {
		await tx.select({ id: job.id }).from(job).where(eq(job.id, jobId)).for('no key update');
		const [row] = await tx
			.update(quote)
			.set({ status: 'withdrawn', updatedAt: new Date() })
			.where(
				and(eq(quote.jobId, jobId), eq(quote.installerId, installerId), eq(quote.status, 'live'))
			)
			.returning({ id: quote.id });
		return row
			? ({ ok: true } as const)
			: refuse(409, 'There is no live quote of yours to withdraw.');
	});
}

/** Every revision of a quote, newest first. */
export function listQuoteRevisions(quoteId: string) {
	return db
		.select()
		.from(quoteRevision)
		.where(eq(quoteRevision.quoteId, quoteId))
		.orderBy(asc(quoteRevision.revision));
}

/** The quotes on an owner's job with what the comparison shows; null when it is not theirs. */
export async function listQuotesForOwner(jobId: string, ownerId: string) {
	const [owned] = await db
		.select({ id: job.id })
		.from(job)
		.where(and(eq(job.id, jobId), eq(job.ownerId, ownerId)));
	if (!owned) return null;
	const rows = await db
		.select({
			quote,
			businessName: installerProfile.businessName,
			suburb: installerProfile.suburb,
			timeZone: installerProfile.timeZone,
			vettingStatus: installerProfile.vettingStatus,
			pausedReason: installerProfile.pausedReason
		})
		.from(quote)
		.innerJoin(installerProfile, eq(installerProfile.userId, quote.installerId))
		.where(eq(quote.jobId, jobId))
		.orderBy(asc(quote.createdAt));
	const installerIds = rows.map((r) => r.quote.installerId);
	const ratings = await installerRatings(installerIds);
	const fits = installerIds.length
		? await db
				.select({ installerId: booking.installerId })
				.from(booking)
				.where(and(inArray(booking.installerId, installerIds), eq(booking.status, 'confirmed')))
		: [];
	return rows.map((r) => ({
		...r.quote,
		businessName: r.businessName,
		suburb: r.suburb,
		installerTimeZone: r.timeZone,
		// A paused (or suspended) installer's open quote stays on file but cannot be booked.
		onHold: r.quote.status === 'live' && !canQuote(r),
		// Confirmed (paid) bookings: the honest count of fits Tapline has seen them take on.
		fitsCompleted: fits.filter((f) => f.installerId === r.quote.installerId).length,
		// Owners' reviews that show now (hidden ones cannot sway the ranking either): the sum of
		// their overall stars, each the plain mean of the review's aspect stars, and how many.
		ratingSum: ratings.get(r.quote.installerId)?.sum ?? 0,
		ratingCount: ratings.get(r.quote.installerId)?.count ?? 0
	}));
}

/**
 * E-mails an owner about quotes that arrived since the last such e-mail, in one message however
 * many came in; marks the job so the next batch starts after them. Idempotent: a second run with
 * nothing new sends nothing.
 * @returns whether an e-mail was queued
 */
export async function sendOwnerQuoteDigest(jobId: string, now = new Date()): Promise<boolean> {
	return withMail(async (tx, mail) => {
		const [row] = await tx
			.select({ job, ownerEmail: user.email, ownerName: user.displayName })
			.from(job)
			.innerJoin(user, eq(user.id, job.ownerId))
			.where(eq(job.id, jobId))
			.for('update', { of: job });
		if (!row || row.job.status !== 'collecting_quotes') return false;
		const since = row.job.quotesNotifiedAt ?? new Date(0);
		const fresh = await tx
			.select({
				totalCents: quote.totalCents,
				gstCents: quote.gstCents,
				gstRegistered: quote.gstRegistered,
				revision: quote.revision,
				businessName: installerProfile.businessName
			})
			.from(quote)
			.innerJoin(installerProfile, eq(installerProfile.userId, quote.installerId))
			.where(and(eq(quote.jobId, jobId), eq(quote.status, 'live'), gt(quote.updatedAt, since)))
			.orderBy(asc(quote.updatedAt));
		if (fresh.length === 0) return false;
		await mail.send(row.ownerEmail, {
			template: 'quotes-received',
			data: {
				displayName: row.ownerName,
				title: titleOrUntitled(row.job.title),
				quotes: fresh.map((q) => ({
					businessName: q.businessName,
					total: formatAud(q.totalCents),
					gst: quoteGstNote(q),
					revised: q.revision > 1
				})),
				url: appUrl(`/owner/jobs/${jobId}/quotes`)
			}
		});
		await tx.update(job).set({ quotesNotifiedAt: now }).where(eq(job.id, jobId));
		return true;
	});
}

/**
 * Open jobs with live quotes that reached no owner e-mail yet and are older than `olderThan`
 * (what a lost enqueue left behind; younger ones still have a batch pending).
 */
export async function listJobsWithUnsentQuotes(olderThan: Date) {
	const rows = await db
		.selectDistinct({ jobId: job.id })
		.from(job)
		.innerJoin(quote, eq(quote.jobId, job.id))
		.where(
			and(
				eq(job.status, 'collecting_quotes'),
				eq(quote.status, 'live'),
				lt(quote.updatedAt, olderThan),
				or(isNull(job.quotesNotifiedAt), gt(quote.updatedAt, job.quotesNotifiedAt))
			)
		)
		.limit(200);
	return rows.map((r) => r.jobId);
}
