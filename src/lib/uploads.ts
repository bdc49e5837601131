/**
 * What Tapline accepts as an upload, decided by the file's first bytes (its "magic number"), never
 * by its name or the browser's claimed type. Shared by the browser (early feedback) and the server
 * (the decision).
 */

export type SniffedType = 'image/jpeg' | 'image/png' | 'image/webp' | 'application/pdf';

/** Largest photo or document accepted, before re-encoding: 10 MiB. */
export const MAX_UPLOAD_BYTES = 10 * 1024 * 1024;

export const IMAGE_TYPES: readonly SniffedType[] = ['image/jpeg', 'image/png', 'image/webp'];
export const DOCUMENT_TYPES: readonly SniffedType[] = [...IMAGE_TYPES, 'application/pdf'];

const startsWith = (bytes: Uint8Array, signature: number[], offset = 0) =>
	signature.every((b, i) => bytes[offset + i] === b);

/**
 * Recognises a file by its signature: JPEG FF D8 FF; PNG 89 50 4E 47 0D 0A 1A 0A;
 * WebP "RIFF" .... "WEBP"; PDF "%PDF-" (signatures as listed in each format's specification:
 * ISO/IEC 10918-1 / JFIF, PNG (ISO/IEC 15948), Google's WebP container spec, ISO 32000).
 */
export function sniffContentType(bytes: Uint8Array): SniffedType | null {
	if (startsWith(bytes, [0xff, 0xd8, 0xff])) return 'image/jpeg';
	if (startsWith(bytes, [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a])) return 'image/png';
	if (
		startsWith(bytes, [0x52, 0x49, 0x46, 0x46]) &&
		startsWith(bytes, [0x57, 0x45, 0x42, 0x50], 8)
	) {
		return 'image/webp';
	}
	if (startsWith(bytes, [0x25, 0x50, 0x44, 0x46, 0x2d])) return 'application/pdf';
	return null;
}

/** A person-readable reason a file is refused, or null when it is acceptable. */
export function uploadProblem(
	bytes: Uint8Array,
	accepted: readonly SniffedType[],
	maxBytes = MAX_UPLOAD_BYTES
): string | null {
	if (bytes.length === 0) return 'The file is empty.';
	if (bytes.length > maxBytes) {
		return `The file is ${(bytes.length / 1048576).toFixed(1)} MB; the limit is ${(maxBytes / 1048576).toFixed(0)} MB.`;
	}
	const type = sniffContentType(bytes);
	if (!type || !accepted.includes(type)) {
		const names = accepted.map((t) => t.split('/')[1]?.toUpperCase()).join(', ');
		return `That file is not one we accept. Please upload ${names}.`;
	}
	return null;
}
