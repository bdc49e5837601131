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
	/** From the installer's base to the cell centre, km rounded up to one decimal (shownKm in $lib/geo). */
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

/**
 * The map's server-side clusters cut the view into at most this many cells across and down
 * (17 × 17 = 289 cells at worst, as a view rarely lines up with the grid), so no view carries
 * more than a few hundred markers whatever the market size.
 */
export const MAX_CLUSTER_CELLS_ACROSS = 16;

/** One marker of the board's map: a grid cell of offered jobs, naming the job when it holds one. */
export interface BoardCluster {
	/** The mean of the cell's jobs' approximate (grid-cell centre) points. */
	lat: number;
	lng: number;
	count: number;
	job: { id: string; title: string } | null;
}

/** What every distance on the board and the job page is, said once where the figures show. */
export const DISTANCE_NOTE =
	'Distances are straight-line from your base to the centre of the 1 km square around the job, so they are accurate to about 1 km; the same figure decides your service area, the "within" filter and the travel fee.';
