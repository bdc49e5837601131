import type { IncomingMessage, ServerResponse } from 'node:http';
import { createHash } from 'node:crypto';
import sharp from 'sharp';
import { ADELAIDE_SUBURBS } from './data/adelaide-suburbs';
import { ISLANDS, MAIN_ROADS, MAJOR_PLACES, RIVERS, SEA, type LatLon } from './data/adelaide-map';
import { escapeHtml, listenHttp, sendJson } from './http-util';

/** Side of a web-map tile in pixels (the XYZ "slippy map" convention). */
export const TILE_SIZE = 256;

/** Deepest zoom served; 19 matches the usual public raster tile services (from memory). */
export const MAX_ZOOM = 19;

/** Attribution the map must show for these tiles. */
export const TILE_ATTRIBUTION = 'Demo map: approximate, hand-made (Tapline local fake)';

/** Colours of the drawing, exported so the tests can look for them. */
export const TILE_COLOURS = {
	land: '#f1eee6',
	sea: '#a9cfe0',
	coast: '#7fa7ba',
	river: '#8dbfd8',
	road: '#e8a33d',
	label: '#2d2a26',
	halo: '#fbfaf7'
} as const;

/** Fonts for labels, through fontconfig: DejaVu ships with Debian (`fonts-dejavu-core`). */
export const LABEL_FONT = "'DejaVu Sans', 'Liberation Sans', sans-serif";

// Bounded so a client panning for hours cannot grow the cache without limit.
const CACHE_LIMIT = 2048;

/** Labels appear from this zoom (major places) and from `ALL_LABELS_ZOOM` (every suburb). */
const MAJOR_LABELS_ZOOM = 8;
const ALL_LABELS_ZOOM = 11;

/**
 * A point in world pixels at zoom z: Web Mercator, x = (lon + 180) / 360 · 2^z · 256 and
 * y = (1 − ln(tan φ + sec φ) / π) / 2 · 2^z · 256 (OpenStreetMap wiki, "Slippy map tilenames").
 */
export function worldPixel(z: number, [lat, lon]: LatLon): [number, number] {
	const world = TILE_SIZE * 2 ** z;
	const phi = (lat * Math.PI) / 180;
	return [
		((lon + 180) / 360) * world,
		((1 - Math.log(Math.tan(phi) + 1 / Math.cos(phi)) / Math.PI) / 2) * world
	];
}

interface PlacedLabel {
	name: string;
	x: number;
	y: number;
	size: number;
	box: [number, number, number, number];
}

const labelCache = new Map<number, PlacedLabel[]>();

/**
 * The suburb labels shown at a zoom, in world pixels: major places first, then the rest, each
 * skipped if its box would overlap one already placed. Worked out for the whole map at once, so
 * a label cut by a tile edge continues on the next tile.
 */
function labelsAt(z: number): PlacedLabel[] {
	const cached = labelCache.get(z);
	if (cached) return cached;
	const placed: PlacedLabel[] = [];
	if (z >= MAJOR_LABELS_ZOOM) {
		const major = new Set(MAJOR_PLACES);
		const ordered = [
			...ADELAIDE_SUBURBS.filter((s) => major.has(s.name)),
			...(z >= ALL_LABELS_ZOOM ? ADELAIDE_SUBURBS.filter((s) => !major.has(s.name)) : [])
		];
		for (const suburb of ordered) {
			const size = major.has(suburb.name) ? 13 : 11;
			const [x, y] = worldPixel(z, [suburb.lat, suburb.lon]);
			// A generous estimate of the text's width: ~0.62 em a character plus the halo.
			const half = (suburb.name.length * size * 0.62) / 2 + 3;
			const box: PlacedLabel['box'] = [x - half, y - size, x + half, y + size];
			const clashes = placed.some(
				(p) => box[0] < p.box[2] && box[2] > p.box[0] && box[1] < p.box[3] && box[3] > p.box[1]
			);
			if (!clashes) placed.push({ name: suburb.name, x, y, size, box });
		}
	}
	labelCache.set(z, placed);
	return placed;
}

/** SVG path data for a line or ring, in the tile's own pixel coordinates. */
function pathData(z: number, ox: number, oy: number, points: readonly LatLon[], close = false) {
	const d = points
		.map((p, i) => {
			const [x, y] = worldPixel(z, p);
			return `${i === 0 ? 'M' : 'L'}${(x - ox).toFixed(1)} ${(y - oy).toFixed(1)}`;
		})
		.join('');
	return close ? `${d}Z` : d;
}

/** The tile as SVG: sea over land, islands, rivers, main roads, then suburb labels. */
export function tileSvg(z: number, x: number, y: number): string {
	const ox = x * TILE_SIZE;
	const oy = y * TILE_SIZE;
	const c = TILE_COLOURS;
	const road = z < 10 ? 1 : z < 13 ? 2 : z < 16 ? 3.5 : 6;
	const parts = [
		`<rect width="${TILE_SIZE}" height="${TILE_SIZE}" fill="${c.land}"/>`,
		`<path d="${pathData(z, ox, oy, SEA, true)}" fill="${c.sea}" stroke="${c.coast}" stroke-width="1"/>`,
		...ISLANDS.map((ring) => `<path d="${pathData(z, ox, oy, ring, true)}" fill="${c.land}"/>`),
		...RIVERS.map(
			(r) =>
				`<path d="${pathData(z, ox, oy, r.points)}" fill="none" stroke="${c.river}" stroke-width="${Math.max(1, road - 0.5)}" stroke-linejoin="round"/>`
		),
		...MAIN_ROADS.map(
			(r) =>
				`<path d="${pathData(z, ox, oy, r.points)}" fill="none" stroke="${c.road}" stroke-width="${road}" stroke-linecap="round" stroke-linejoin="round"/>`
		)
	];
	for (const label of labelsAt(z)) {
		const [x0, y0, x1, y1] = label.box;
		if (x1 < ox || x0 > ox + TILE_SIZE || y1 < oy || y0 > oy + TILE_SIZE) continue;
		parts.push(
			`<text x="${(label.x - ox).toFixed(1)}" y="${(label.y - oy).toFixed(1)}" dy="0.35em" text-anchor="middle" font-family="${escapeHtml(LABEL_FONT)}" font-size="${label.size}" fill="${c.label}" stroke="${c.halo}" stroke-width="3" stroke-linejoin="round" paint-order="stroke">${escapeHtml(label.name)}</text>`
		);
	}
	return `<svg xmlns="http://www.w3.org/2000/svg" width="${TILE_SIZE}" height="${TILE_SIZE}">${parts.join('')}</svg>`;
}

/** Renders one tile to PNG with sharp (librsvg underneath). */
export async function renderTile(z: number, x: number, y: number): Promise<Buffer> {
	return sharp(Buffer.from(tileSvg(z, x, y)))
		.png()
		.toBuffer();
}

/** Options for {@link startTilesFake}. */
export interface TilesFakeOptions {
	host: string;
	port: number;
}

/** A running tile server fake. */
export interface TilesFake {
	url: string;
	port: number;
	close(): Promise<void>;
}

/**
 * Starts the XYZ raster tile server: `GET /{z}/{x}/{y}.png`, and TileJSON at `/` and
 * `/tiles.json` carrying the attribution.
 */
export async function startTilesFake(options: TilesFakeOptions): Promise<TilesFake> {
	const cache = new Map<string, { png: Buffer; etag: string }>();
	let baseUrl = '';

	async function handle(req: IncomingMessage, res: ServerResponse): Promise<void> {
		const url = new URL(req.url ?? '/', 'http://fake.invalid');
		// Map libraries that draw to a canvas need CORS on tiles.
		res.setHeader('access-control-allow-origin', '*');
		if (req.method !== 'GET' && req.method !== 'HEAD') {
			sendJson(res, 405, { error: 'method not allowed' });
			return;
		}
		if (url.pathname === '/' || url.pathname === '/tiles.json') {
			sendJson(res, 200, {
				tilejson: '3.0.0',
				name: 'Tapline demo tiles',
				description:
					'Raster tiles drawn from a small hand-made map of the Adelaide area: approximate coast, main roads, rivers and suburb names. For local development only.',
				attribution: TILE_ATTRIBUTION,
				scheme: 'xyz',
				tiles: [`${baseUrl}/{z}/{x}/{y}.png`],
				minzoom: 0,
				maxzoom: MAX_ZOOM,
				// West, south, east, north: where the hand-made map has anything to draw.
				bounds: [136.55, -36.1, 139.1, -34.15],
				center: [138.6007, -34.9285, 11],
				tileSize: TILE_SIZE
			});
			return;
		}
		const match = /^\/(-?\d+)\/(-?\d+)\/(-?\d+)\.png$/.exec(url.pathname);
		if (!match) {
			sendJson(res, 404, { error: 'expected /{z}/{x}/{y}.png' });
			return;
		}
		const [z, x, y] = [Number(match[1]), Number(match[2]), Number(match[3])];
		const span = 2 ** z;
		if (z < 0 || z > MAX_ZOOM || x < 0 || y < 0 || x >= span || y >= span) {
			sendJson(res, 400, {
				error: `tile out of range: z must be 0..${MAX_ZOOM}, x and y 0..2^z-1`
			});
			return;
		}
		const key = `${z}/${x}/${y}`;
		let tile = cache.get(key);
		if (!tile) {
			const png = await renderTile(z, x, y);
			tile = { png, etag: `"${createHash('md5').update(png).digest('hex')}"` };
			if (cache.size >= CACHE_LIMIT) {
				const oldest = cache.keys().next();
				if (!oldest.done) cache.delete(oldest.value);
			}
			cache.set(key, tile);
		}
		if (req.headers['if-none-match'] === tile.etag) {
			res.writeHead(304, { etag: tile.etag });
			res.end();
			return;
		}
		res.writeHead(200, {
			'content-type': 'image/png',
			'content-length': tile.png.length,
			etag: tile.etag,
			'cache-control': 'public, max-age=86400'
		});
		res.end(req.method === 'HEAD' ? undefined : tile.png);
	}

	const running = await listenHttp(handle, options.host, options.port);
	baseUrl = running.url;
	return { url: running.url, port: running.port, close: running.close };
}
