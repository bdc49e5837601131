import {
	DeleteObjectsCommand,
	ListObjectsV2Command,
	S3Client,
	type ListObjectsV2CommandOutput
} from '@aws-sdk/client-s3';
import { expect, jpegPhoto, test, uploadJobPhoto } from './fixtures';

// `npm test` passes the app's S3 settings to Playwright; the bucket is the app's default.
const BUCKET = process.env.S3_BUCKET ?? 'tapline-uploads';

function storage(): S3Client {
	return new S3Client({
		endpoint: process.env.S3_ENDPOINT,
		region: 'ap-southeast-2',
		forcePathStyle: true,
		credentials: { accessKeyId: 'local', secretAccessKey: 'local-secret' }
	});
}

async function storedKeys(s3: S3Client): Promise<Set<string>> {
	const keys = new Set<string>();
	let token: string | undefined;
	do {
		const page: ListObjectsV2CommandOutput | null = await s3
			.send(new ListObjectsV2Command({ Bucket: BUCKET, ContinuationToken: token }))
			// The app makes its bucket on the first upload.
			.catch((err: unknown) => {
				if ((err as { name?: string }).name === 'NoSuchBucket') return null;
				throw err;
			});
		if (!page) break;
		for (const object of page.Contents ?? []) if (object.Key) keys.add(object.Key);
		token = page.NextContinuationToken;
	} while (token);
	return keys;
}

test('a job photo whose file is gone from storage answers 404 with a placeholder picture, not 500', async ({
	ownerPage: page
}) => {
	const s3 = storage();
	await page.getByRole('button', { name: 'Describe a new job' }).click();
	await page.goto(page.url().replace(/vehicle$/, 'photos'));

	const before = await storedKeys(s3);
	const fuseBox = await uploadJobPhoto(page, 'photo-fuse-box', await jpegPhoto());
	const img = fuseBox.getByRole('img');
	const thumbUrl = await img.getAttribute('src');
	expect(thumbUrl).toMatch(/^\/media\/job-photos\/[0-9a-f-]{36}\/thumb$/);
	expect((await page.request.get(thumbUrl ?? '')).status()).toBe(200);

	// Lose the photo and its thumbnail from the object store, as a store wiped on restart did.
	const added = [...(await storedKeys(s3))].filter((key) => !before.has(key));
	expect(added).toHaveLength(2);
	await s3.send(
		new DeleteObjectsCommand({
			Bucket: BUCKET,
			Delete: { Objects: added.map((Key) => ({ Key })) }
		})
	);
	s3.destroy();

	for (const url of [thumbUrl ?? '', (thumbUrl ?? '').replace(/thumb$/, 'full')]) {
		const res = await page.request.get(url);
		expect(res.status()).toBe(404);
		expect(res.headers()['content-type']).toBe('image/svg+xml');
	}
	// The page still draws a picture in the photo's place rather than a broken image.
	await page.reload();
	await expect
		.poll(() => fuseBox.getByRole('img').evaluate((el) => (el as HTMLImageElement).naturalWidth))
		.toBe(320);
});
