import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startS3Fake } from '../../local-fakes/s3';
import {
	getObject,
	missingImageResponse,
	objectResponse,
	putObject
} from '$lib/server/files/storage';

let close: () => Promise<void>;

beforeAll(async () => {
	const fake = await startS3Fake({ host: '127.0.0.1', port: 0 });
	close = fake.close;
	// The S3 client is created on first use, from these; the bucket name is read on every call.
	process.env.S3_ENDPOINT = fake.url;
	process.env.S3_BUCKET = 'storage-test';
});
afterAll(() => close());

describe('object storage when an object is gone', () => {
	it('reads a missing key as null, and a stored one as its bytes', async () => {
		await putObject('kept/one.txt', new TextEncoder().encode('kept'), 'text/plain');
		const kept = await getObject('kept/one.txt');
		expect(await new Response(kept?.body).text()).toBe('kept');
		expect(await getObject('kept/never-stored.jpg')).toBeNull();
		expect(await objectResponse('kept/never-stored.jpg')).toBeNull();
	});

	it('reads a key in a bucket that no longer exists as null, not an error', async () => {
		// As after the object store's data was lost while the database still lists the photos:
		// S3 answers NoSuchBucket, which used to surface as a 500 from the media routes.
		const before = process.env.S3_BUCKET;
		process.env.S3_BUCKET = 'bucket-that-was-never-made';
		try {
			expect(await getObject('jobs/some-photo.jpg')).toBeNull();
			expect(await objectResponse('jobs/some-photo.jpg')).toBeNull();
		} finally {
			process.env.S3_BUCKET = before;
		}
	});

	it('answers a missing image with a 404 whose body is a picture', async () => {
		const res = missingImageResponse();
		expect(res.status).toBe(404);
		expect(res.headers.get('content-type')).toBe('image/svg+xml');
		expect(res.headers.get('cache-control')).toBe('private, no-store');
		const meta = await sharp(Buffer.from(await res.arrayBuffer())).metadata();
		expect([meta.format, meta.width, meta.height]).toEqual(['svg', 320, 320]);
	});
});
