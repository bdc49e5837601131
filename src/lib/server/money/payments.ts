/**
 * Held funds. An owner pays a provisional booking through the provider's hosted checkout; the
 * provider's signed webhook (not the browser's return) confirms the booking, in one transaction
 * with the ledger posting and the event's own row, so a repeated or late event changes nothing.
 * The money stays on the platform until {@link releaseHeldFunds} transfers the total less
 * Tapline's fee to the installer's connected account; refunds and cancellations go back through
 * the provider. Every call that moves money is made while holding the booking's payment row
 * lock, with an idempotency key derived from the booking, and its ledger posting commits with it.
 *
 * Paid after the hold lapsed: the payment revives the booking when the slot and the job are still
 * free (the owner meant to book and nobody else took the time); otherwise it is refunded in full
 * at once and the owner is told why.
 */
import { and, count, eq, inArray, isNotNull, isNull, ne, sql } from 'drizzle-orm';
import { cancellationSettlement, type CancelledBy } from '$lib/money/cancellation';
import { releaseSplit } from '$lib/money/fees';
import { formatAud } from '$lib/money/money';
import { titleOrUntitled } from '$lib/marketplace/posted-job';
import { formatSlotLabel } from '$lib/work/schedule';
import { db, type Tx } from '../db';
import {
	adminAudit,
	booking,
	installerProfile,
	job,
	ledgerTransaction,
	notice,
	payment,
	paymentEvent,
	quote,
	rescheduleProposal,
	user
} from '../db/schema';
import { heldCents, postLedgerTransaction } from './ledger';
import { appUrl } from '../mail/app-url';
import { withMail, type Mail } from '../mail/outbox';
import { refuse, type Refusal } from '../refusal';
import { isProviderOutage, stripe, Stripe, transferGroupOf, webhookSecret } from './stripe';
import { feeOf, getMarketSettings } from './settings';

/** An admin's hand on a money movement: who, and why (kept in `admin_audit` with it). */
export interface AdminNote {
	adminId: string;
	reason: string;
}

/** What starting a payment gives the booking page. */
export type HeldFundsStart =
	{ status: 'redirect'; url: string } | { status: 'unavailable'; message: string };

const PROVIDER_DOWN =
	'Our payment provider is not answering just now. Nothing has been charged; try again in a minute.';

/** Writes an in-app notice for someone, in the caller's transaction. */
async function addNotice(tx: Tx, userId: string, text: string, link: string | null) {
	await tx.insert(notice).values({ userId, text, link });
}

/** The booking with what every step here needs, locked for update. */
async function lockBooking(tx: Tx, bookingId: string) {
	const [row] = await tx
		.select({
			booking,
			title: job.title,
			jobStatus: job.status,
			addressLine: job.addressLine,
			suburb: job.suburb,
			locationMode: job.locationMode,
			timeZone: job.timeZone,
			ownerEmail: user.email,
			ownerName: user.displayName
		})
		.from(booking)
		.innerJoin(job, eq(job.id, booking.jobId))
		.innerJoin(user, eq(user.id, booking.ownerId))
		.where(eq(booking.id, bookingId))
		.for('update', { of: booking });
	return row ?? null;
}

/** The booking's payment row (made when missing), locked for update: every money call holds it. */
export async function lockPayment(tx: Tx, bookingId: string) {
	await tx.insert(payment).values({ bookingId }).onConflictDoNothing();
	const [row] = await tx
		.select()
		.from(payment)
		.where(eq(payment.bookingId, bookingId))
		.for('update');
	if (!row) throw new Error('payment row missing');
	return row;
}

/** An installer's e-mail, business name, zone and payout account. */
export async function installerOf(tx: Tx, installerId: string) {
	const [row] = await tx
		.select({
			email: user.email,
			businessName: installerProfile.businessName,
			timeZone: installerProfile.timeZone,
			payoutAccountId: installerProfile.payoutAccountId,
			payoutsEnabled: installerProfile.payoutsEnabled
		})
		.from(installerProfile)
		.innerJoin(user, eq(user.id, installerProfile.userId))
		.where(eq(installerProfile.userId, installerId));
	if (!row) throw new Error(`installer ${installerId} missing`);
	return row;
}

/**
 * Starts paying a provisional booking into held funds: a hosted checkout for the quote total.
 * An open checkout of the booking is reused, so a second click never makes a second payment.
 */
export async function startHeldFundsPayment(
	bookingId: string,
	now = new Date()
): Promise<HeldFundsStart | Refusal> {
	try {
		return await db.transaction(async (tx) => {
			const row = await lockBooking(tx, bookingId);
			if (!row) return refuse(404, 'There is no such booking.');
			const b = row.booking;
			if (b.status !== 'awaiting_payment' || b.holdExpiresAt.getTime() <= now.getTime()) {
				return refuse(409, 'This booking is not waiting for payment.');
			}
			const paid = await lockPayment(tx, bookingId);
			if (paid.paidAt) return refuse(409, 'This booking is paid; we are confirming it now.');
			if (paid.checkoutSessionId) {
				const open = await stripe().checkout.sessions.retrieve(paid.checkoutSessionId);
				if (open.status === 'open' && open.url)
					return { status: 'redirect' as const, url: open.url };
				if (open.status === 'complete') {
					return refuse(409, 'This booking is paid; we are confirming it now.');
				}
			}
			const installer = await installerOf(tx, b.installerId);
			const title = titleOrUntitled(row.title);
			const session = await stripe().checkout.sessions.create(
				{
					mode: 'payment',
					client_reference_id: bookingId,
					customer_email: row.ownerEmail,
					line_items: [
						{
							quantity: 1,
							price_data: {
								currency: 'aud',
								unit_amount: b.totalCents,
								product_data: { name: `Dash camera fit: ${title}, by ${installer.businessName}` }
							}
						}
					],
					payment_intent_data: {
						transfer_group: transferGroupOf(bookingId),
						metadata: { booking_id: bookingId },
						description: `Tapline booking ${bookingId}`
					},
					metadata: { booking_id: bookingId },
					success_url: appUrl(`/owner/bookings/${bookingId}?paid=1`),
					cancel_url: appUrl(`/owner/bookings/${bookingId}`)
				},
				{
					// One key per checkout the booking opens (the previous one ended or expired).
					idempotencyKey: `checkout-${bookingId}-after-${paid.checkoutSessionId ?? 'none'}`
				}
			);
			if (!session.url) throw new Error('Checkout session without a URL');
			await tx
				.update(payment)
				.set({ checkoutSessionId: session.id, checkoutUrl: session.url })
				.where(eq(payment.bookingId, bookingId));
			return { status: 'redirect' as const, url: session.url };
		});
	} catch (err) {
		if (isProviderOutage(err)) return { status: 'unavailable', message: PROVIDER_DOWN };
		throw err;
	}
}

// ------------------------------------------------------------------------------------ webhooks

/** What the webhook route answers. */
export interface WebhookOutcome {
	status: 200 | 400;
	message: string;
}

/** Seconds a signed timestamp may differ from the clock: the SDK's own default tolerance. */
const SIGNATURE_TOLERANCE_SECONDS = 300;

/**
 * The SDK refuses a timestamp too far in the past only; one too far in the future is refused here,
 * so a delivery signed ahead of time cannot be replayed later.
 */
function refuseFutureTimestamp(signature: string) {
	const signedAt = Number(/(?:^|,)t=(\d+)/.exec(signature)?.[1]);
	if (!Number.isFinite(signedAt)) throw new Error('No timestamp in the signature header');
	if (signedAt - Date.now() / 1000 > SIGNATURE_TOLERANCE_SECONDS) {
		throw new Error('Timestamp outside the tolerance zone (in the future)');
	}
}

/**
 * Verifies and processes one webhook delivery. A bad or stale signature is a 400; an event id
 * seen before is a 200 that changes nothing; anything else is processed in one transaction with
 * its `payment_event` row. An error thrown here is a 500, and the provider retries later.
 */
export async function receivePaymentWebhook(
	rawBody: string,
	signature: string | null,
	now = new Date()
): Promise<WebhookOutcome> {
	let event: Stripe.Event;
	try {
		if (!signature) throw new Error('No Stripe-Signature header');
		event = stripe().webhooks.constructEvent(rawBody, signature, webhookSecret());
		refuseFutureTimestamp(signature);
	} catch (err) {
		return { status: 400, message: err instanceof Error ? err.message : 'Bad signature' };
	}
	const processed = await withMail(async (tx, mail) => {
		const about = bookingIdOf(event);
		const [fresh] = await tx
			.insert(paymentEvent)
			.values({
				eventId: event.id,
				type: event.type,
				// Only a booking that exists: an event about anything else is still recorded.
				bookingId: about
					? sql`(select ${booking.id} from ${booking} where ${booking.id} = ${about})`
					: null
			})
			.onConflictDoNothing()
			.returning({ eventId: paymentEvent.eventId });
		if (!fresh) return false;
		await processEvent(tx, mail, event, now);
		return true;
	});
	return { status: 200, message: processed ? 'processed' : 'already processed' };
}

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/** The booking an event's object names in its metadata (as Tapline sets it), if it is a UUID. */
function bookingIdOf(event: Stripe.Event): string | null {
	const object = event.data.object as { metadata?: Record<string, string> | null };
	const id = object.metadata?.booking_id;
	return id && UUID.test(id) ? id : null;
}

async function processEvent(tx: Tx, mail: Mail, event: Stripe.Event, now: Date): Promise<void> {
	switch (event.type) {
		case 'checkout.session.completed': {
			const session = event.data.object;
			const bookingId = session.metadata?.booking_id;
			const intent =
				typeof session.payment_intent === 'string'
					? session.payment_intent
					: session.payment_intent?.id;
			if (bookingId && intent && session.payment_status === 'paid') {
				await recordPaid(tx, mail, bookingId, intent, session.amount_total ?? 0, now);
			}
			return;
		}
		case 'payment_intent.succeeded': {
			const intent = event.data.object;
			const bookingId = intent.metadata?.booking_id;
			if (bookingId) await recordPaid(tx, mail, bookingId, intent.id, intent.amount_received, now);
			return;
		}
		case 'payment_intent.payment_failed': {
			const intent = event.data.object;
			const bookingId = intent.metadata?.booking_id;
			if (!bookingId) return;
			const row = await lockBooking(tx, bookingId);
			if (!row) return;
			const paid = await lockPayment(tx, bookingId);
			// A failure reported after a success (events can arrive out of order) says nothing new.
			if (paid.paidAt) return;
			await tx
				.update(payment)
				.set({
					paymentIntentId: intent.id,
					lastProblem: intent.last_payment_error?.message ?? 'The payment did not go through.'
				})
				.where(eq(payment.bookingId, bookingId));
			return;
		}
		case 'charge.refunded': {
			await recordOutsideRefund(tx, event.data.object);
			return;
		}
		case 'account.updated': {
			const account = event.data.object;
			// Ask for the account as it is now: events about one account may arrive out of order.
			const current = await stripe().accounts.retrieve(account.id);
			await tx
				.update(installerProfile)
				.set({ payoutsEnabled: current.payouts_enabled === true })
				.where(eq(installerProfile.payoutAccountId, account.id));
			return;
		}
		default:
			// transfer.created, refund.created, charge.* and the rest: the ledger was written when
			// Tapline made the call; the event is only recorded.
			return;
	}
}

/**
 * A refund made outside Tapline (the provider's dashboard) still has to reach the ledger: post
 * whatever the charge says was refunded beyond what the ledger already has for the booking.
 */
async function recordOutsideRefund(tx: Tx, charge: Stripe.Charge): Promise<void> {
	const bookingId = charge.metadata?.booking_id;
	if (!bookingId) return;
	const row = await lockBooking(tx, bookingId);
	if (!row) return;
	await lockPayment(tx, bookingId);
	const [refunded] = await tx
		.execute<{ total: string }>(
			sql`
		select coalesce(sum(e.amount_cents), 0) as total from ledger_entry e
		join ledger_transaction t on t.id = e.transaction_id
		where t.booking_id = ${bookingId} and t.kind = 'refund' and e.account = 'owner_funds_held'`
		)
		.then((r) => r.rows);
	const missing = charge.amount_refunded - Number(refunded?.total ?? 0);
	if (missing <= 0) return;
	await postLedgerTransaction(tx, {
		kind: 'refund',
		bookingId,
		reference: `charge-refunded:${charge.id}:${String(charge.amount_refunded)}`,
		memo: 'Refund made at the payment provider',
		entries: [
			{ account: 'owner_funds_held', amountCents: missing },
			{ account: 'platform_cash', amountCents: -missing }
		]
	});
}

/** The money for a booking arrived: ledger it, then confirm, revive or refund. */
async function recordPaid(
	tx: Tx,
	mail: Mail,
	bookingId: string,
	paymentIntentId: string,
	amountCents: number,
	now: Date
): Promise<void> {
	const row = await lockBooking(tx, bookingId);
	if (!row) return;
	const paid = await lockPayment(tx, bookingId);
	const posted = await postLedgerTransaction(tx, {
		kind: 'payment',
		bookingId,
		reference: paymentIntentId,
		memo: `Owner's payment into held funds`,
		at: now,
		entries: [
			{ account: 'platform_cash', amountCents },
			{ account: 'owner_funds_held', amountCents: -amountCents }
		]
	});
	if (!posted) return; // the other event of the pair got here first
	const intent = await stripe().paymentIntents.retrieve(paymentIntentId);
	const chargeId =
		typeof intent.latest_charge === 'string' ? intent.latest_charge : intent.latest_charge?.id;
	if (paid.paidAt && paid.paymentIntentId !== paymentIntentId) {
		// A second, separate payment for a booking already paid: give it straight back.
		await refundInTx(tx, bookingId, paymentIntentId, amountCents, `duplicate-${paymentIntentId}`);
		return;
	}
	await tx
		.update(payment)
		.set({ paidAt: now, paymentIntentId, chargeId: chargeId ?? null, lastProblem: null })
		.where(eq(payment.bookingId, bookingId));
	const b = row.booking;
	if (b.status === 'awaiting_payment') {
		// Still holding the slot (even if the hold just ran out, the schedule has not freed it).
		await tx.update(booking).set({ status: 'confirmed' }).where(eq(booking.id, bookingId));
		await tellConfirmed(tx, mail, row, null);
		return;
	}
	if (b.status === 'lapsed' && (await revive(tx, mail, row, now))) {
		await tellConfirmed(
			tx,
			mail,
			row,
			'Your payment arrived after the hold had run out, but the time was still free, so we booked it for you.'
		);
		return;
	}
	// Lapsed and taken, or cancelled meanwhile: everything goes back.
	await refundInTx(tx, bookingId, paymentIntentId, amountCents, `after-lapse-${paymentIntentId}`);
	await tx
		.update(payment)
		.set({ refundedAfterLapseAt: now })
		.where(eq(payment.bookingId, bookingId));
	const url = appUrl(`/owner/bookings/${bookingId}`);
	await mail.send(row.ownerEmail, {
		template: 'payment-refunded-after-lapse',
		data: {
			displayName: row.ownerName,
			title: titleOrUntitled(row.title),
			amount: formatAud(amountCents),
			url
		}
	});
	await addNotice(
		tx,
		b.ownerId,
		`Your payment of ${formatAud(amountCents)} for the ${titleOrUntitled(row.title)} came after the hold ran out and the time was taken, so we refunded it in full.`,
		`/owner/bookings/${bookingId}`
	);
}

/**
 * Brings a lapsed booking back when its job still collects quotes with no other live booking and
 * the installer's time is still free (the exclusion constraint decides, inside a savepoint).
 */
async function revive(
	tx: Tx,
	mail: Mail,
	row: NonNullable<Awaited<ReturnType<typeof lockBooking>>>,
	now: Date
): Promise<boolean> {
	const b = row.booking;
	const [j] = await tx
		.select({ status: job.status })
		.from(job)
		.where(eq(job.id, b.jobId))
		.for('update');
	if (j?.status !== 'collecting_quotes') return false;
	const [q] = await tx.select({ status: quote.status }).from(quote).where(eq(quote.id, b.quoteId));
	if (q?.status !== 'live') return false;
	try {
		await tx.transaction(async (sp) => {
			await sp.update(booking).set({ status: 'confirmed' }).where(eq(booking.id, b.id));
		});
	} catch {
		return false; // the installer's time (or the job) was taken meanwhile
	}
	await tx.update(job).set({ status: 'booked', updatedAt: now }).where(eq(job.id, b.jobId));
	await tx.update(quote).set({ status: 'accepted', updatedAt: now }).where(eq(quote.id, b.quoteId));
	const declined = await tx
		.update(quote)
		.set({ status: 'declined', updatedAt: now })
		.where(and(eq(quote.jobId, b.jobId), ne(quote.id, b.quoteId), eq(quote.status, 'live')))
		.returning({ installerId: quote.installerId });
	if (declined.length > 0) {
		const people = await tx
			.select({ email: user.email, businessName: installerProfile.businessName })
			.from(installerProfile)
			.innerJoin(user, eq(user.id, installerProfile.userId))
			.where(
				inArray(
					installerProfile.userId,
					declined.map((d) => d.installerId)
				)
			);
		for (const person of people) {
			await mail.send(person.email, {
				template: 'quote-declined',
				data: {
					businessName: person.businessName,
					title: titleOrUntitled(row.title),
					url: appUrl('/installer/jobs')
				}
			});
		}
	}
	return true;
}

async function tellConfirmed(
	tx: Tx,
	mail: Mail,
	row: NonNullable<Awaited<ReturnType<typeof lockBooking>>>,
	note: string | null
): Promise<void> {
	const b = row.booking;
	const installer = await installerOf(tx, b.installerId);
	const title = titleOrUntitled(row.title);
	const slotRange = { start: b.slotStart.toISOString(), end: b.slotEnd.toISOString() };
	const place =
		row.locationMode === 'workshop'
			? `your workshop (the owner is from ${row.suburb ?? 'nearby'})`
			: [row.addressLine, row.suburb].filter(Boolean).join(', ');
	await mail.send(row.ownerEmail, {
		template: 'payment-confirmed-owner',
		data: {
			displayName: row.ownerName,
			title,
			businessName: installer.businessName,
			slot: formatSlotLabel(slotRange, row.timeZone),
			total: formatAud(b.totalCents),
			note,
			url: appUrl(`/owner/bookings/${b.id}/receipt`)
		}
	});
	await mail.send(installer.email, {
		template: 'payment-confirmed-installer',
		data: {
			businessName: installer.businessName,
			title,
			slot: formatSlotLabel(slotRange, installer.timeZone),
			ownerName: row.ownerName,
			place,
			url: appUrl(`/installer/jobs/${b.jobId}`)
		}
	});
	await addNotice(
		tx,
		b.ownerId,
		`Paid and confirmed: the ${title} with ${installer.businessName}.`,
		`/owner/bookings/${b.id}`
	);
	await addNotice(
		tx,
		b.installerId,
		`Confirmed and paid: the ${title}, ${formatSlotLabel(slotRange, installer.timeZone)}.`,
		`/installer/jobs/${b.jobId}`
	);
}

/**
 * Refunds `amountCents` of a booking's payment at the provider and ledgers it, in `tx` (the caller
 * holds the booking's payment row lock). The idempotency key is `refund-<booking>-<key>`, so a
 * retried call with the same key refunds once; the ledger posting commits with the caller's work.
 * @returns the provider's refund id
 */
export async function refundInTx(
	tx: Tx,
	bookingId: string,
	paymentIntentId: string,
	amountCents: number,
	key: string,
	now?: Date
): Promise<string> {
	const refund = await stripe().refunds.create(
		{
			payment_intent: paymentIntentId,
			amount: amountCents,
			reason: 'requested_by_customer',
			metadata: { booking_id: bookingId }
		},
		{ idempotencyKey: `refund-${bookingId}-${key}` }
	);
	await postLedgerTransaction(tx, {
		kind: 'refund',
		bookingId,
		reference: refund.id,
		memo: 'Refund to the owner',
		at: now,
		entries: [
			{ account: 'owner_funds_held', amountCents },
			{ account: 'platform_cash', amountCents: -amountCents }
		]
	});
	return refund.id;
}

// ------------------------------------------------------------------------------------ release

/** What {@link releaseInTx} needs: how much of the held funds to release, and where to. */
export interface ReleaseInTx {
	bookingId: string;
	/** Cents of the held funds released; Tapline's fee is taken from them, the rest transferred. */
	amountCents: number;
	payoutAccountId: string;
	/** Derived from what asks for the release (the booking, or a dispute), so a retry pays once. */
	idempotencyKey: string;
	/** The ledger reference when the whole amount is fee and nothing is transferred. */
	referenceWithoutTransfer: string;
	now: Date;
}

/**
 * Releases `amountCents` of a booking's held funds in `tx`: Tapline's fee on that amount
 * ({@link releaseSplit}, the settings read in `tx`), one transfer of the rest to the installer
 * with the booking's transfer group, the ledger posting, and the payment row's payout columns.
 * The caller holds the booking's payment row lock and has checked the amount is held.
 */
export async function releaseInTx(tx: Tx, release: ReleaseInTx) {
	const { bookingId, now } = release;
	const split = releaseSplit(release.amountCents, feeOf(await getMarketSettings(tx)));
	let transferId: string | null = null;
	if (split.payoutCents > 0) {
		const transfer = await stripe().transfers.create(
			{
				amount: split.payoutCents,
				currency: 'aud',
				destination: release.payoutAccountId,
				transfer_group: transferGroupOf(bookingId),
				description: `Tapline payout for booking ${bookingId}`,
				metadata: { booking_id: bookingId }
			},
			{ idempotencyKey: release.idempotencyKey }
		);
		transferId = transfer.id;
	}
	await postLedgerTransaction(tx, {
		kind: 'release',
		bookingId,
		reference: transferId ?? release.referenceWithoutTransfer,
		memo: `Released: ${formatAud(split.payoutCents)} to the installer, Tapline's fee ${formatAud(split.feeCents)} (GST ${formatAud(split.gstOnFeeCents)})`,
		at: now,
		entries: [
			{ account: 'owner_funds_held', amountCents: split.totalCents },
			{ account: 'fee_revenue', amountCents: -(split.feeCents - split.gstOnFeeCents) },
			{ account: 'gst_payable', amountCents: -split.gstOnFeeCents },
			{ account: 'installer_payable', amountCents: -split.payoutCents },
			{ account: 'installer_payable', amountCents: split.payoutCents },
			{ account: 'platform_cash', amountCents: -split.payoutCents }
		]
	});
	await tx
		.update(payment)
		.set({
			releaseRequestedAt: sql`coalesce(${payment.releaseRequestedAt}, ${now})`,
			releasedAt: now,
			transferId,
			feeCents: split.feeCents,
			gstOnFeeCents: split.gstOnFeeCents,
			payoutCents: split.payoutCents,
			lastReleaseError: null
		})
		.where(eq(payment.bookingId, bookingId));
	return { split, transferId };
}

export type ReleaseOutcome =
	{ ok: true; transferId: string | null; payoutCents: number; alreadyReleased: boolean } | Refusal;

/**
 * Pays a confirmed booking's held funds to its installer: one transfer of what the booking holds
 * less Tapline's fee, with the booking's transfer group. Exactly once however often it is called
 * (the booking's payment row is locked for the call, the ledger posting commits with it, and the
 * idempotency key is the booking's). When the provider fails, nothing is written but the request
 * and the error; the `held-funds-release` schedule tries again.
 */
export async function releaseHeldFunds(
	bookingId: string,
	now = new Date(),
	audit?: AdminNote
): Promise<ReleaseOutcome> {
	// Asked for in a commit of its own before the provider is called: if the process dies during
	// the call, the release schedule still finds the booking, and the idempotency key makes its
	// retry return the transfer the provider may already have made.
	await db
		.update(payment)
		.set({ releaseRequestedAt: sql`coalesce(${payment.releaseRequestedAt}, ${now})` })
		.where(
			and(
				eq(payment.bookingId, bookingId),
				isNotNull(payment.paidAt),
				isNull(payment.releasedAt),
				sql`exists (select 1 from ${booking} where ${booking.id} = ${bookingId} and ${booking.status} = 'confirmed')`
			)
		);
	try {
		return await withMail(async (tx, mail) => {
			const row = await lockBooking(tx, bookingId);
			if (!row) return refuse(404, 'There is no such booking.');
			const paid = await lockPayment(tx, bookingId);
			if (paid.releasedAt) {
				return {
					ok: true as const,
					transferId: paid.transferId,
					payoutCents: paid.payoutCents ?? 0,
					alreadyReleased: true
				};
			}
			if (row.booking.status !== 'confirmed' || !paid.paidAt) {
				return refuse(409, 'Only a paid, confirmed booking can be paid out.');
			}
			const held = await heldCents(tx, bookingId);
			if (held <= 0) return refuse(409, 'This booking holds nothing to pay out.');
			const installer = await installerOf(tx, row.booking.installerId);
			if (!installer.payoutAccountId || !installer.payoutsEnabled) {
				return refuse(409, 'The installer has not finished setting up payouts.');
			}
			const { split, transferId } = await releaseInTx(tx, {
				bookingId,
				amountCents: held,
				payoutAccountId: installer.payoutAccountId,
				idempotencyKey: `release-${bookingId}`,
				referenceWithoutTransfer: `release-without-transfer:${bookingId}`,
				now
			});
			if (audit) {
				await tx.insert(adminAudit).values({
					actorId: audit.adminId,
					action: 'release',
					targetUserId: row.booking.installerId,
					before: { bookingId, heldCents: held },
					after: {
						bookingId,
						heldCents: 0,
						payoutCents: split.payoutCents,
						feeCents: split.feeCents
					},
					reason: audit.reason,
					createdAt: now
				});
			}
			const title = titleOrUntitled(row.title);
			await mail.send(installer.email, {
				template: 'payout-sent',
				data: {
					businessName: installer.businessName,
					title,
					payout: formatAud(split.payoutCents),
					fee: formatAud(split.feeCents),
					url: appUrl(`/installer/payouts/${bookingId}`)
				}
			});
			await addNotice(
				tx,
				row.booking.installerId,
				`Payout sent: ${formatAud(split.payoutCents)} for the ${title}.`,
				`/installer/payouts/${bookingId}`
			);
			return {
				ok: true as const,
				transferId,
				payoutCents: split.payoutCents,
				alreadyReleased: false
			};
		});
	} catch (err) {
		if (!isProviderOutage(err)) throw err;
		const message = err instanceof Error ? err.message : String(err);
		await db
			.update(payment)
			.set({
				releaseRequestedAt: sql`coalesce(${payment.releaseRequestedAt}, ${now})`,
				lastReleaseError: message
			})
			.where(eq(payment.bookingId, bookingId));
		return refuse(
			503,
			'The payment provider did not answer, so nothing was paid; the payout is retried automatically.'
		);
	}
}

/** Retries every release that was asked for and has not gone through (the schedule's job). */
export async function retryPendingReleases(now = new Date()): Promise<number> {
	const pending = await db
		.select({ bookingId: payment.bookingId })
		.from(payment)
		.where(sql`${payment.releaseRequestedAt} is not null and ${payment.releasedAt} is null`);
	let released = 0;
	for (const p of pending) {
		const result = await releaseHeldFunds(p.bookingId, now);
		if (result.ok && !result.alreadyReleased) released++;
	}
	return released;
}

// ------------------------------------------------------------------------------------ refunds

export type RefundOutcome = { ok: true; refundId: string; heldCents: number } | Refusal;

/**
 * Refunds part or all of what a booking holds (an admin's correction). Never more than is left:
 * the ledger is asked first, and the provider refuses too.
 */
export async function refundHeldFunds(
	bookingId: string,
	amountCents: number,
	audit?: AdminNote
): Promise<RefundOutcome> {
	if (!Number.isSafeInteger(amountCents) || amountCents <= 0) {
		return refuse(400, 'Enter a refund of at least one cent.');
	}
	try {
		return await db.transaction(async (tx) => {
			const row = await lockBooking(tx, bookingId);
			if (!row) return refuse(404, 'There is no such booking.');
			const paid = await lockPayment(tx, bookingId);
			if (!paid.paymentIntentId || !paid.paidAt)
				return refuse(409, 'This booking has not been paid.');
			const held = await heldCents(tx, bookingId);
			if (amountCents > held) {
				return refuse(
					409,
					`That is more than the booking holds: ${formatAud(held)} is left to refund.`
				);
			}
			const refunds = await tx
				.select({ n: count() })
				.from(ledgerTransaction)
				.where(
					and(eq(ledgerTransaction.bookingId, bookingId), eq(ledgerTransaction.kind, 'refund'))
				);
			const refundId = await refundInTx(
				tx,
				bookingId,
				paid.paymentIntentId,
				amountCents,
				`manual-${String(refunds[0]?.n ?? 0)}`
			);
			if (audit) {
				await tx.insert(adminAudit).values({
					actorId: audit.adminId,
					action: 'refund',
					targetUserId: row.booking.ownerId,
					before: { bookingId, heldCents: held },
					after: { bookingId, heldCents: held - amountCents, refundCents: amountCents },
					reason: audit.reason
				});
			}
			return { ok: true as const, refundId, heldCents: held - amountCents };
		});
	} catch (err) {
		if (err instanceof Stripe.errors.StripeInvalidRequestError) return refuse(409, err.message);
		if (isProviderOutage(err)) return refuse(503, PROVIDER_DOWN);
		throw err;
	}
}

export type CancelOutcome =
	{ ok: true; refundCents: number; lateFeeCents: number; rule: string } | Refusal;

/**
 * Cancels a paid booking by its owner or its installer and settles the held funds by
 * {@link cancellationSettlement}: the refund goes back to the owner, a late fee is transferred to
 * the installer, and the job re-opens when the installer cancelled (otherwise it is withdrawn).
 */
export async function cancelPaidBooking(
	bookingId: string,
	by: CancelledBy,
	actorId: string,
	now = new Date()
): Promise<CancelOutcome> {
	try {
		return await withMail(async (tx, mail) => {
			const row = await lockBooking(tx, bookingId);
			const mine =
				row && (by === 'owner' ? row.booking.ownerId : row.booking.installerId) === actorId;
			if (!row || !mine) return refuse(404, 'There is no such booking among yours.');
			const b = row.booking;
			const paid = await lockPayment(tx, bookingId);
			if (b.status !== 'confirmed' || !paid.paidAt || !paid.paymentIntentId) {
				return refuse(409, 'Only a paid, confirmed booking can be cancelled here.');
			}
			if (paid.releasedAt) return refuse(409, 'This booking has been paid out already.');
			if (b.stage !== 'to_fit') {
				return refuse(
					409,
					'The fit has been reported, so the booking can no longer be cancelled: confirm the work or raise a problem instead.'
				);
			}
			const held = await heldCents(tx, bookingId);
			const settlement = cancellationSettlement({
				cancelledBy: by,
				at: now,
				slotStart: b.slotStart,
				heldCents: held,
				lateFeeCents: (await getMarketSettings(tx)).lateCancelFeeCents
			});
			if (settlement.refundCents > 0) {
				await refundInTx(
					tx,
					bookingId,
					paid.paymentIntentId,
					settlement.refundCents,
					'cancellation',
					now
				);
			}
			const installer = await installerOf(tx, b.installerId);
			if (settlement.lateFeeCents > 0) {
				if (!installer.payoutAccountId) throw new Error('installer without payout account');
				const transfer = await stripe().transfers.create(
					{
						amount: settlement.lateFeeCents,
						currency: 'aud',
						destination: installer.payoutAccountId,
						transfer_group: transferGroupOf(bookingId),
						description: `Late-cancellation fee for booking ${bookingId}`,
						metadata: { booking_id: bookingId }
					},
					{ idempotencyKey: `late-fee-${bookingId}` }
				);
				await postLedgerTransaction(tx, {
					kind: 'late_fee',
					bookingId,
					reference: transfer.id,
					memo: 'Late-cancellation fee to the installer',
					at: now,
					entries: [
						{ account: 'owner_funds_held', amountCents: settlement.lateFeeCents },
						{ account: 'platform_cash', amountCents: -settlement.lateFeeCents }
					]
				});
			}
			await tx.update(booking).set({ status: 'cancelled' }).where(eq(booking.id, bookingId));
			// A new time still waiting for an answer has nothing left to move.
			await tx
				.update(rescheduleProposal)
				.set({ status: 'withdrawn', answeredAt: now })
				.where(
					and(eq(rescheduleProposal.bookingId, bookingId), eq(rescheduleProposal.status, 'open'))
				);
			if (settlement.reopenJob) {
				await tx
					.update(job)
					.set({ status: 'collecting_quotes', updatedAt: now })
					.where(eq(job.id, b.jobId));
				await tx
					.update(quote)
					.set({ status: 'withdrawn', updatedAt: now })
					.where(eq(quote.id, b.quoteId));
			} else {
				await tx
					.update(job)
					.set({
						status: 'withdrawn',
						withdrawnAt: now,
						withdrawnReason: 'Booking cancelled by the owner',
						updatedAt: now
					})
					.where(eq(job.id, b.jobId));
			}
			const title = titleOrUntitled(row.title);
			const slot = formatSlotLabel(
				{ start: b.slotStart.toISOString(), end: b.slotEnd.toISOString() },
				row.timeZone
			);
			const money = [
				`Refunded to the owner: ${formatAud(settlement.refundCents)}.`,
				...(settlement.lateFeeCents > 0
					? [`Late-cancellation fee to the installer: ${formatAud(settlement.lateFeeCents)}.`]
					: [])
			];
			await mail.send(row.ownerEmail, {
				template: 'booking-cancelled',
				data: {
					greeting: `Hi ${row.ownerName}, the booking is cancelled`,
					title,
					slot,
					lines: [settlement.rule, ...money],
					url: appUrl(`/owner/bookings/${bookingId}`)
				}
			});
			await mail.send(installer.email, {
				template: 'booking-cancelled',
				data: {
					greeting: `${installer.businessName}, a booking is cancelled`,
					title,
					slot,
					lines: [
						by === 'owner' ? 'The owner cancelled the booking.' : 'You cancelled the booking.',
						...money
					],
					url: appUrl(`/installer/jobs/${b.jobId}`)
				}
			});
			await addNotice(
				tx,
				b.ownerId,
				`Cancelled: the ${title}. ${money.join(' ')}`,
				`/owner/bookings/${bookingId}`
			);
			await addNotice(tx, b.installerId, `Cancelled: the ${title}, ${slot}.`, null);
			return { ok: true as const, ...settlement };
		});
	} catch (err) {
		if (isProviderOutage(err)) return refuse(503, PROVIDER_DOWN);
		throw err;
	}
}
