/**
 * Object storage through the S3 API (`@aws-sdk/client-s3`). Locally it talks to the S3 fake in
 * local-fakes/; production points S3_ENDPOINT (or none, for AWS itself) and the credentials at a
 * real bucket. Objects are private: the app streams them after its own access checks.
 */
import {
	CreateBucketCommand,
	DeleteObjectCommand,
	GetObjectCommand,
	HeadBucketCommand,
	PutObjectCommand,
	S3Client
} from '@aws-sdk/client-s3';
import { env } from '$env/dynamic/private';

let client: S3Client | undefined;
let bucketReady: Promise<void> | undefined;

const bucket = () => env.S3_BUCKET ?? 'tapline-uploads';

function s3(): S3Client {
	client ??= new S3Client({
		region: env.S3_REGION ?? 'ap-southeast-2',
		endpoint: env.S3_ENDPOINT || undefined,
		forcePathStyle: Boolean(env.S3_ENDPOINT),
		credentials: {
			accessKeyId: env.S3_ACCESS_KEY_ID ?? 'local',
			secretAccessKey: env.S3_SECRET_ACCESS_KEY ?? 'local-secret'
		}
	});
	return client;
}

async function ensureBucket(): Promise<void> {
	bucketReady ??= (async () => {
		try {
			await s3().send(new HeadBucketCommand({ Bucket: bucket() }));
		} catch {
			await s3()
				.send(new CreateBucketCommand({ Bucket: bucket() }))
				.catch((err: unknown) => {
					// Another process may have created it between the two calls.
					if ((err as { name?: string }).name !== 'BucketAlreadyOwnedByYou') throw err;
				});
		}
	})().catch((err: unknown) => {
		bucketReady = undefined;
		throw err;
	});
	return bucketReady;
}

/** Stores bytes under a key. */
export async function putObject(key: string, body: Uint8Array, contentType: string): Promise<void> {
	await ensureBucket();
	await s3().send(
		new PutObjectCommand({ Bucket: bucket(), Key: key, Body: body, ContentType: contentType })
	);
}

/** Reads an object as a web stream with its type and size, or null when it does not exist. */
export async function getObject(
	key: string
): Promise<{ body: ReadableStream; contentType: string; length: number | undefined } | null> {
	try {
		const res = await s3().send(new GetObjectCommand({ Bucket: bucket(), Key: key }));
		if (!res.Body) return null;
		return {
			body: res.Body.transformToWebStream(),
			contentType: res.ContentType ?? 'application/octet-stream',
			length: res.ContentLength
		};
	} catch (err) {
		if ((err as { name?: string }).name === 'NoSuchKey') return null;
		throw err;
	}
}

/** Deletes an object; deleting a missing key is not an error. */
export async function deleteObject(key: string): Promise<void> {
	await s3().send(new DeleteObjectCommand({ Bucket: bucket(), Key: key }));
}

/** File name extensions of the types Tapline stores (uploads.ts re-encodes photos as JPEG). */
const EXTENSIONS: Record<string, string> = { 'application/pdf': 'pdf', 'image/jpeg': 'jpg' };

/**
 * A safe download name: word characters, dots, dashes and spaces only, ending in the extension of
 * the stored type, so a file sent as "x.html" is saved as "x.pdf" and opens in a PDF reader.
 */
export function downloadFileName(name: string, contentType: string) {
	const ext = EXTENSIONS[contentType] ?? 'bin';
	const base =
		name
			.replace(/\.[^.]*$/, '')
			.replace(/[^\w.\- ]/g, '_')
			.slice(0, 100) || 'document';
	return `${base}.${ext}`;
}

/**
 * An HTTP response streaming a stored object, private to the one who asked: never cached by
 * shared caches, never sniffed into another type, shown inline or offered as a download.
 */
export async function objectResponse(
	key: string,
	options: { downloadName?: string } = {}
): Promise<Response | null> {
	const object = await getObject(key);
	if (!object) return null;
	const headers = new Headers({
		'content-type': object.contentType,
		'cache-control': 'private, max-age=300',
		'x-content-type-options': 'nosniff',
		'content-security-policy':
			"default-src 'none'; img-src 'self'; style-src 'unsafe-inline'; sandbox"
	});
	if (object.length !== undefined) headers.set('content-length', String(object.length));
	if (options.downloadName) {
		headers.set(
			'content-disposition',
			`attachment; filename="${downloadFileName(options.downloadName, object.contentType)}"`
		);
	}
	return new Response(object.body, { headers });
}
