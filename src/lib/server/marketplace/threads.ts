/**
 * The question-and-answer thread between a job's owner and one installer. Contact details are
 * masked until the job is booked with that installer.
 */
import { consumeMessage, slowDownMessage } from '../rate-limit';
import { and, asc, eq, inArray } from 'drizzle-orm';
import { canQuote } from '$lib/people/vetting';
import { maskContactDetails, type MaskedKind } from '$lib/masking';
import { matchProblem, reachOf } from '$lib/marketplace/matching';
import { unconfirmedEmail } from '../people/confirmed-email';
import { db, type Tx } from '../db';
import { booking, installerProfile, job, jobMessage, quote, user } from '../db/schema';
import { threadMessageSchema } from '$lib/forms/thread';
import { appUrl } from '../mail/app-url';
import { withMail } from '../mail/outbox';
import { NOT_YOUR_JOB, refuse, type Refusal } from '../refusal';
import { jobReach } from './matching';
import { titleOrUntitled } from '$lib/marketplace/posted-job';

/** Who may talk in a thread, and whether contact details are still masked in it. */
async function threadAccess(tx: Tx | typeof db, jobId: string, installerId: string) {
	const [row] = await tx
		.select({
			ownerId: job.ownerId,
			ownerEmail: user.email,
			title: job.title,
			status: job.status,
			latitude: job.latitude,
			longitude: job.longitude,
			locationMode: job.locationMode,
			bodyStyle: job.bodyStyle,
			cameras: job.cameras,
			power: job.power
		})
		.from(job)
		.innerJoin(user, eq(user.id, job.ownerId))
		.where(eq(job.id, jobId));
	if (!row) return null;
	const [profile] = await tx
		.select({
			businessName: installerProfile.businessName,
			email: user.email,
			profile: installerProfile
		})
		.from(installerProfile)
		.innerJoin(user, eq(user.id, installerProfile.userId))
		.where(eq(installerProfile.userId, installerId));
	if (!profile) return null;
	const [hasQuote] = await tx
		.select({ id: quote.id })
		.from(quote)
		.where(and(eq(quote.jobId, jobId), eq(quote.installerId, installerId)));
	const [bookedWith] = await tx
		.select({ id: booking.id, status: booking.status })
		.from(booking)
		.where(
			and(
				eq(booking.jobId, jobId),
				eq(booking.installerId, installerId),
				inArray(booking.status, ['awaiting_payment', 'confirmed'])
			)
		);
	const reach = jobReach(row);
	const p = profile.profile;
	const offered =
		row.status === 'collecting_quotes' &&
		reach !== null &&
		p.vettingStatus === 'approved' &&
		p.pausedReason === null &&
		matchProblem(reach, reachOf(p)) === null;
	return {
		...row,
		businessName: profile.businessName,
		installerEmail: profile.email,
		// A paused or suspended installer may still talk about a job booked with them, nothing else.
		installerMayWrite: Boolean(bookedWith) || (canQuote(p) && (offered || Boolean(hasQuote))),
		installerPaused: !canQuote(p),
		hasQuote: Boolean(hasQuote),
		// Contact details pass unmasked only once the booking is confirmed by payment.
		booked: bookedWith?.status === 'confirmed'
	};
}

/** Why an owner cannot write to an installer who neither quoted on the job nor asked about it. */
export const OWNER_MAY_NOT_MESSAGE =
	'You can message the installers who have quoted on this job. This installer has not quoted or asked about it.';

export type MessageOutcome = { ok: true; masked: MaskedKind[] } | Refusal;

/**
 * Adds a message to the thread between a job's owner and one installer, masking phone numbers,
 * e-mail addresses and links (see CONTACT_PATTERNS) unless a booking with that installer is
 * confirmed by payment, and e-mails the other side.
 * @param author who writes: the job's owner or the installer of the thread
 */
export async function postJobMessage(
	jobId: string,
	installerId: string,
	author: { id: string; role: 'owner' | 'installer' | 'admin' },
	body: string
): Promise<MessageOutcome> {
	const text = body.trim();
	const checked = threadMessageSchema.safeParse({ body });
	if (!checked.success) {
		return refuse(400, checked.error.issues[0]?.message ?? 'Write your message.');
	}
	const throttle = await consumeMessage(author.id);
	if (!throttle.allowed) {
		return refuse(429, slowDownMessage('messages', throttle.retryAfterSeconds));
	}
	return withMail(async (tx, mail) => {
		const access = await threadAccess(tx, jobId, installerId);
		if (!access) return refuse(404, 'There is no such job.');
		const isOwner = author.role === 'owner' && author.id === access.ownerId;
		const isInstaller = author.role === 'installer' && author.id === installerId;
		if (!isOwner && !isInstaller) return refuse(404, 'There is no such job.');
		const unconfirmed = await unconfirmedEmail(tx, author.id);
		if (unconfirmed) return unconfirmed;
		if (isInstaller && !access.installerMayWrite) {
			return refuse(
				403,
				access.installerPaused
					? 'Your quoting is paused, so you cannot send questions to owners until it is lifted.'
					: 'This job is no longer open to you.'
			);
		}
		const [earlier] = await tx
			.select({ id: jobMessage.id })
			.from(jobMessage)
			.where(and(eq(jobMessage.jobId, jobId), eq(jobMessage.installerId, installerId)))
			.limit(1);
		// An owner may start a thread with any installer who quoted, and answer one who asked.
		if (isOwner && !access.hasQuote && !earlier) return refuse(403, OWNER_MAY_NOT_MESSAGE);
		const masked = access.booked ? { text, masked: [] as MaskedKind[] } : maskContactDetails(text);
		await tx.insert(jobMessage).values({
			jobId,
			installerId,
			authorId: author.id,
			body: masked.text,
			masked: masked.masked
		});
		const title = titleOrUntitled(access.title);
		await (isOwner
			? mail.send(access.installerEmail, {
					template: 'job-message',
					data: {
						heading: earlier
							? `The owner of the ${title} replied`
							: `The owner of the ${title} wrote to you`,
						body: masked.text,
						url: appUrl(`/installer/jobs/${jobId}#questions`)
					}
				})
			: mail.send(access.ownerEmail, {
					template: 'job-message',
					data: {
						heading: `${access.businessName} wrote about your ${title}`,
						body: masked.text,
						url: appUrl(`/owner/jobs/${jobId}/quotes/${installerId}`)
					}
				}));
		return { ok: true, masked: masked.masked };
	});
}

/**
 * The thread an owner has with one installer about their job, oldest first, for the owner's
 * "Message" action: a 404 when the job is not the owner's or there is no such installer, a 403
 * when the installer neither quoted on the job nor wrote about it (only they may be messaged).
 */
export async function getOwnerThread(
	jobId: string,
	ownerId: string,
	installerId: string
): Promise<
	| {
			ok: true;
			businessName: string;
			quoted: boolean;
			messages: Awaited<ReturnType<typeof listJobMessages>>;
	  }
	| Refusal
> {
	const [owned] = await db
		.select({ id: job.id })
		.from(job)
		.where(and(eq(job.id, jobId), eq(job.ownerId, ownerId)));
	if (!owned) return refuse(404, NOT_YOUR_JOB);
	const [installer] = await db
		.select({ businessName: installerProfile.businessName, quoteId: quote.id })
		.from(installerProfile)
		.leftJoin(quote, and(eq(quote.installerId, installerProfile.userId), eq(quote.jobId, jobId)))
		.where(eq(installerProfile.userId, installerId));
	if (!installer) return refuse(404, 'There is no such installer.');
	const messages = await listJobMessages(jobId, installerId);
	const quoted = installer.quoteId !== null;
	if (!quoted && messages.length === 0) return refuse(403, OWNER_MAY_NOT_MESSAGE);
	return { ok: true, businessName: installer.businessName, quoted, messages };
}

/** The thread between a job's owner and one installer, oldest first. */
export function listJobMessages(jobId: string, installerId: string) {
	return db
		.select({
			id: jobMessage.id,
			authorId: jobMessage.authorId,
			body: jobMessage.body,
			masked: jobMessage.masked,
			createdAt: jobMessage.createdAt
		})
		.from(jobMessage)
		.where(and(eq(jobMessage.jobId, jobId), eq(jobMessage.installerId, installerId)))
		.orderBy(asc(jobMessage.createdAt));
}

/** Installers who asked about an owner's job without quoting (their threads have no quote row). */
export async function listAskingInstallers(jobId: string) {
	const rows = await db
		.selectDistinct({
			installerId: jobMessage.installerId,
			businessName: installerProfile.businessName
		})
		.from(jobMessage)
		.innerJoin(installerProfile, eq(installerProfile.userId, jobMessage.installerId))
		.where(eq(jobMessage.jobId, jobId));
	const quoted = await db
		.select({ installerId: quote.installerId })
		.from(quote)
		.where(eq(quote.jobId, jobId));
	return rows.filter((r) => !quoted.some((q) => q.installerId === r.installerId));
}
