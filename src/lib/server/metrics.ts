import { count, isNotNull, isNull, and, gt } from 'drizzle-orm';
import { db } from './db';
import { emailOutbox, installerProfile, user } from './db/schema';

/** Headline counts for the admin overview, fetched in parallel. */
export async function getPlatformCounts() {
	const [byRole, byVetting, [unsent], [failing]] = await Promise.all([
		db.select({ role: user.role, n: count() }).from(user).groupBy(user.role),
		db
			.select({ status: installerProfile.vettingStatus, n: count() })
			.from(installerProfile)
			// Drafts (never submitted) are not waiting on anyone.
			.where(isNotNull(installerProfile.submittedAt))
			.groupBy(installerProfile.vettingStatus),
		db.select({ n: count() }).from(emailOutbox).where(isNull(emailOutbox.sentAt)),
		db
			.select({ n: count() })
			.from(emailOutbox)
			.where(
				and(
					isNull(emailOutbox.sentAt),
					isNotNull(emailOutbox.lastError),
					gt(emailOutbox.attempts, 2)
				)
			)
	]);
	return {
		accounts: Object.fromEntries(byRole.map((r) => [r.role, r.n])) as Partial<
			Record<string, number>
		>,
		vetting: Object.fromEntries(byVetting.map((r) => [r.status, r.n])) as Partial<
			Record<string, number>
		>,
		emailsWaiting: unsent?.n ?? 0,
		emailsFailing: failing?.n ?? 0
	};
}
