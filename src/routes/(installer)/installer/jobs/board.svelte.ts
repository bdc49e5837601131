/**
 * The job board's state in the browser: filters, sort, the map's bounds and zoom, the jobs loaded
 * from /api/jobs and the map's clusters (computed by the server for the whole view). Map moves are
 * debounced, and an answer that arrives after a newer request started is dropped, so a quick pan
 * never leaves stale rows on screen.
 */
import type { MapBounds } from '$lib/components/JobMap.svelte';
import {
	BOARD_DEFAULT_DIR,
	type BoardCluster,
	type BoardJob,
	type BoardSort
} from '$lib/marketplace/board';
import { queryString, sortHref } from '$lib/query';

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
	/** Null when not counted: the server-rendered first page and later pages leave it out. */
	total: number | null;
	clusters: BoardCluster[] | null;
}

/** Waits this long after the map stops moving before asking for jobs. */
const DEBOUNCE_MS = 350;

export class JobBoard {
	jobs = $state<BoardJob[]>([]);
	total = $state<number | null>(null);
	clusters = $state<BoardCluster[]>([]);
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
	#zoom: number | null = null;
	#timer: ReturnType<typeof setTimeout> | undefined;
	#request = 0;

	constructor(
		initial: BoardPage,
		query: BoardFilters & { sort: BoardSort; dir: 'asc' | 'desc' | null }
	) {
		this.jobs = initial.jobs;
		this.total = initial.total;
		this.clusters = initial.clusters ?? [];
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
		// The clusters (and with them the total) come with a first page; a later page is rows only.
		if (cursor) p.cursor = cursor;
		else if (this.#zoom !== null) p.zoom = String(this.#zoom);
		return p;
	}

	/** The current view as a link's parameters: the map's bounds stay out of links. */
	#linkParams(): Record<string, string> {
		const { bounds: _bounds, zoom: _zoom, ...rest } = this.params();
		return rest;
	}

	/** A query string for links: the current view, with changes. */
	href(changes: Record<string, string | null>): string {
		return queryString(this.#linkParams(), changes);
	}

	/** The link of a sortable column's header (the same column again flips the direction). */
	sortLink(key: BoardSort): string {
		return sortHref(this.#linkParams(), key, { sort: this.sort, dir: this.direction });
	}

	/** Loads the first page for the current view, or appends the next page. */
	async load(append = false): Promise<void> {
		const id = ++this.#request;
		this.loading = true;
		this.error = null;
		try {
			const query = queryString(this.params(append ? this.nextCursor : null));
			const res = await fetch(`/api/jobs${query}`);
			const body = (await res.json()) as Partial<BoardPage> & { message?: string };
			if (id !== this.#request) return;
			if (!res.ok) {
				this.error = body.message ?? 'The job board could not load; try again.';
				return;
			}
			this.jobs = append ? [...this.jobs, ...(body.jobs ?? [])] : (body.jobs ?? []);
			if (!append) {
				this.total = body.total ?? null;
				this.clusters = body.clusters ?? [];
			}
			this.nextCursor = body.nextCursor ?? null;
			this.fromMap = this.#bounds !== null;
		} catch {
			if (id === this.#request) this.error = 'Tapline is not answering; check your connection.';
		} finally {
			if (id === this.#request) this.loading = false;
		}
	}

	/** Called by the map after every pan or zoom. */
	setBounds(bounds: MapBounds, zoom: number): void {
		this.#bounds = bounds;
		this.#zoom = zoom;
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
