import { deflateSync } from 'node:zlib';
import { crc32 } from './checksum';

// The eight signature bytes every PNG starts with (PNG spec, W3C REC 2003, §5.2).
const PNG_SIGNATURE = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);

function chunk(type: string, data: Buffer): Buffer {
	const head = Buffer.alloc(8);
	head.writeUInt32BE(data.length, 0);
	head.write(type, 4, 'ascii');
	const crc = Buffer.alloc(4);
	// The CRC covers the chunk type and data, not the length (PNG spec §5.3).
	crc.writeUInt32BE(crc32(Buffer.concat([head.subarray(4), data])));
	return Buffer.concat([head, data, crc]);
}

/**
 * Encodes 8-bit RGB pixels (row-major, 3 bytes a pixel) as a PNG with no filtering.
 */
export function encodeRgbPng(width: number, height: number, rgb: Uint8Array): Buffer {
	if (rgb.length !== width * height * 3) {
		throw new RangeError(`expected ${width * height * 3} bytes of RGB, got ${rgb.length}`);
	}
	const ihdr = Buffer.alloc(13);
	ihdr.writeUInt32BE(width, 0);
	ihdr.writeUInt32BE(height, 4);
	ihdr[8] = 8; // bit depth
	ihdr[9] = 2; // colour type 2: truecolour RGB
	ihdr[10] = 0; // compression method: deflate
	ihdr[11] = 0; // filter method 0
	ihdr[12] = 0; // no interlace
	const stride = width * 3;
	const raw = Buffer.alloc((stride + 1) * height);
	for (let y = 0; y < height; y++) {
		// Each scanline starts with its filter-type byte; 0 means "None".
		raw[y * (stride + 1)] = 0;
		raw.set(rgb.subarray(y * stride, (y + 1) * stride), y * (stride + 1) + 1);
	}
	return Buffer.concat([
		PNG_SIGNATURE,
		chunk('IHDR', ihdr),
		chunk('IDAT', deflateSync(raw)),
		chunk('IEND', Buffer.alloc(0))
	]);
}
