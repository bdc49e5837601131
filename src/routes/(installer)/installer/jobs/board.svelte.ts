/**
 * The job board's state in the browser: filters, sort, the map's bounds and the jobs loaded from
 * /api/jobs. Map moves are debounced, and an answer that arrives after a newer request started is
 * dropped, so a quick pan never leaves stale rows on screen.
 */
import type { MapBounds } from '$lib/components/JobMap.svelte';
import { BOARD_DEFAULT_DIR, type BoardJob, type BoardSort } from '$lib/board';

export interface BoardFilters {
	bodyStyle: string;
	cameras: string;
	power: string;
	maxKm: string;
	unquoted: boolean;
}

interface BoardPage {
	jobs: BoardJob[];
	nextCursor: string | null;
	total: number;
}

/** Encodes query parameters (a plain string: nothing here needs to be reactive). */
const toQuery = (entries: Array<[string, string]>) =>
	entries.map(([k, v]) => `${encodeURIComponent(k)}=${encodeURIComponent(v)}`).join('&');

/** Waits this long after the map stops moving before asking for jobs. */
const DEBOUNCE_MS = 350;

export class JobBoard {
	jobs = $state<BoardJob[]>([]);
	total = $state(0);
	nextCursor = $state<string | null>(null);
	loading = $state(false);
	error = $state<string | null>(null);
	filters = $state<BoardFilters>({
		bodyStyle: '',
		cameras: '',
		power: '',
		maxKm: '',
		unquoted: false
	});
	sort = $state<BoardSort>('distance');
	dir = $state<'asc' | 'desc' | null>(null);
	selected = $state<string | null>(null);
	/** True once the list comes from /api/jobs for the map's view rather than the first page. */
	fromMap = $state(false);
	#bounds: MapBounds | null = null;
	#timer: ReturnType<typeof setTimeout> | undefined;
	#request = 0;

	constructor(
		initial: BoardPage,
		query: BoardFilters & { sort: BoardSort; dir: 'asc' | 'desc' | null }
	) {
		this.jobs = initial.jobs;
		this.total = initial.total;
		this.nextCursor = initial.nextCursor;
		const { sort, dir, ...filters } = query;
		this.filters = filters;
		this.sort = sort;
		this.dir = dir;
	}

	/** The direction in force for the current sort. */
	get direction(): 'asc' | 'desc' {
		return this.dir ?? BOARD_DEFAULT_DIR[this.sort];
	}

	/** The API's query parameters for the current view (and a cursor for the next page). */
	params(cursor: string | null = null): Record<string, string> {
		const p: Record<string, string> = {};
		if (this.#bounds) {
			const b = this.#bounds;
			p.bounds = [b.minLng, b.minLat, b.maxLng, b.maxLat].map((n) => n.toFixed(5)).join(',');
		}
		for (const key of ['bodyStyle', 'cameras', 'power', 'maxKm'] as const) {
			if (this.filters[key]) p[key] = this.filters[key];
		}
		if (this.filters.unquoted) p.unquoted = '1';
		p.sort = this.sort;
		if (this.dir) p.dir = this.dir;
		if (cursor) p.cursor = cursor;
		return p;
	}

	/** A query string for links: the current view without the map's bounds, with changes. */
	href(changes: Record<string, string | null>): string {
		const { bounds: _bounds, ...rest } = this.params();
		const merged = { ...rest, ...changes };
		const entries = Object.entries(merged).filter((e): e is [string, string] => e[1] !== null);
		return `?${toQuery(entries)}`;
	}

	/** Loads the first page for the current view, or appends the next page. */
	async load(append = false): Promise<void> {
		const id = ++this.#request;
		this.loading = true;
		this.error = null;
		try {
			const query = toQuery(Object.entries(this.params(append ? this.nextCursor : null)));
			const res = await fetch(`/api/jobs?${query}`);
			const body = (await res.json()) as Partial<BoardPage> & { message?: string };
			if (id !== this.#request) return;
			if (!res.ok) {
				this.error = body.message ?? 'The job board could not load; try again.';
				return;
			}
			this.jobs = append ? [...this.jobs, ...(body.jobs ?? [])] : (body.jobs ?? []);
			this.total = body.total ?? 0;
			this.nextCursor = body.nextCursor ?? null;
			this.fromMap = this.#bounds !== null;
		} catch {
			if (id === this.#request) this.error = 'Tapline is not answering; check your connection.';
		} finally {
			if (id === this.#request) this.loading = false;
		}
	}

	/** Called by the map after every pan or zoom. */
	setBounds(bounds: MapBounds): void {
		this.#bounds = bounds;
		clearTimeout(this.#timer);
		this.#timer = setTimeout(() => void this.load(), DEBOUNCE_MS);
	}

	/** Sorts by a column; the same column again flips the direction. */
	sortBy(key: BoardSort): void {
		if (this.sort === key) this.dir = this.direction === 'asc' ? 'desc' : 'asc';
		else {
			this.sort = key;
			this.dir = null;
		}
		void this.load();
	}
}
