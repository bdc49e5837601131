import { describe, expect, it } from 'vitest';
import { DOCUMENT_TYPES, IMAGE_TYPES, sniffContentType, uploadProblem } from './uploads';

const bytes = (...b: number[]) => new Uint8Array(b);
const ascii = (s: string) => new Uint8Array([...s].map((c) => c.charCodeAt(0)));

describe('sniffContentType', () => {
	it('recognises each accepted format by its published signature', () => {
		// JPEG SOI marker + APP0 (ISO/IEC 10918-1, JFIF 1.02)
		expect(sniffContentType(bytes(0xff, 0xd8, 0xff, 0xe0, 0, 0x10))).toBe('image/jpeg');
		// PNG signature (ISO/IEC 15948, section 5.2)
		expect(sniffContentType(bytes(0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0))).toBe(
			'image/png'
		);
		// WebP: RIFF <size> WEBP (WebP container specification)
		expect(sniffContentType(ascii('RIFF\x24\x00\x00\x00WEBPVP8 '))).toBe('image/webp');
		// PDF header (ISO 32000-1, 7.5.2)
		expect(sniffContentType(ascii('%PDF-1.7\n'))).toBe('application/pdf');
	});

	it('does not trust a name or a near miss', () => {
		expect(sniffContentType(ascii('GIF89a'))).toBeNull();
		expect(sniffContentType(ascii('RIFF\x24\x00\x00\x00WAVEfmt '))).toBeNull();
		expect(sniffContentType(ascii('<html>%PDF-'))).toBeNull();
		expect(sniffContentType(bytes(0xff, 0xd8))).toBeNull();
	});
});

describe('uploadProblem', () => {
	const jpeg = bytes(0xff, 0xd8, 0xff, 0xdb);
	const pdf = ascii('%PDF-1.4');

	it('accepts a photo where photos are asked for and a PDF where documents are', () => {
		expect(uploadProblem(jpeg, IMAGE_TYPES)).toBeNull();
		expect(uploadProblem(pdf, DOCUMENT_TYPES)).toBeNull();
	});

	it('explains each refusal in plain words', () => {
		expect(uploadProblem(pdf, IMAGE_TYPES)).toBe(
			'That file is not one we accept. Please upload JPEG, PNG, WEBP.'
		);
		expect(uploadProblem(new Uint8Array(0), IMAGE_TYPES)).toBe('The file is empty.');
		const big = new Uint8Array(3 * 1048576 + 1);
		big.set(jpeg);
		expect(uploadProblem(big, IMAGE_TYPES, 3 * 1048576)).toBe(
			'The file is 3.0 MB; the limit is 3 MB.'
		);
	});
});
