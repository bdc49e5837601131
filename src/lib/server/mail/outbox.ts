/**
 * Outgoing e-mail. A change and the e-mails it causes share one transaction: `withMail` opens it,
 * hands the work a `Mail` whose `send` writes the message to the `email_outbox` table, and after
 * commit asks the background worker (see `queue.ts`) to deliver, with retries and back-off. Nothing
 * is left for callers to remember; a lost request is caught by the sweeper. Delivery
 * locks the row and marks it sent in the same transaction, so two workers never both send it; the
 * Message-ID is derived from the row id, so a rare resend after a crash mid-send is recognisable as
 * the same message by the receiving server.
 */
import { and, eq, isNull, lt, or, sql } from 'drizzle-orm';
import nodemailer, { type Transporter } from 'nodemailer';
import { env } from '$env/dynamic/private';
import { requestEmailDelivery } from '../boss';
import { db, type Tx } from '../db';
import { emailOutbox, user } from '../db/schema';
import { renderEmail, type EmailTemplate } from './templates';

/** After this many failed attempts a message stays in the outbox for an admin to look at. */
export const MAX_DELIVERY_ATTEMPTS = 10;

let transport: Transporter | undefined;

function getTransport(): Transporter {
	transport ??= nodemailer.createTransport({
		host: env.SMTP_HOST ?? '127.0.0.1',
		port: Number(env.SMTP_PORT ?? 2525),
		secure: env.SMTP_SECURE === 'true',
		ignoreTLS: env.SMTP_SECURE !== 'true' && env.SMTP_REQUIRE_TLS !== 'true',
		auth: env.SMTP_USER ? { user: env.SMTP_USER, pass: env.SMTP_PASSWORD ?? '' } : undefined,
		connectionTimeout: 10_000
	});
	return transport;
}

/** What a change may do besides its own writes: queue e-mail, and ask for work after commit. */
export interface Mail {
	/** Writes a message to the outbox in the change's transaction. */
	send(to: string, message: EmailTemplate): Promise<void>;
	/** Runs `task` once the transaction has committed (never if it rolls back). */
	afterCommit(task: () => Promise<void>): void;
}

/**
 * Runs `work` in one transaction with a {@link Mail} for the e-mails it causes; after commit, asks
 * for their delivery and runs the after-commit tasks. Returns what `work` returned.
 */
export async function withMail<T>(work: (tx: Tx, mail: Mail) => Promise<T>): Promise<T> {
	const queued: string[] = [];
	const tasks: Array<() => Promise<void>> = [];
	const result = await db.transaction((tx) =>
		work(tx, {
			send: async (to, message) => {
				queued.push(await queueEmail(tx, to, message));
			},
			afterCommit: (task) => {
				tasks.push(task);
			}
		})
	);
	await requestEmailDelivery(queued);
	for (const task of tasks) await task();
	return result;
}

/** Writes a message to the outbox as part of the caller's transaction; returns its id. */
export async function queueEmail(tx: Tx, to: string, message: EmailTemplate): Promise<string> {
	const rendered = renderEmail(message);
	const [row] = await tx
		.insert(emailOutbox)
		.values({ toAddress: to, template: message.template, ...rendered })
		.returning({ id: emailOutbox.id });
	if (!row) throw new Error('Outbox insert returned no row');
	return row.id;
}

/**
 * 'failed' is a permanent rejection (an SMTP 5xx reply): the row is given up at once (attempts set
 * to {@link MAX_DELIVERY_ATTEMPTS}) and every admin is told, since retrying cannot help.
 */
export type DeliveryResult = 'sent' | 'skipped' | 'failed' | { error: string };

/** The SMTP reply code of a failed send (nodemailer's `responseCode`), if the server gave one. */
function smtpReplyCode(err: unknown): number | undefined {
	const code = (err as { responseCode?: unknown } | null)?.responseCode;
	return typeof code === 'number' ? code : undefined;
}

/**
 * Sends one outbox message if it is still unsent and no other worker holds it.
 * Returns the error (after recording it) instead of throwing, so the attempt is counted; a
 * permanent rejection (5xx, RFC 5321 section 4.2.1) is not retried and is reported to the admins.
 */
export async function deliverEmail(id: string): Promise<DeliveryResult> {
	return withMail(async (tx, mail) => {
		const [row] = await tx
			.select()
			.from(emailOutbox)
			.where(and(eq(emailOutbox.id, id), isNull(emailOutbox.sentAt)))
			.for('update', { skipLocked: true });
		if (!row) return 'skipped';
		try {
			await getTransport().sendMail({
				from: env.MAIL_FROM ?? 'Tapline <hello@tapline.test>',
				to: row.toAddress,
				subject: row.subject,
				html: row.html,
				text: row.text,
				messageId: `<${row.id}@tapline.mail>`
			});
		} catch (err) {
			const message = err instanceof Error ? err.message : String(err);
			const code = smtpReplyCode(err);
			if (code !== undefined && code >= 500 && code <= 599) {
				await tx
					.update(emailOutbox)
					.set({
						attempts: MAX_DELIVERY_ATTEMPTS,
						lastError: `Permanent rejection: ${message}`.slice(0, 500)
					})
					.where(eq(emailOutbox.id, id));
				// A notice that itself bounces is not reported again: no loop between admins.
				if (row.template !== 'email-undeliverable') {
					await tellAdmins(tx, mail, { to: row.toAddress, subject: row.subject, reason: message });
				}
				return 'failed';
			}
			await tx
				.update(emailOutbox)
				.set({ attempts: sql`${emailOutbox.attempts} + 1`, lastError: message.slice(0, 500) })
				.where(eq(emailOutbox.id, id));
			return { error: message };
		}
		await tx
			.update(emailOutbox)
			.set({ sentAt: new Date(), attempts: sql`${emailOutbox.attempts} + 1`, lastError: null })
			.where(eq(emailOutbox.id, id));
		return 'sent';
	});
}

/** E-mails every admin that a message could not be delivered. */
async function tellAdmins(
	tx: Tx,
	mail: Mail,
	failed: { to: string; subject: string; reason: string }
): Promise<void> {
	const admins = await tx
		.select({ email: user.email, displayName: user.displayName })
		.from(user)
		.where(and(eq(user.role, 'admin'), isNull(user.deletedAt)));
	for (const admin of admins) {
		await mail.send(admin.email, {
			template: 'email-undeliverable',
			data: {
				displayName: admin.displayName,
				to: failed.to,
				subject: failed.subject,
				reason: failed.reason.slice(0, 300)
			}
		});
	}
}

/** Unsent messages older than `olderThanMs` that have not given up: what the sweeper re-queues. */
export async function listStrandedEmails(olderThanMs: number): Promise<string[]> {
	const cutoff = new Date(Date.now() - olderThanMs);
	const rows = await db
		.select({ id: emailOutbox.id })
		.from(emailOutbox)
		.where(
			and(
				isNull(emailOutbox.sentAt),
				lt(emailOutbox.createdAt, cutoff),
				or(lt(emailOutbox.attempts, MAX_DELIVERY_ATTEMPTS), isNull(emailOutbox.lastError))
			)
		)
		.limit(100);
	return rows.map((r) => r.id);
}
