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
		if (isMissing(err)) return null;
		throw err;
	}
}

/**
 * True for S3's "not there" answers: the key (NoSuchKey) or the whole bucket (NoSuchBucket, as
 * after a store was emptied while the database still lists its objects).
 */
function isMissing(err: unknown): boolean {
	const e = err as { name?: string; $metadata?: { httpStatusCode?: number } };
	return e.name === 'NoSuchKey' || e.name === 'NoSuchBucket' || e.$metadata?.httpStatusCode === 404;
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

// A grey frame with a crossed-out picture: drawn in place of a photo whose file is gone.
const MISSING_IMAGE_SVG = `<svg xmlns="http://www.w3.org/2000/svg" width="320" height="320" viewBox="0 0 320 320" role="img" aria-label="Photo unavailable"><rect width="320" height="320" fill="#e7e5e4"/><rect x="100" y="105" width="120" height="90" rx="8" fill="none" stroke="#78716c" stroke-width="8"/><path d="M112 183l32-36 22 24 16-14 26 26" fill="none" stroke="#78716c" stroke-width="8" stroke-linejoin="round"/><path d="M96 92l128 116" stroke="#78716c" stroke-width="8" stroke-linecap="round"/><text x="160" y="250" text-anchor="middle" font-family="sans-serif" font-size="22" fill="#44403c">Photo unavailable</text></svg>`;

/**
 * The answer for an image whose object is missing from storage: 404, with a placeholder picture
 * as the body so an `<img>` still shows something sensible instead of a broken image.
 */
export function missingImageResponse(): Response {
	return new Response(MISSING_IMAGE_SVG, {
		status: 404,
		headers: {
			'content-type': 'image/svg+xml',
			'cache-control': 'private, no-store',
			'x-content-type-options': 'nosniff',
			'content-security-policy': "default-src 'none'; style-src 'unsafe-inline'; sandbox"
		}
	});
}
