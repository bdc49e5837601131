import { count, eq, isNotNull, isNull, and, gt, sql } from 'drizzle-orm';
import { db } from './db';
import { dispute, emailOutbox, installerProfile, user } from './db/schema';

/** Headline counts for the admin overview, fetched in parallel. */
export async function getPlatformCounts() {
	const [byRole, byVetting, [unsent], [failing]] = await Promise.all([
		// Closed accounts are no longer people on the platform.
		db
			.select({ role: user.role, n: count() })
			.from(user)
			.where(isNull(user.deletedAt))
			.groupBy(user.role),
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

/** What waits on an admin, for the counts beside the admin navigation. */
export async function getAdminQueueCounts(): Promise<{ vetting: number; disputes: number }> {
	const [[waiting], [disputes]] = await Promise.all([
		db
			.select({ n: count() })
			.from(installerProfile)
			// As the vetting queue counts: sent (a draft waits for nobody) and not a closed account.
			.innerJoin(user, eq(user.id, installerProfile.userId))
			.where(
				and(
					eq(installerProfile.vettingStatus, 'applied'),
					isNotNull(installerProfile.submittedAt),
					isNull(user.deletedAt)
				)
			),
		db.select({ n: count() }).from(dispute).where(eq(dispute.status, 'open'))
	]);
	return { vetting: waiting?.n ?? 0, disputes: disputes?.n ?? 0 };
}

/** Booking statuses that mean the owner paid into held funds (now or before a later change). */
const PAID_BOOKING = sql`b.status NOT IN ('awaiting_payment', 'lapsed')`;

/** One week of the market, Monday to Sunday in the market's zone. */
export interface MarketWeek {
	/** The Monday, 'YYYY-MM-DD'. */
	week: string;
	posted: number;
	/** Of the jobs posted that week, those whose first quote came within 24 hours. */
	quotedWithinDay: number;
}

/** The health of the marketplace over a window of whole weeks, for the admin overview. */
export interface MarketMetrics {
	weeks: MarketWeek[];
	posted: number;
	/** Posted at least 24 hours before `now`, so a first quote within a day could have come. */
	dayOld: number;
	quotedWithinDay: number;
	/** Median hours from posting to first quote over jobs that got one; null when none did. */
	medianHoursToFirstQuote: number | null;
	/** Quotes (one per installer) per posted job. */
	quotesPerJob: number | null;
	/** Posted jobs with a booking paid into held funds. */
	paidBookings: number;
	/** Sum of those bookings' totals, GST-inclusive cents. */
	grossBookingCents: number;
	/** Disputes the owners opened in the window (whatever became of them). */
	disputesOpened: number;
	/** Disputes an admin settled in the window (whenever they were opened). */
	disputesSettled: number;
	/** Posted jobs by suburb at the suburb's mean job point, most first. */
	suburbs: Array<{ suburb: string; lat: number; lng: number; jobs: number }>;
}

/**
 * The marketplace's health over the last `weeks` whole weeks (the current one included), weeks
 * starting Monday in `zone`. Every figure is one SQL aggregate over the posted jobs of the window;
 * tests/integration/metrics.test.ts checks each against hand-computed fixtures.
 */
export async function getMarketMetrics(
	now = new Date(),
	weeks = 12,
	zone = 'Australia/Adelaide'
): Promise<MarketMetrics> {
	const weekStart = sql`(date_trunc('week', ${now}::timestamptz AT TIME ZONE ${zone}) - make_interval(weeks => ${weeks - 1}))`;
	const from = sql`(${weekStart} AT TIME ZONE ${zone})`;
	const posted = sql`
		SELECT j.id, j.submitted_at, j.suburb, j.latitude, j.longitude,
			(SELECT min(q.created_at) FROM quote q WHERE q.job_id = j.id) AS first_quote,
			(SELECT count(*) FROM quote q WHERE q.job_id = j.id) AS quotes
		FROM job j
		WHERE j.submitted_at IS NOT NULL AND j.submitted_at >= ${from} AND j.submitted_at <= ${now}`;
	const weekRows = await db.execute<{ week: string; posted: number; quoted: number }>(sql`
		WITH posted AS (${posted}),
		series AS (
			SELECT generate_series(${weekStart}, ${weekStart} + make_interval(weeks => ${weeks - 1}), interval '1 week')::date AS week
		)
		SELECT to_char(s.week, 'YYYY-MM-DD') AS week,
			count(p.id)::int AS posted,
			count(p.id) FILTER (WHERE p.first_quote <= p.submitted_at + interval '24 hours')::int AS quoted
		FROM series s
		LEFT JOIN posted p ON date_trunc('week', p.submitted_at AT TIME ZONE ${zone})::date = s.week
		GROUP BY s.week ORDER BY s.week`);
	const [totals] = (
		await db.execute<{
			posted: number;
			day_old: number;
			quoted: number;
			median_seconds: number | null;
			quotes_per_job: string | null;
			paid: number;
			gross: string | null;
			disputes_opened: number;
			disputes_settled: number;
		}>(sql`
		WITH posted AS (${posted})
		SELECT count(*)::int AS posted,
			count(*) FILTER (WHERE p.submitted_at <= ${now}::timestamptz - interval '24 hours')::int AS day_old,
			count(*) FILTER (WHERE p.submitted_at <= ${now}::timestamptz - interval '24 hours'
				AND p.first_quote <= p.submitted_at + interval '24 hours')::int AS quoted,
			percentile_cont(0.5) WITHIN GROUP (ORDER BY extract(epoch FROM p.first_quote - p.submitted_at))
				FILTER (WHERE p.first_quote IS NOT NULL) AS median_seconds,
			avg(p.quotes)::numeric(10, 4)::text AS quotes_per_job,
			(SELECT count(DISTINCT b.job_id)::int FROM booking b JOIN posted pp ON pp.id = b.job_id WHERE ${PAID_BOOKING}) AS paid,
			(SELECT sum(b.total_cents)::text FROM booking b JOIN posted pp ON pp.id = b.job_id WHERE ${PAID_BOOKING}) AS gross,
			(SELECT count(*)::int FROM dispute d WHERE d.opened_at >= ${from} AND d.opened_at <= ${now}) AS disputes_opened,
			(SELECT count(*)::int FROM dispute d WHERE d.settled_at >= ${from} AND d.settled_at <= ${now}) AS disputes_settled
		FROM posted p`)
	).rows;
	const suburbs = await db.execute<{ suburb: string; lat: number; lng: number; jobs: number }>(sql`
		WITH posted AS (${posted})
		SELECT p.suburb, avg(p.latitude) AS lat, avg(p.longitude) AS lng, count(*)::int AS jobs
		FROM posted p WHERE p.suburb IS NOT NULL AND p.latitude IS NOT NULL
		GROUP BY p.suburb ORDER BY jobs DESC, p.suburb`);
	return {
		weeks: weekRows.rows.map((w) => ({
			week: w.week,
			posted: w.posted,
			quotedWithinDay: w.quoted
		})),
		posted: totals?.posted ?? 0,
		dayOld: totals?.day_old ?? 0,
		quotedWithinDay: totals?.quoted ?? 0,
		medianHoursToFirstQuote:
			totals?.median_seconds == null ? null : Number(totals.median_seconds) / 3600,
		quotesPerJob: totals?.quotes_per_job == null ? null : Number(totals.quotes_per_job),
		paidBookings: totals?.paid ?? 0,
		grossBookingCents: Number(totals?.gross ?? 0),
		disputesOpened: totals?.disputes_opened ?? 0,
		disputesSettled: totals?.disputes_settled ?? 0,
		suburbs: suburbs.rows.map((s) => ({ ...s, lat: Number(s.lat), lng: Number(s.lng) }))
	};
}
