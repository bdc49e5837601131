import { inflateSync } from 'node:zlib';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { crc32 } from './checksum';
import { startFakes, type RunningFakes } from './index';
import { TILE_ATTRIBUTION } from './tiles';

const EPHEMERAL = { smtpPort: 0, mailHttpPort: 0, s3Port: 0, geocodePort: 0, tilesPort: 0 };

let fakes: RunningFakes;

interface PngChunk {
	type: string;
	data: Buffer;
	crcOk: boolean;
}

/** Splits a PNG into chunks, checking each CRC (PNG spec, W3C REC 2003, §5.3). */
function readChunks(png: Buffer): PngChunk[] {
	const chunks: PngChunk[] = [];
	let pos = 8;
	while (pos < png.length) {
		const length = png.readUInt32BE(pos);
		const type = png.toString('ascii', pos + 4, pos + 8);
		const data = png.subarray(pos + 8, pos + 8 + length);
		const crc = png.readUInt32BE(pos + 8 + length);
		chunks.push({ type, data, crcOk: crc32(png.subarray(pos + 4, pos + 8 + length)) === crc });
		pos += 12 + length;
	}
	return chunks;
}

async function tile(path: string): Promise<Response> {
	return fetch(`${fakes.urls.tiles}${path}`);
}

beforeAll(async () => {
	fakes = await startFakes(EPHEMERAL);
});

afterAll(async () => {
	await fakes.close();
});

describe('tile server', () => {
	it('serves a valid 256x256 PNG for an Adelaide tile', async () => {
		// Zoom 12 tile holding the Adelaide GPO (-34.9285, 138.6007) by the XYZ tile formula
		// x = floor((lon + 180) / 360 · 2^z), y = floor((1 − ln(tan φ + sec φ) / π) / 2 · 2^z)
		// (OpenStreetMap wiki, "Slippy map tilenames"); worked by hand: 3624, 2472.
		const res = await tile('/12/3624/2472.png');
		expect(res.status).toBe(200);
		expect(res.headers.get('content-type')).toBe('image/png');
		const png = Buffer.from(await res.arrayBuffer());
		// PNG signature: 89 50 4E 47 0D 0A 1A 0A (PNG spec §5.2).
		expect([...png.subarray(0, 8)]).toEqual([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);

		const chunks = readChunks(png);
		expect(chunks.map((c) => c.type)).toEqual(['IHDR', 'IDAT', 'IEND']);
		expect(chunks.every((c) => c.crcOk)).toBe(true);
		const ihdr = chunks[0]?.data ?? Buffer.alloc(13);
		expect(ihdr.readUInt32BE(0)).toBe(256);
		expect(ihdr.readUInt32BE(4)).toBe(256);
		expect(ihdr[8]).toBe(8);
		expect(ihdr[9]).toBe(2);

		// One filter byte plus 256 RGB pixels per row, 256 rows.
		const raw = inflateSync(chunks[1]?.data ?? Buffer.alloc(0));
		expect(raw.length).toBe(256 * (1 + 256 * 3));
		// The top-left pixel sits on the border line, darker than the tile's middle.
		const pixel = (x: number, y: number): number[] => {
			const o = y * (1 + 256 * 3) + 1 + x * 3;
			return [raw[o] ?? 0, raw[o + 1] ?? 0, raw[o + 2] ?? 0];
		};
		expect(pixel(0, 0)[0]).toBeLessThan(pixel(100, 100)[0] ?? 0);
	});

	it('serves the same bytes again from its cache with an ETag', async () => {
		const first = await tile('/3/4/5.png');
		const second = await tile('/3/4/5.png');
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
		expect((await tile('/20/0/0.png')).status).toBe(400);
		expect((await tile('/-1/0/0.png')).status).toBe(400);
		// At zoom 1 there are 2x2 tiles, so x and y run 0..1.
		expect((await tile('/1/2/0.png')).status).toBe(400);
		expect((await tile('/1/0/2.png')).status).toBe(400);
		expect((await tile('/1/1/1.png')).status).toBe(200);
		expect((await tile('/0/0/0.png')).status).toBe(200);
		expect((await tile('/a/b/c.png')).status).toBe(404);
	});

	it('describes itself with the attribution at /', async () => {
		const res = await tile('/');
		const body = (await res.json()) as { attribution: string; tiles: string[]; maxzoom: number };
		expect(body.attribution).toBe(TILE_ATTRIBUTION);
		expect(body.attribution).toBe('Demo tiles, Tapline local fake');
		expect(body.tiles).toEqual([`${fakes.urls.tiles}/{z}/{x}/{y}.png`]);
		expect(body.maxzoom).toBe(19);
	});
});
