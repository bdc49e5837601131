import { createHash, randomBytes } from 'node:crypto';
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Readable } from 'node:stream';
import { crc32 } from 'node:zlib';
import {
	CopyObjectCommand,
	CreateBucketCommand,
	DeleteObjectCommand,
	DeleteObjectsCommand,
	GetObjectCommand,
	HeadBucketCommand,
	HeadObjectCommand,
	ListObjectsV2Command,
	PutObjectCommand,
	S3Client,
	S3ServiceException
} from '@aws-sdk/client-s3';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startFakes, type RunningFakes } from './index';
import { decodeAwsChunked, isValidBucketName } from './s3';

const EPHEMERAL = {
	smtpPort: 0,
	mailHttpPort: 0,
	s3Port: 0,
	geocodePort: 0,
	tilesPort: 0,
	stripePort: 0
};
const BUCKET = 'tapline-uploads';

// Any SigV4-shaped header passes; the fake does not check signatures.
const FAKE_AUTH =
	'AWS4-HMAC-SHA256 Credential=local/20260301/ap-southeast-2/s3/aws4_request, SignedHeaders=host, Signature=' +
	'0'.repeat(64);

/** A 32-bit CRC as S3 headers carry it: four big-endian bytes in base64. */
const crcHeader = (value: number): string => {
	const out = Buffer.alloc(4);
	out.writeUInt32BE(value);
	return out.toString('base64');
};

let fakes: RunningFakes;
let s3: S3Client;

function clientFor(endpoint: string): S3Client {
	return new S3Client({
		endpoint,
		region: 'ap-southeast-2',
		forcePathStyle: true,
		credentials: { accessKeyId: 'local', secretAccessKey: 'local-secret' }
	});
}

/** Resolves to the SDK's error for a command expected to fail. */
async function failure(promise: Promise<unknown>): Promise<S3ServiceException> {
	const err: unknown = await promise.then(
		() => null,
		(e: unknown) => e
	);
	expect(err).toBeInstanceOf(S3ServiceException);
	return err as S3ServiceException;
}

beforeAll(async () => {
	fakes = await startFakes(EPHEMERAL);
	s3 = clientFor(fakes.urls.s3);
	await s3.send(new CreateBucketCommand({ Bucket: BUCKET }));
});

afterAll(async () => {
	s3.destroy();
	await fakes.close();
});

describe('S3 fake with the AWS SDK', () => {
	it('round-trips an object with content type, metadata and an MD5 ETag', async () => {
		const text = 'Fuse tap photo placeholder';
		const put = await s3.send(
			new PutObjectCommand({
				Bucket: BUCKET,
				Key: 'jobs/42/fuse box.txt',
				Body: text,
				ContentType: 'text/plain; charset=utf-8',
				Metadata: { 'job-id': '42' }
			})
		);
		// S3 ETags for single-part uploads are the quoted hex MD5 of the body (S3 API Reference, Object).
		const md5 = createHash('md5').update(text).digest('hex');
		expect(put.ETag).toBe(`"${md5}"`);

		const got = await s3.send(
			new GetObjectCommand({ Bucket: BUCKET, Key: 'jobs/42/fuse box.txt' })
		);
		expect(await got.Body?.transformToString()).toBe(text);
		expect(got.ContentType).toBe('text/plain; charset=utf-8');
		expect(got.ContentLength).toBe(Buffer.byteLength(text));
		expect(got.ETag).toBe(`"${md5}"`);
		expect(got.Metadata).toEqual({ 'job-id': '42' });
		expect(got.LastModified).toBeInstanceOf(Date);
		expect(Math.abs((got.LastModified?.getTime() ?? 0) - Date.now())).toBeLessThan(60_000);

		const head = await s3.send(
			new HeadObjectCommand({ Bucket: BUCKET, Key: 'jobs/42/fuse box.txt' })
		);
		expect(head.ContentLength).toBe(Buffer.byteLength(text));
		expect(head.ETag).toBe(`"${md5}"`);
		expect(head.Metadata).toEqual({ 'job-id': '42' });
	});

	it('keeps a binary body byte for byte', async () => {
		const bytes = Buffer.concat([
			Buffer.from(Array.from({ length: 256 }, (_, i) => i)),
			randomBytes(300_000)
		]);
		await s3.send(
			new PutObjectCommand({
				Bucket: BUCKET,
				Key: 'photos/raw.bin',
				Body: bytes,
				ContentType: 'image/jpeg'
			})
		);
		const got = await s3.send(new GetObjectCommand({ Bucket: BUCKET, Key: 'photos/raw.bin' }));
		const back = Buffer.from((await got.Body?.transformToByteArray()) ?? []);
		expect(back.length).toBe(bytes.length);
		expect(back.equals(bytes)).toBe(true);
	});

	it('decodes an aws-chunked streaming upload with a checksum trailer', async () => {
		const parts = [randomBytes(70_000), randomBytes(5), randomBytes(40_000)];
		const whole = Buffer.concat(parts);
		await s3.send(
			new PutObjectCommand({
				Bucket: BUCKET,
				Key: 'photos/streamed.bin',
				Body: Readable.from(parts),
				ContentLength: whole.length
			})
		);
		const got = await s3.send(
			new GetObjectCommand({ Bucket: BUCKET, Key: 'photos/streamed.bin', ChecksumMode: 'ENABLED' })
		);
		expect(Buffer.from((await got.Body?.transformToByteArray()) ?? []).equals(whole)).toBe(true);
		// The SDK sends CRC-32 by default; the stored value must be the real CRC of the bytes.
		expect(got.ChecksumCRC32).toBe(crcHeader(crc32(whole)));
	});

	it('answers NoSuchKey / NotFound with 404 for missing objects and buckets', async () => {
		const get = await failure(s3.send(new GetObjectCommand({ Bucket: BUCKET, Key: 'nope.txt' })));
		expect(get.name).toBe('NoSuchKey');
		expect(get.$metadata.httpStatusCode).toBe(404);

		const head = await failure(s3.send(new HeadObjectCommand({ Bucket: BUCKET, Key: 'nope.txt' })));
		expect(head.$metadata.httpStatusCode).toBe(404);

		const bucket = await failure(
			s3.send(new GetObjectCommand({ Bucket: 'no-such-bucket', Key: 'a' }))
		);
		expect(bucket.name).toBe('NoSuchBucket');

		const headBucket = await failure(s3.send(new HeadBucketCommand({ Bucket: 'no-such-bucket' })));
		expect(headBucket.$metadata.httpStatusCode).toBe(404);
	});

	it('deletes idempotently with 204', async () => {
		await s3.send(new PutObjectCommand({ Bucket: BUCKET, Key: 'tmp/gone.txt', Body: 'x' }));
		const first = await s3.send(new DeleteObjectCommand({ Bucket: BUCKET, Key: 'tmp/gone.txt' }));
		expect(first.$metadata.httpStatusCode).toBe(204);
		await failure(s3.send(new HeadObjectCommand({ Bucket: BUCKET, Key: 'tmp/gone.txt' })));
		const again = await s3.send(new DeleteObjectCommand({ Bucket: BUCKET, Key: 'tmp/gone.txt' }));
		expect(again.$metadata.httpStatusCode).toBe(204);
	});

	it('refuses to create a bucket twice and rejects invalid names', async () => {
		const twice = await failure(s3.send(new CreateBucketCommand({ Bucket: BUCKET })));
		expect(twice.name).toBe('BucketAlreadyOwnedByYou');
		expect(twice.$metadata.httpStatusCode).toBe(409);
		// Bucket naming rules, Amazon S3 User Guide.
		expect(isValidBucketName('tapline-uploads')).toBe(true);
		expect(isValidBucketName('Tapline')).toBe(false);
		expect(isValidBucketName('ab')).toBe(false);
		expect(isValidBucketName('a..b')).toBe(false);
		expect(isValidBucketName('192.168.5.4')).toBe(false);
	});

	it('lists with prefix, delimiter and paging', async () => {
		const bucket = 'tapline-list';
		await s3.send(new CreateBucketCommand({ Bucket: bucket }));
		for (const key of ['a/1.txt', 'a/2.txt', 'b/1.txt', 'b/2.txt', 'root.txt']) {
			await s3.send(new PutObjectCommand({ Bucket: bucket, Key: key, Body: key }));
		}
		const top = await s3.send(new ListObjectsV2Command({ Bucket: bucket, Delimiter: '/' }));
		expect(top.CommonPrefixes?.map((p) => p.Prefix)).toEqual(['a/', 'b/']);
		expect(top.Contents?.map((c) => c.Key)).toEqual(['root.txt']);

		const inA = await s3.send(new ListObjectsV2Command({ Bucket: bucket, Prefix: 'a/' }));
		expect(inA.Contents?.map((c) => c.Key)).toEqual(['a/1.txt', 'a/2.txt']);
		expect(inA.Contents?.[0]?.Size).toBe(7);

		const keys: string[] = [];
		let token: string | undefined;
		let pages = 0;
		do {
			const page = await s3.send(
				new ListObjectsV2Command({ Bucket: bucket, MaxKeys: 2, ContinuationToken: token })
			);
			keys.push(...(page.Contents ?? []).map((c) => c.Key ?? ''));
			token = page.IsTruncated ? page.NextContinuationToken : undefined;
			pages++;
		} while (token && pages < 10);
		expect(pages).toBe(3);
		expect(keys).toEqual(['a/1.txt', 'a/2.txt', 'b/1.txt', 'b/2.txt', 'root.txt']);

		const removed = await s3.send(
			new DeleteObjectsCommand({
				Bucket: bucket,
				Delete: { Objects: [{ Key: 'a/1.txt' }, { Key: 'b/2.txt' }] }
			})
		);
		expect(removed.Deleted?.map((d) => d.Key)).toEqual(['a/1.txt', 'b/2.txt']);
		const after = await s3.send(new ListObjectsV2Command({ Bucket: bucket }));
		expect(after.KeyCount).toBe(3);
	});

	it('copies an object, keeping or replacing metadata', async () => {
		await s3.send(
			new PutObjectCommand({
				Bucket: BUCKET,
				Key: 'incoming/x.jpg',
				Body: 'jpeg',
				ContentType: 'image/jpeg',
				Metadata: { stage: 'incoming' }
			})
		);
		await s3.send(
			new CopyObjectCommand({
				Bucket: BUCKET,
				Key: 'kept/x.jpg',
				CopySource: `${BUCKET}/incoming/x.jpg`
			})
		);
		const kept = await s3.send(new HeadObjectCommand({ Bucket: BUCKET, Key: 'kept/x.jpg' }));
		expect(kept.ContentType).toBe('image/jpeg');
		expect(kept.Metadata).toEqual({ stage: 'incoming' });

		await s3.send(
			new CopyObjectCommand({
				Bucket: BUCKET,
				Key: 'kept/x.jpg',
				CopySource: `${BUCKET}/incoming/x.jpg`,
				MetadataDirective: 'REPLACE',
				ContentType: 'image/png',
				Metadata: { stage: 'kept' }
			})
		);
		const replaced = await s3.send(new HeadObjectCommand({ Bucket: BUCKET, Key: 'kept/x.jpg' }));
		expect(replaced.ContentType).toBe('image/png');
		expect(replaced.Metadata).toEqual({ stage: 'kept' });
	});

	it('serves byte ranges', async () => {
		await s3.send(new PutObjectCommand({ Bucket: BUCKET, Key: 'range.txt', Body: '0123456789' }));
		const part = await s3.send(
			new GetObjectCommand({ Bucket: BUCKET, Key: 'range.txt', Range: 'bytes=2-5' })
		);
		expect(part.$metadata.httpStatusCode).toBe(206);
		expect(part.ContentRange).toBe('bytes 2-5/10');
		expect(await part.Body?.transformToString()).toBe('2345');
		const tail = await s3.send(
			new GetObjectCommand({ Bucket: BUCKET, Key: 'range.txt', Range: 'bytes=-3' })
		);
		expect(await tail.Body?.transformToString()).toBe('789');
		const beyond = await failure(
			s3.send(new GetObjectCommand({ Bucket: BUCKET, Key: 'range.txt', Range: 'bytes=10-' }))
		);
		expect(beyond.name).toBe('InvalidRange');
	});
});

describe('S3 fake over raw HTTP', () => {
	it('answers 403 AccessDenied in S3 XML without an AWS4-HMAC-SHA256 Authorization', async () => {
		const none = await fetch(`${fakes.urls.s3}/${BUCKET}/jobs/42/fuse%20box.txt`);
		expect(none.status).toBe(403);
		expect(none.headers.get('content-type')).toBe('application/xml');
		const xmlBody = await none.text();
		expect(xmlBody).toMatch(
			/^<\?xml version="1.0" encoding="UTF-8"\?>\n<Error><Code>AccessDenied<\/Code>/
		);
		expect(xmlBody).toContain('<RequestId>');

		const basic = await fetch(`${fakes.urls.s3}/${BUCKET}/x`, {
			headers: { authorization: 'Basic dXNlcjpwYXNz' }
		});
		expect(basic.status).toBe(403);
	});

	it('rejects a body whose checksum header does not match, and keeps nothing', async () => {
		const body = Buffer.from('dash camera lead');
		const res = await fetch(`${fakes.urls.s3}/${BUCKET}/bad-digest.txt`, {
			method: 'PUT',
			headers: {
				authorization: FAKE_AUTH,
				'x-amz-checksum-crc32': crcHeader(crc32(Buffer.from('something else')))
			},
			body
		});
		expect(res.status).toBe(400);
		expect(await res.text()).toContain('<Code>BadDigest</Code>');
		const head = await fetch(`${fakes.urls.s3}/${BUCKET}/bad-digest.txt`, {
			method: 'HEAD',
			headers: { authorization: FAKE_AUTH }
		});
		expect(head.status).toBe(404);

		const good = await fetch(`${fakes.urls.s3}/${BUCKET}/good-digest.txt`, {
			method: 'PUT',
			headers: { authorization: FAKE_AUTH, 'x-amz-checksum-crc32': crcHeader(crc32(body)) },
			body
		});
		expect(good.status).toBe(200);
	});

	it('accepts a presigned URL until it expires', async () => {
		await s3.send(new PutObjectCommand({ Bucket: BUCKET, Key: 'shared.txt', Body: 'shared' }));
		const presign = (signedAt: Date, expires: number): string => {
			const stamp = signedAt
				.toISOString()
				.replace(/[-:]/g, '')
				.replace(/\.\d{3}/, '');
			const q = new URLSearchParams({
				'X-Amz-Algorithm': 'AWS4-HMAC-SHA256',
				'X-Amz-Credential': `local/${stamp.slice(0, 8)}/ap-southeast-2/s3/aws4_request`,
				'X-Amz-Date': stamp,
				'X-Amz-Expires': String(expires),
				'X-Amz-SignedHeaders': 'host',
				'X-Amz-Signature': 'a'.repeat(64)
			});
			return `${fakes.urls.s3}/${BUCKET}/shared.txt?${q.toString()}`;
		};
		const fresh = await fetch(presign(new Date(), 300));
		expect(fresh.status).toBe(200);
		expect(await fresh.text()).toBe('shared');

		const stale = await fetch(presign(new Date(Date.now() - 600_000), 300));
		expect(stale.status).toBe(403);
		expect(await stale.text()).toContain('Request has expired');
	});

	it('decodes chunk framing with signatures and trailers', () => {
		const framed = Buffer.from(
			`5;chunk-signature=${'b'.repeat(64)}\r\nhello\r\n1\r\n!\r\n0\r\nx-amz-checksum-crc32:abc=\r\n\r\n`,
			'latin1'
		);
		const { body, trailers } = decodeAwsChunked(framed);
		expect(body.toString()).toBe('hello!');
		expect(trailers.get('x-amz-checksum-crc32')).toBe('abc=');
		expect(() => decodeAwsChunked(Buffer.from('5\r\nhel'))).toThrow();
	});
});

describe('S3 fake persistence', () => {
	it('reloads objects, deletions and empty buckets from the data folder after a restart', async () => {
		const dataDir = await mkdtemp(join(tmpdir(), 'tapline-s3-'));
		try {
			const first = await startFakes({ ...EPHEMERAL, dataDir });
			const c1 = clientFor(first.urls.s3);
			const bytes = randomBytes(1024);
			await c1.send(
				new PutObjectCommand({
					Bucket: 'kept',
					Key: 'a/b.bin',
					Body: bytes,
					Metadata: { owner: 'demo' }
				})
			);
			await c1.send(new PutObjectCommand({ Bucket: 'kept', Key: 'gone.txt', Body: 'bye' }));
			await c1.send(new DeleteObjectCommand({ Bucket: 'kept', Key: 'gone.txt' }));
			await c1.send(new CreateBucketCommand({ Bucket: 'empty-but-kept' }));
			c1.destroy();
			await first.close();

			const second = await startFakes({ ...EPHEMERAL, dataDir });
			const c2 = clientFor(second.urls.s3);
			try {
				const got = await c2.send(new GetObjectCommand({ Bucket: 'kept', Key: 'a/b.bin' }));
				expect(Buffer.from((await got.Body?.transformToByteArray()) ?? []).equals(bytes)).toBe(
					true
				);
				expect(got.Metadata).toEqual({ owner: 'demo' });
				const gone = await failure(
					c2.send(new GetObjectCommand({ Bucket: 'kept', Key: 'gone.txt' }))
				);
				expect(gone.name).toBe('NoSuchKey');
				const listed = await c2.send(new ListObjectsV2Command({ Bucket: 'kept' }));
				expect(listed.Contents?.map((o) => o.Key)).toEqual(['a/b.bin']);
				await c2.send(new HeadBucketCommand({ Bucket: 'empty-but-kept' }));
			} finally {
				c2.destroy();
				await second.close();
			}
		} finally {
			await rm(dataDir, { recursive: true, force: true });
		}
	});
});

describe('checksums', () => {
	// Check values for the nine ASCII bytes "123456789" from the CRC catalogue (reveng,
	// "Catalogue of parametrised CRC algorithms": CRC-32/ISO-HDLC, CRC-32/ISCSI, CRC-64/NVME).
	const CHECK_INPUT = Buffer.from('123456789');
	const PUBLISHED: [string, string][] = [
		['crc32', 'cbf43926'],
		['crc32c', 'e3069283'],
		['crc64nvme', 'ae8b14860a799888']
	];

	async function put(algorithm: string, hex: string): Promise<Response> {
		return fetch(`${fakes.urls.s3}/${BUCKET}/check-${algorithm}.txt`, {
			method: 'PUT',
			headers: {
				authorization: FAKE_AUTH,
				[`x-amz-checksum-${algorithm}`]: Buffer.from(hex, 'hex').toString('base64')
			},
			body: CHECK_INPUT
		});
	}

	it.each(PUBLISHED)('verifies %s against the published check value', async (algorithm, hex) => {
		expect((await put(algorithm, hex)).status).toBe(200);
		// The same value with its last bit flipped is refused.
		const flipped = Buffer.from(hex, 'hex');
		flipped[flipped.length - 1] = (flipped[flipped.length - 1] ?? 0) ^ 1;
		const bad = await put(algorithm, flipped.toString('hex'));
		expect(bad.status).toBe(400);
		expect(await bad.text()).toContain('<Code>BadDigest</Code>');
	});
});
