import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ADELAIDE_SUBURBS } from './data/adelaide-suburbs';
import type { LatLon } from './data/adelaide-map';
import { startFakes, type RunningFakes } from './index';
import { TILE_ATTRIBUTION, TILE_COLOURS, worldPixel } from './tiles';

const EPHEMERAL = {
	smtpPort: 0,
	mailHttpPort: 0,
	s3Port: 0,
	geocodePort: 0,
	tilesPort: 0,
	stripePort: 0
};

// The Adelaide GPO, and a point in Gulf St Vincent about 20 km off Henley Beach (from memory).
const GPO: LatLon = [-34.9285, 138.6007];
const GULF: LatLon = [-34.95, 138.3];

let fakes: RunningFakes;

interface Tile {
	png: Buffer;
	/** RGB of the pixel at (x, y). */
	at(x: number, y: number): [number, number, number];
	/** How many pixels in the box [x0, y0, x1, y1) (default: all) pass the test. */
	count(test: (rgb: [number, number, number]) => boolean, box?: number[]): number;
}

async function fetchTile(path: string): Promise<Response> {
	return fetch(`${fakes.urls.tiles}${path}`);
}

/** Decodes a PNG of `size` × `size` pixels for counting. */
async function decode(png: Buffer, size: number): Promise<Omit<Tile, 'png'>> {
	const { data } = await sharp(png).removeAlpha().raw().toBuffer({ resolveWithObject: true });
	const at = (cx: number, cy: number): [number, number, number] => {
		const o = (cy * size + cx) * 3;
		return [data[o] ?? 0, data[o + 1] ?? 0, data[o + 2] ?? 0];
	};
	return {
		at,
		count(test, [x0 = 0, y0 = 0, x1 = size, y1 = size] = []) {
			let n = 0;
			for (let cy = Math.max(0, y0); cy < Math.min(size, y1); cy++)
				for (let cx = Math.max(0, x0); cx < Math.min(size, x1); cx++) if (test(at(cx, cy))) n++;
			return n;
		}
	};
}

/** Fetches the tile holding `point` at zoom z; `offset` is the point's pixel inside the tile. */
async function tileAt(z: number, point: LatLon): Promise<Tile & { offset: [number, number] }> {
	const [px, py] = worldPixel(z, point);
	const [x, y] = [Math.floor(px / 256), Math.floor(py / 256)];
	const res = await fetchTile(`/${z}/${x}/${y}.png`);
	expect(res.status).toBe(200);
	const png = Buffer.from(await res.arrayBuffer());
	return {
		png,
		offset: [Math.round(px - x * 256), Math.round(py - y * 256)],
		...(await decode(png, 256))
	};
}

/**
 * The 3 × 3 tiles around `point` joined into one 768-pixel image, so a label that crosses a tile
 * edge is seen whole; `offset` is the point's pixel in it.
 */
async function regionAt(z: number, point: LatLon): Promise<Tile & { offset: [number, number] }> {
	const [px, py] = worldPixel(z, point);
	const [x, y] = [Math.floor(px / 256), Math.floor(py / 256)];
	const pieces = [];
	for (let dy = -1; dy <= 1; dy++)
		for (let dx = -1; dx <= 1; dx++) {
			const res = await fetchTile(`/${z}/${x + dx}/${y + dy}.png`);
			expect(res.status).toBe(200);
			pieces.push({
				input: Buffer.from(await res.arrayBuffer()),
				left: (dx + 1) * 256,
				top: (dy + 1) * 256
			});
		}
	const png = await sharp({
		create: { width: 768, height: 768, channels: 3, background: '#000000' }
	})
		.composite(pieces)
		.png()
		.toBuffer();
	return {
		png,
		offset: [Math.round(px - (x - 1) * 256), Math.round(py - (y - 1) * 256)],
		...(await decode(png, 768))
	};
}

const rgbOf = (hex: string): [number, number, number] => [
	parseInt(hex.slice(1, 3), 16),
	parseInt(hex.slice(3, 5), 16),
	parseInt(hex.slice(5, 7), 16)
];
const near = (hex: string, tolerance = 6) => {
	const want = rgbOf(hex);
	return (rgb: [number, number, number]) =>
		rgb.every((v, i) => Math.abs(v - (want[i] ?? 0)) <= tolerance);
};
/** Label text is near-black; land, sea, roads and rivers are all much lighter. */
const isInk = ([r, g, b]: [number, number, number]) => 0.2126 * r + 0.7152 * g + 0.0722 * b < 110;

beforeAll(async () => {
	fakes = await startFakes(EPHEMERAL);
});

afterAll(async () => {
	await fakes.close();
});

describe('tile server', () => {
	it('serves a valid 256x256 PNG for the tile holding the Adelaide GPO', async () => {
		// By the XYZ tile formula (OpenStreetMap wiki, "Slippy map tilenames") the GPO
		// (-34.9285, 138.6007) lies in tile 12/3624/2472, worked by hand.
		const [px, py] = worldPixel(12, GPO);
		expect([Math.floor(px / 256), Math.floor(py / 256)]).toEqual([3624, 2472]);
		const res = await fetchTile('/12/3624/2472.png');
		expect(res.status).toBe(200);
		expect(res.headers.get('content-type')).toBe('image/png');
		const png = Buffer.from(await res.arrayBuffer());
		// PNG signature: 89 50 4E 47 0D 0A 1A 0A (PNG spec, W3C REC 2003, §5.2).
		expect([...png.subarray(0, 8)]).toEqual([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);
		const meta = await sharp(png).metadata();
		expect([meta.format, meta.width, meta.height]).toEqual(['png', 256, 256]);
	});

	it('draws open water as sea and the city as land with roads and labels', async () => {
		const sea = await tileAt(12, GULF);
		expect(sea.count(near(TILE_COLOURS.sea))).toBe(256 * 256);

		const city = await tileAt(12, GPO);
		// Only the edges of the river, blended with the land, come close to the sea's colour.
		expect(city.count(near(TILE_COLOURS.sea))).toBeLessThan(256 * 256 * 0.01);
		expect(city.count(near(TILE_COLOURS.land))).toBeGreaterThan(256 * 256 * 0.5);
		expect(city.count(near(TILE_COLOURS.road, 20))).toBeGreaterThan(200);
		expect(city.count(isInk)).toBeGreaterThan(50);
		expect(city.png.equals(sea.png)).toBe(false);
	});

	it('draws the coastline through a beach suburb: sea to the west, land to the east', async () => {
		const henley = ADELAIDE_SUBURBS.find((s) => s.name === 'Henley Beach');
		if (!henley) throw new Error('Henley Beach is missing from the suburbs');
		// About 1.8 km west of its centre is the gulf; 1.8 km east, houses (hand-made map).
		const west = await tileAt(13, [henley.lat, henley.lon - 0.02]);
		const east = await tileAt(13, [henley.lat, henley.lon + 0.02]);
		expect(west.at(...west.offset)).toEqual(rgbOf(TILE_COLOURS.sea));
		expect(east.at(...east.offset)).toEqual(rgbOf(TILE_COLOURS.land));
		const coast = await tileAt(13, [henley.lat, henley.lon]);
		expect(coast.count(near(TILE_COLOURS.sea))).toBeGreaterThan(256 * 10);
		expect(coast.count(near(TILE_COLOURS.land))).toBeGreaterThan(256 * 10);
	});

	it("writes a suburb's name at its centre, and nothing where no suburb is", async () => {
		const norwood = ADELAIDE_SUBURBS.find((s) => s.name === 'Norwood');
		if (!norwood) throw new Error('Norwood is missing from the suburbs');
		const tile = await regionAt(14, [norwood.lat, norwood.lon]);
		const [cx, cy] = tile.offset;
		// "Norwood" at 11 px spans roughly ±25 px around the centre, one line high.
		expect(tile.count(isInk, [cx - 30, cy - 8, cx + 30, cy + 8])).toBeGreaterThan(40);
		expect(tile.count(isInk, [cx - 30, cy + 20, cx + 30, cy + 60])).toBe(0);
		expect((await tileAt(14, GULF)).count(isInk)).toBe(0);
	});

	it('draws labels with a real font: two names of equal length differ in width', async () => {
		// Without a usable font the renderer draws one box of the same width per character, so
		// two seven-letter names would be equally wide. With DejaVu Sans (fonts-dejavu-core)
		// "Norwood" is about one em wider than "Enfield" (glyph widths N, w, o against f, i, l).
		const widths: number[] = [];
		for (const name of ['Norwood', 'Enfield']) {
			const suburb = ADELAIDE_SUBURBS.find((s) => s.name === name);
			if (!suburb) throw new Error(`${name} is missing from the suburbs`);
			const tile = await regionAt(15, [suburb.lat, suburb.lon]);
			const [cx, cy] = tile.offset;
			const inked: number[] = [];
			for (let x = cx - 60; x < cx + 60; x++)
				if (tile.count(isInk, [x, cy - 8, x + 1, cy + 8]) > 0) inked.push(x);
			expect(inked.length).toBeGreaterThan(0);
			widths.push(Math.max(...inked) - Math.min(...inked));
		}
		const [norwood = 0, enfield = 0] = widths;
		expect(norwood - enfield).toBeGreaterThanOrEqual(5);
	});

	it('serves the same bytes again from its cache with an ETag', async () => {
		const first = await fetchTile('/3/4/5.png');
		const second = await fetchTile('/3/4/5.png');
		const etag = first.headers.get('etag');
		expect(etag).toMatch(/^"[0-9a-f]{32}"$/);
		expect(second.headers.get('etag')).toBe(etag);
		expect(
			Buffer.from(await first.arrayBuffer()).equals(Buffer.from(await second.arrayBuffer()))
		).toBe(true);
		const revalidated = await fetch(`${fakes.urls.tiles}/3/4/5.png`, {
			headers: { 'if-none-match': etag ?? '' }
		});
		expect(revalidated.status).toBe(304);
	});

	it('answers 400 for out-of-range zoom, x or y', async () => {
		expect((await fetchTile('/20/0/0.png')).status).toBe(400);
		expect((await fetchTile('/-1/0/0.png')).status).toBe(400);
		// At zoom 1 there are 2x2 tiles, so x and y run 0..1.
		expect((await fetchTile('/1/2/0.png')).status).toBe(400);
		expect((await fetchTile('/1/0/2.png')).status).toBe(400);
		expect((await fetchTile('/1/1/1.png')).status).toBe(200);
		expect((await fetchTile('/0/0/0.png')).status).toBe(200);
		expect((await fetchTile('/a/b/c.png')).status).toBe(404);
	});

	it('describes itself with the attribution at /, saying the map is approximate', async () => {
		const res = await fetchTile('/');
		const body = (await res.json()) as { attribution: string; tiles: string[]; maxzoom: number };
		expect(body.attribution).toBe(TILE_ATTRIBUTION);
		expect(body.attribution).toMatch(/approximate/);
		expect(body.tiles).toEqual([`${fakes.urls.tiles}/{z}/{x}/{y}.png`]);
		expect(body.maxzoom).toBe(19);
	});
});
