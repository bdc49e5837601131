/**
 * The estimate's price range: the middle half of accepted quotes for similar jobs nearby when
 * there are enough of them, otherwise the scope sheet's own guide, said as such.
 */
import type { CentsRange, PriceGuide } from './price';

/** Fewest similar accepted quotes before the market range is shown (Tapline's own choice). */
export const MIN_MARKET_QUOTES = 5;

/** Radius and period the market range looks at (from the estimate's brief). */
export const MARKET_RADIUS_KM = 30;
export const MARKET_MONTHS = 12;

/** What the market query returns: the 25th and 75th percentile in cents and how many quotes. */
export interface MarketQuotes {
	p25Cents: number;
	p75Cents: number;
	count: number;
}

export interface EstimatePriceRange {
	source: 'market' | 'guide';
	totalIncGst: CentsRange;
	/** Similar accepted quotes found nearby (also when too few to show). */
	count: number;
}

/** Picks the market's middle half when at least `MIN_MARKET_QUOTES` back it, else the guide. */
export function estimatePriceRange(
	market: MarketQuotes | null,
	guide: PriceGuide,
	minQuotes = MIN_MARKET_QUOTES
): EstimatePriceRange {
	if (market && market.count >= minQuotes) {
		return {
			source: 'market',
			totalIncGst: { min: Math.round(market.p25Cents), max: Math.round(market.p75Cents) },
			count: market.count
		};
	}
	return { source: 'guide', totalIncGst: guide.totalIncGst, count: market?.count ?? 0 };
}

/**
 * Continuous percentile with linear interpolation between the closest ranks, as PostgreSQL's
 * `percentile_cont` computes it (PostgreSQL manual, "Aggregate Functions", ordered-set aggregates).
 * @param values any order; must not be empty
 * @param fraction 0 to 1
 */
export function percentileCont(values: readonly number[], fraction: number): number {
	if (values.length === 0) throw new RangeError('percentileCont needs at least one value');
	const sorted = [...values].sort((a, b) => a - b);
	const rank = fraction * (sorted.length - 1);
	const below = Math.floor(rank);
	const low = sorted[below] ?? 0;
	const high = sorted[Math.ceil(rank)] ?? low;
	return low + (high - low) * (rank - below);
}
