import type { IncomingMessage, ServerResponse } from 'node:http';
import { createHash } from 'node:crypto';
import { listenHttp, sendJson } from './http-util';
import { encodeRgbPng } from './png';

/** Side of a web-map tile in pixels (the XYZ "slippy map" convention). */
export const TILE_SIZE = 256;

/** Deepest zoom served; 19 matches the usual public raster tile services (from memory). */
export const MAX_ZOOM = 19;

/** Attribution the map must show for these tiles. */
export const TILE_ATTRIBUTION = 'Demo tiles, Tapline local fake';

// Bounded so a client panning for hours cannot grow the cache without limit.
const CACHE_LIMIT = 2048;

/**
 * Renders one tile: a pale land colour that shifts a little from tile to tile, a darker line on
 * its top and left edges (so neighbouring tiles form a grid) and a faint quarter grid inside.
 */
export function renderTile(z: number, x: number, y: number): Buffer {
	const seed = createHash('sha1').update(`${z}/${x}/${y}`).digest();
	// A small per-tile shift (-6..+6) keeps tiles distinguishable without looking noisy.
	const shift = (i: number): number => ((seed[i] ?? 0) % 13) - 6;
	const base = [232 + shift(0), 236 + shift(1), 226 + shift(2)] as const;
	const edge = [base[0] - 40, base[1] - 40, base[2] - 36] as const;
	const faint = [base[0] - 12, base[1] - 12, base[2] - 10] as const;
	const rgb = new Uint8Array(TILE_SIZE * TILE_SIZE * 3);
	for (let py = 0; py < TILE_SIZE; py++) {
		for (let px = 0; px < TILE_SIZE; px++) {
			const colour =
				px === 0 || py === 0
					? edge
					: px % (TILE_SIZE / 4) === 0 || py % (TILE_SIZE / 4) === 0
						? faint
						: base;
			const o = (py * TILE_SIZE + px) * 3;
			rgb[o] = colour[0];
			rgb[o + 1] = colour[1];
			rgb[o + 2] = colour[2];
		}
	}
	return encodeRgbPng(TILE_SIZE, TILE_SIZE, rgb);
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

	function handle(req: IncomingMessage, res: ServerResponse): void {
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
				description: 'Plain generated raster tiles for local development; no map data.',
				attribution: TILE_ATTRIBUTION,
				scheme: 'xyz',
				tiles: [`${baseUrl}/{z}/{x}/{y}.png`],
				minzoom: 0,
				maxzoom: MAX_ZOOM,
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
			const png = renderTile(z, x, y);
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
