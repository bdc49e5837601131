import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startS3Fake } from '../../local-fakes/s3';
import { getObject } from '$lib/server/files/storage';
import { storeUpload } from '$lib/server/files/uploads';
import { DOCUMENT_TYPES } from '$lib/uploads';
import { PDF_PROBLEMS } from '$lib/server/files/pdf';
import { cleanPdf, encryptedPdf, hostilePdfs, htmlWithPdfSignature } from '../support/pdfs';

let close: () => Promise<void>;

beforeAll(async () => {
	const fake = await startS3Fake({ host: '127.0.0.1', port: 0 });
	close = fake.close;
	// The S3 client is created on first use, from these.
	process.env.S3_ENDPOINT = fake.url;
	process.env.S3_BUCKET = 'test-uploads';
});
afterAll(() => close());

async function read(key: string) {
	const object = await getObject(key);
	if (!object) throw new Error(`missing ${key}`);
	return {
		type: object.contentType,
		bytes: Buffer.from(await new Response(object.body).arrayBuffer())
	};
}

/** A JPEG carrying EXIF with a GPS position, as phones write them. */
async function photoWithGps() {
	return sharp({ create: { width: 2400, height: 1600, channels: 3, background: '#88aacc' } })
		.jpeg()
		.withExif({
			IFD0: { Make: 'TestCam', Model: 'One' },
			IFD3: {
				GPSLatitudeRef: 'S',
				GPSLatitude: '34/1 55/1 0/1',
				GPSLongitudeRef: 'E',
				GPSLongitude: '138/1 36/1 0/1'
			}
		})
		.toBuffer();
}

describe('upload pipeline', () => {
	it('re-encodes a photo without its EXIF or GPS, scaled down, with a thumbnail', async () => {
		const original = await photoWithGps();
		expect((await sharp(original).metadata()).exif).toBeDefined();
		const outcome = await storeUpload(
			new File([original], 'car.jpg', { type: 'image/jpeg' }),
			'test'
		);
		if (!outcome.ok) throw new Error(outcome.problem);
		expect(outcome.stored.width).toBe(2000);
		expect(outcome.stored.height).toBe(1333);
		const stored = await read(outcome.stored.objectKey);
		expect(stored.type).toBe('image/jpeg');
		const meta = await sharp(stored.bytes).metadata();
		expect(meta.exif).toBeUndefined();
		expect(meta.width).toBe(2000);
		const thumb = await sharp((await read(outcome.stored.thumbKey!)).bytes).metadata();
		expect([thumb.width, thumb.height]).toEqual([320, 320]);
	});

	it('decides the type from the bytes: a PDF named .jpg is refused where photos are asked for', async () => {
		const pdf = await cleanPdf();
		const disguised = await storeUpload(
			new File([pdf], 'photo.jpg', { type: 'image/jpeg' }),
			'test'
		);
		expect(disguised).toEqual({
			ok: false,
			problem: 'That file is not one we accept. Please upload JPEG, PNG, WEBP.'
		});
		const asDocument = await storeUpload(new File([pdf], 'policy.pdf'), 'test', DOCUMENT_TYPES);
		expect(asDocument.ok && asDocument.stored.contentType).toBe('application/pdf');
	});

	it('refuses oversized, empty, missing and corrupt files with a plain reason', async () => {
		const big = new Uint8Array(2 * 1048576 + 10);
		big.set([0xff, 0xd8, 0xff]);
		expect(await storeUpload(new File([big], 'big.jpg'), 'test', undefined, 2 * 1048576)).toEqual({
			ok: false,
			problem: 'The file is 2.0 MB; the limit is 2 MB.'
		});
		expect(await storeUpload(new File([], 'empty.jpg'), 'test')).toEqual({
			ok: false,
			problem: 'Choose a file to upload.'
		});
		expect(await storeUpload(null, 'test')).toEqual({
			ok: false,
			problem: 'Choose a file to upload.'
		});
		const truncated = new Uint8Array([0xff, 0xd8, 0xff, 0xe0, 0, 0x10, 1, 2, 3]);
		expect(await storeUpload(new File([truncated], 'bad.jpg'), 'test')).toEqual({
			ok: false,
			problem: 'We could not read that picture. Is the file complete?'
		});
	});
});

describe('PDF check', () => {
	const asDocument = (bytes: Buffer, name = 'policy.pdf') =>
		storeUpload(new File([new Uint8Array(bytes)], name), 'test', DOCUMENT_TYPES);

	it('stores a clean PDF byte for byte, its name without control characters', async () => {
		const pdf = await cleanPdf();
		const outcome = await asDocument(pdf, 'cert\u0000ificate\n.pdf');
		if (!outcome.ok) throw new Error(outcome.problem);
		expect(outcome.stored.originalName).toBe('certificate.pdf');
		expect((await read(outcome.stored.objectKey)).bytes.equals(pdf)).toBe(true);
	});

	it('refuses every PDF carrying scripts, automatic actions, launch actions or attachments', async () => {
		const cases = Object.entries(await hostilePdfs());
		expect(cases.length).toBeGreaterThanOrEqual(6);
		for (const [what, bytes] of cases) {
			expect({ what, outcome: await asDocument(bytes) }).toEqual({
				what,
				outcome: { ok: false, problem: PDF_PROBLEMS.active }
			});
		}
	});

	it('refuses an HTML page that starts with the PDF signature, and an encrypted PDF', async () => {
		expect(await asDocument(htmlWithPdfSignature(), 'page.pdf')).toEqual({
			ok: false,
			problem: PDF_PROBLEMS.unreadable
		});
		expect(await asDocument(await encryptedPdf())).toEqual({
			ok: false,
			problem: PDF_PROBLEMS.encrypted
		});
	});
});
