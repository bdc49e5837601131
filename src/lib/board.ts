/** The installer's job board: its sorts and the shape of one job on it. Pure. */

export const BOARD_SORTS = ['distance', 'newest', 'date', 'quotes'] as const;
export type BoardSort = (typeof BOARD_SORTS)[number];

/** The natural direction of each board sort: nearest, newest, soonest, fewest quotes first. */
export const BOARD_DEFAULT_DIR: Record<BoardSort, 'asc' | 'desc'> = {
	distance: 'asc',
	newest: 'desc',
	date: 'asc',
	quotes: 'asc'
};

/** One job on the installer's board: never the owner, the address or the exact point. */
export interface BoardJob {
	id: string;
	title: string;
	suburb: string | null;
	/** Centre of the job's ~1 km grid cell. */
	lat: number;
	lng: number;
	/** From the installer's base to the cell centre, km to one decimal. */
	distanceKm: number;
	bodyStyle: string;
	cameras: string;
	power: string;
	locationMode: 'mobile' | 'workshop' | null;
	preferredWindows: Array<{ date: string; window: string }>;
	scopeSummary: string;
	priceGuide: { lowCents: number; highCents: number } | null;
	/** Live quotes so far. */
	quotes: number;
	/** The status of this installer's own quote, if any. */
	myQuote: string | null;
	postedAt: string;
}
