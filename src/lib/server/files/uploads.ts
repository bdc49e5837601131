/**
 * The one upload pipeline: read the posted file, decide its type from its bytes, refuse with a
 * reason a person understands, re-encode photos (no EXIF, no GPS), check PDFs for active content,
 * store in object storage.
 */
import { randomUUID } from 'node:crypto';
import {
	IMAGE_TYPES,
	MAX_UPLOAD_BYTES,
	sniffContentType,
	uploadProblem,
	type SniffedType
} from '$lib/uploads';
import { prepareImage } from './images';
import { pdfProblem } from './pdf';
import { deleteObject, putObject } from './storage';

export interface StoredUpload {
	objectKey: string;
	thumbKey: string | null;
	contentType: string;
	bytes: number;
	width: number | null;
	height: number | null;
	originalName: string;
}

export type UploadOutcome = { ok: true; stored: StoredUpload } | { ok: false; problem: string };

/**
 * Checks and stores one posted file under `prefix/`. Photos are re-encoded as JPEG with a
 * thumbnail; PDFs (where accepted) must parse and carry no scripts, automatic actions or attached
 * files (see pdf.ts), and are then stored as sent.
 */
export async function storeUpload(
	file: unknown,
	prefix: string,
	accepted: readonly SniffedType[] = IMAGE_TYPES,
	maxBytes = MAX_UPLOAD_BYTES
): Promise<UploadOutcome> {
	if (!(file instanceof File) || file.size === 0)
		return { ok: false, problem: 'Choose a file to upload.' };
	if (file.size > maxBytes) {
		return {
			ok: false,
			problem: uploadProblem(new Uint8Array(file.size), accepted, maxBytes) ?? 'Too large.'
		};
	}
	const bytes = new Uint8Array(await file.arrayBuffer());
	const problem = uploadProblem(bytes, accepted, maxBytes);
	if (problem) return { ok: false, problem };
	const type = sniffContentType(bytes)!;
	const id = randomUUID();
	// Control characters (NUL above all, which PostgreSQL refuses) never reach the database.
	const originalName = file.name.replace(/\p{Cc}/gu, '').slice(0, 200) || 'upload';

	if (type === 'application/pdf') {
		const refused = await pdfProblem(bytes);
		if (refused) return { ok: false, problem: refused };
		const objectKey = `${prefix}/${id}.pdf`;
		await putObject(objectKey, bytes, type);
		return {
			ok: true,
			stored: {
				objectKey,
				thumbKey: null,
				contentType: type,
				bytes: bytes.length,
				width: null,
				height: null,
				originalName
			}
		};
	}

	let image;
	try {
		image = await prepareImage(bytes);
	} catch {
		return { ok: false, problem: 'We could not read that picture. Is the file complete?' };
	}
	const objectKey = `${prefix}/${id}.jpg`;
	const thumbKey = `${prefix}/${id}-thumb.jpg`;
	await putObject(objectKey, image.main, 'image/jpeg');
	await putObject(thumbKey, image.thumb, 'image/jpeg');
	return {
		ok: true,
		stored: {
			objectKey,
			thumbKey,
			contentType: 'image/jpeg',
			bytes: image.main.length,
			width: image.width,
			height: image.height,
			originalName
		}
	};
}

/** Removes a stored upload and its thumbnail (used when the database write that follows fails). */
export async function discardUpload(stored: Pick<StoredUpload, 'objectKey' | 'thumbKey'>) {
	await Promise.allSettled([
		deleteObject(stored.objectKey),
		...(stored.thumbKey ? [deleteObject(stored.thumbKey)] : [])
	]);
}
