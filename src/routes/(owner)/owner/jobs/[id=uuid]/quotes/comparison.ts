/**
 * The owner's comparison of the quotes on one job: one row per quote with what the table shows,
 * best-fit scores from $lib/marketplace/ranking, and the sorts the table offers. No reviews exist yet, so
 * every installer's rating is the ranking's stated prior and the table says "no reviews yet".
 */
import { quoteGstNote } from '$lib/money/gst';
import { rankQuotes, ratingSummary, type BestFitScore } from '$lib/marketplace/ranking';
import type { listQuotesForOwner } from '$lib/server/marketplace/quotes';

type OwnerQuote = NonNullable<Awaited<ReturnType<typeof listQuotesForOwner>>>[number];

export const COMPARISON_SORTS = {
	best: 'Best fit',
	total: 'Total',
	labour: 'Labour',
	parts: 'Parts',
	distance: 'Distance',
	rating: 'Rating',
	fits: 'Fits completed',
	earliest: 'Earliest time',
	warranty: 'Warranty',
	expiry: 'Holds until'
} as const;
export type ComparisonSort = keyof typeof COMPARISON_SORTS;

export interface ComparisonRow {
	id: string;
	installerId: string;
	businessName: string;
	suburb: string;
	status: string;
	revision: number;
	totalCents: number;
	labourCents: number;
	partsCents: number;
	travelCents: number;
	gstCents: number;
	/** 'incl. $36.36 GST', or that the installer is not registered for GST. */
	gstNote: string;
	distanceKm: number;
	reviews: number;
	/** Adjusted (Bayesian) rating in stars. */
	rating: number;
	/** E.g. '4.17 ★ adjusted (average 5.00 from 1 review)'. */
	ratingLabel: string;
	fitsCompleted: number;
	earliestSlot: string | null;
	warrantyMonths: number;
	cameraSupplied: boolean;
	expiresAt: string | null;
	fit: BestFitScore | null;
	bestRank: number | null;
}

/**
 * Builds and sorts the comparison; quotes no longer open go last whatever the sort.
 * @param referenceCents the middle of the job's price guide (see priceReferenceCents)
 */
export function compareQuotes(
	quotes: readonly OwnerQuote[],
	sort: ComparisonSort,
	dir: 'asc' | 'desc',
	referenceCents: number | null,
	now = new Date()
): ComparisonRow[] {
	const live = quotes.filter(
		(q) =>
			q.status === 'live' && !q.onHold && (!q.expiresAt || q.expiresAt.getTime() > now.getTime())
	);
	const ranked = rankQuotes(
		live.map((q) => ({
			id: q.id,
			totalCents: q.totalCents,
			distanceKm: q.distanceKm ?? 0,
			ratingSum: q.ratingSum,
			ratingCount: q.ratingCount,
			submittedAt: q.createdAt
		})),
		referenceCents
	);
	const rows = quotes.map((q): ComparisonRow => {
		const rank = ranked.findIndex((r) => r.id === q.id);
		const future = q.slots.map((s) => s.start).filter((s) => Date.parse(s) > now.getTime());
		return {
			id: q.id,
			installerId: q.installerId,
			businessName: q.businessName,
			suburb: q.suburb,
			status: q.onHold ? 'on_hold' : q.status === 'live' && rank < 0 ? 'lapsed' : q.status,
			revision: q.revision,
			totalCents: q.totalCents,
			labourCents: q.labourCents,
			partsCents: q.partsCents,
			travelCents: q.travelCents,
			gstCents: q.gstCents,
			gstNote: quoteGstNote(q),
			distanceKm: q.distanceKm ?? 0,
			reviews: q.ratingCount,
			rating: ranked[rank]?.fit.rating ?? 0,
			ratingLabel: ratingSummary(q.ratingSum, q.ratingCount).label,
			fitsCompleted: q.fitsCompleted,
			earliestSlot: future.sort()[0] ?? null,
			warrantyMonths: q.warrantyMonths,
			cameraSupplied: q.cameraSupplied,
			expiresAt: q.expiresAt?.toISOString() ?? null,
			fit: ranked[rank]?.fit ?? null,
			bestRank: rank < 0 ? null : rank + 1
		};
	});
	const keys: Record<ComparisonSort, (r: ComparisonRow) => number | string> = {
		best: (r) => r.bestRank ?? Number.MAX_SAFE_INTEGER,
		total: (r) => r.totalCents,
		labour: (r) => r.labourCents,
		parts: (r) => r.partsCents,
		distance: (r) => r.distanceKm,
		rating: (r) => r.rating,
		fits: (r) => r.fitsCompleted,
		earliest: (r) => r.earliestSlot ?? '9999',
		warranty: (r) => r.warrantyMonths,
		expiry: (r) => r.expiresAt ?? '9999'
	};
	const sign = dir === 'asc' ? 1 : -1;
	const open = (r: ComparisonRow) => (r.bestRank === null ? 1 : 0);
	return rows.sort((a, b) => {
		const ka = keys[sort](a);
		const kb = keys[sort](b);
		return open(a) - open(b) || (ka < kb ? -1 : ka > kb ? 1 : 0) * sign;
	});
}
