/**
 * Table-driven CRC-32 variants. PNG chunks use CRC-32 (ISO 3309 / ITU-T V.42, the zlib one);
 * S3 checksums accept both CRC-32 and CRC-32C (Castagnoli, RFC 3720 §B.4).
 */

function makeTable(reversedPolynomial: number): Uint32Array {
	const table = new Uint32Array(256);
	for (let n = 0; n < 256; n++) {
		let c = n;
		for (let k = 0; k < 8; k++) {
			c = c & 1 ? reversedPolynomial ^ (c >>> 1) : c >>> 1;
		}
		table[n] = c >>> 0;
	}
	return table;
}

// Reversed polynomials: 0xEDB88320 from ISO 3309 (PNG spec §D), 0x82F63B78 from RFC 3720 §B.4.
const CRC32_TABLE = makeTable(0xedb88320);
const CRC32C_TABLE = makeTable(0x82f63b78);

function crcWith(table: Uint32Array, data: Uint8Array, seed: number): number {
	let c = ~seed >>> 0;
	for (const byte of data) {
		c = (table[(c ^ byte) & 0xff] ?? 0) ^ (c >>> 8);
	}
	return ~c >>> 0;
}

/** CRC-32 as used by zlib, PNG and S3's `x-amz-checksum-crc32`; `seed` continues a previous run. */
export function crc32(data: Uint8Array, seed = 0): number {
	return crcWith(CRC32_TABLE, data, seed);
}

/** CRC-32C (Castagnoli) as used by S3's `x-amz-checksum-crc32c`. */
export function crc32c(data: Uint8Array, seed = 0): number {
	return crcWith(CRC32C_TABLE, data, seed);
}

/** Encodes a 32-bit checksum the way S3 headers carry it: 4 big-endian bytes, base64. */
export function crcToBase64(value: number): string {
	const buf = Buffer.alloc(4);
	buf.writeUInt32BE(value >>> 0);
	return buf.toString('base64');
}
