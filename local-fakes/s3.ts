import { createHash, randomBytes } from 'node:crypto';
import { mkdir, readdir, readFile, rm, writeFile } from 'node:fs/promises';
import type { IncomingMessage, ServerResponse } from 'node:http';
import { join } from 'node:path';
import { crc32 } from 'node:zlib';
import { Crc32c, Crc64Nvme } from '@aws-sdk/checksums/crc';
import { BodyTooLargeError, listenHttp, readBody } from './http-util';

/** Largest single PUT the fake holds in memory; real S3 allows 5 GiB, far beyond demo needs. */
const MAX_OBJECT_BYTES = 100 * 1024 * 1024;

/** S3 keys are at most 1024 bytes of UTF-8 (Amazon S3 User Guide, "Naming objects"). */
const MAX_KEY_BYTES = 1024;

/** ListObjects returns at most 1000 keys a page (S3 API Reference, ListObjectsV2). */
const MAX_LIST_KEYS = 1000;

/** Presigned URLs may live at most 7 days (S3 API Reference, "Authenticating Requests: Query Parameters"). */
const MAX_PRESIGN_SECONDS = 604_800;

/** S3 stores this type when a PUT names none (Amazon S3 User Guide, object metadata). */
const DEFAULT_CONTENT_TYPE = 'binary/octet-stream';

const S3_XMLNS = 'http://s3.amazonaws.com/doc/2006-03-01/';

// Shape of a SigV4 Authorization header (AWS General Reference, "Signature Version 4").
// The signature itself is not checked: any credentials are welcome here.
const AUTH_HEADER =
	/^AWS4-HMAC-SHA256 Credential=[^/\s,]+\/\d{8}\/([a-z0-9-]+)\/s3\/aws4_request,\s*SignedHeaders=[a-z0-9;-]+,\s*Signature=[0-9a-f]{64}$/;
const PRESIGN_CREDENTIAL = /^[^/\s]+\/\d{8}\/([a-z0-9-]+)\/s3\/aws4_request$/;

/** Checksum headers S3 accepts (S3 API Reference, PutObject request headers). */
const CHECKSUM_ALGORITHMS = ['crc32', 'crc32c', 'crc64nvme', 'sha1', 'sha256'] as const;
type ChecksumAlgorithm = (typeof CHECKSUM_ALGORITHMS)[number];

/** An object as the fake keeps it. */
export interface StoredObject {
	key: string;
	body: Buffer;
	contentType: string;
	contentEncoding?: string;
	contentDisposition?: string;
	contentLanguage?: string;
	cacheControl?: string;
	metadata: Record<string, string>;
	checksums: Partial<Record<ChecksumAlgorithm, string>>;
	/** Quoted MD5 hex, as S3 gives for single-part uploads. */
	etag: string;
	lastModified: Date;
}

type PersistedMeta = Omit<StoredObject, 'body' | 'lastModified'> & { lastModified: string };

class S3Error extends Error {
	constructor(
		readonly status: number,
		readonly code: string,
		message: string,
		readonly extra: Record<string, string> = {}
	) {
		super(message);
	}
}

/** Quotes text for XML element content. */
function xml(text: string): string {
	return text
		.replaceAll('&', '&amp;')
		.replaceAll('<', '&lt;')
		.replaceAll('>', '&gt;')
		.replaceAll('"', '&quot;')
		.replaceAll("'", '&apos;');
}

function unxml(text: string): string {
	return text
		.replace(/&#x([0-9a-f]+);/gi, (_, hex: string) => String.fromCodePoint(parseInt(hex, 16)))
		.replace(/&#(\d+);/g, (_, dec: string) => String.fromCodePoint(Number(dec)))
		.replaceAll('&lt;', '<')
		.replaceAll('&gt;', '>')
		.replaceAll('&quot;', '"')
		.replaceAll('&apos;', "'")
		.replaceAll('&amp;', '&');
}

/**
 * Checks a bucket name against S3's general-purpose bucket rules: 3–63 characters of lowercase
 * letters, digits, dots and hyphens, starting and ending with a letter or digit, no `..`, not
 * an IPv4 address (Amazon S3 User Guide, "Bucket naming rules").
 */
export function isValidBucketName(name: string): boolean {
	return (
		/^[a-z0-9][a-z0-9.-]{1,61}[a-z0-9]$/.test(name) &&
		!name.includes('..') &&
		!/^\d+\.\d+\.\d+\.\d+$/.test(name)
	);
}

/**
 * Decodes an `aws-chunked` body (S3 API Reference, "Signature Calculations for the Authorization
 * Header: Transferring Payload in Multiple Chunks"): `hex-size[;chunk-signature=…]\r\n data \r\n`
 * repeated, a zero-size chunk, then optional trailer lines such as `x-amz-checksum-crc32:…`.
 */
export function decodeAwsChunked(encoded: Buffer): { body: Buffer; trailers: Map<string, string> } {
	const parts: Buffer[] = [];
	const trailers = new Map<string, string>();
	let pos = 0;
	for (;;) {
		const eol = encoded.indexOf('\r\n', pos);
		if (eol < 0) throw new S3Error(400, 'IncompleteBody', 'Chunk header is not terminated.');
		const header = encoded.subarray(pos, eol).toString('latin1');
		const sizeText = header.split(';')[0]?.trim() ?? '';
		if (!/^[0-9a-f]+$/i.test(sizeText)) {
			throw new S3Error(400, 'InvalidRequest', 'Malformed aws-chunked chunk header.');
		}
		const size = parseInt(sizeText, 16);
		pos = eol + 2;
		if (size === 0) break;
		if (pos + size + 2 > encoded.length) {
			throw new S3Error(400, 'IncompleteBody', 'Chunk is shorter than its declared size.');
		}
		parts.push(encoded.subarray(pos, pos + size));
		pos += size;
		if (encoded.toString('latin1', pos, pos + 2) !== '\r\n') {
			throw new S3Error(400, 'InvalidRequest', 'Chunk data is not followed by CRLF.');
		}
		pos += 2;
	}
	for (const line of encoded.subarray(pos).toString('latin1').split('\r\n')) {
		const colon = line.indexOf(':');
		if (colon > 0) {
			trailers.set(line.slice(0, colon).trim().toLowerCase(), line.slice(colon + 1).trim());
		}
	}
	return { body: Buffer.concat(parts), trailers };
}

/** The SDK's checksum interface (Smithy `Checksum`): feed bytes, then read the digest. */
interface Checksum {
	update(chunk: Uint8Array): void;
	digest(): Promise<Uint8Array>;
}

async function sdkDigest(checksum: Checksum, body: Buffer): Promise<string> {
	checksum.update(body);
	return Buffer.from(await checksum.digest()).toString('base64');
}

/**
 * The checksum as S3 headers carry it: the digest's big-endian bytes in base64. CRC-32 comes from
 * Node's zlib, CRC-32C and CRC-64/NVME from the AWS SDK's own checksum package.
 */
async function computeChecksum(algorithm: ChecksumAlgorithm, body: Buffer): Promise<string> {
	switch (algorithm) {
		case 'crc32': {
			const out = Buffer.alloc(4);
			out.writeUInt32BE(crc32(body));
			return out.toString('base64');
		}
		case 'crc32c':
			return sdkDigest(new Crc32c(), body);
		case 'crc64nvme':
			return sdkDigest(new Crc64Nvme(), body);
		case 'sha1':
			return createHash('sha1').update(body).digest('base64');
		case 'sha256':
			return createHash('sha256').update(body).digest('base64');
	}
}

function header(req: IncomingMessage, name: string): string | undefined {
	const value = req.headers[name];
	return Array.isArray(value) ? value.join(',') : value;
}

/**
 * The buckets and objects, in memory and optionally mirrored to `<dataDir>/s3/<bucket>/`
 * (one `.bin` body and one `.json` metadata file per object, named by the key's SHA-256).
 */
class ObjectStore {
	readonly buckets = new Map<string, Map<string, StoredObject>>();

	constructor(private readonly dir: string | null) {}

	async load(): Promise<void> {
		if (!this.dir) return;
		await mkdir(this.dir, { recursive: true });
		for (const bucket of await readdir(this.dir)) {
			if (!isValidBucketName(bucket)) continue;
			const objects = new Map<string, StoredObject>();
			this.buckets.set(bucket, objects);
			for (const file of await readdir(join(this.dir, bucket))) {
				if (!file.endsWith('.json')) continue;
				const meta = JSON.parse(
					await readFile(join(this.dir, bucket, file), 'utf8')
				) as PersistedMeta;
				const body = await readFile(join(this.dir, bucket, file.replace(/\.json$/, '.bin')));
				objects.set(meta.key, { ...meta, body, lastModified: new Date(meta.lastModified) });
			}
		}
	}

	private fileBase(bucket: string, key: string): string {
		return join(this.dir ?? '', bucket, createHash('sha256').update(key).digest('hex'));
	}

	async createBucket(bucket: string): Promise<void> {
		this.buckets.set(bucket, new Map());
		if (this.dir) await mkdir(join(this.dir, bucket), { recursive: true });
	}

	async deleteBucket(bucket: string): Promise<void> {
		this.buckets.delete(bucket);
		if (this.dir) await rm(join(this.dir, bucket), { recursive: true, force: true });
	}

	async put(bucket: string, object: StoredObject): Promise<void> {
		if (!this.buckets.has(bucket)) await this.createBucket(bucket);
		this.buckets.get(bucket)?.set(object.key, object);
		if (this.dir) {
			const base = this.fileBase(bucket, object.key);
			const { body, lastModified, ...rest } = object;
			const meta: PersistedMeta = { ...rest, lastModified: lastModified.toISOString() };
			await writeFile(`${base}.bin`, body);
			await writeFile(`${base}.json`, JSON.stringify(meta));
		}
	}

	async delete(bucket: string, key: string): Promise<void> {
		this.buckets.get(bucket)?.delete(key);
		if (this.dir) {
			const base = this.fileBase(bucket, key);
			await rm(`${base}.json`, { force: true });
			await rm(`${base}.bin`, { force: true });
		}
	}
}

/** Options for {@link startS3Fake}. */
export interface S3FakeOptions {
	host: string;
	port: number;
	/** When set, objects are also written under `<dataDir>/s3` and reloaded on start. */
	dataDir?: string;
}

/** A running S3 fake. */
export interface S3Fake {
	url: string;
	port: number;
	close(): Promise<void>;
}

interface RequestContext {
	req: IncomingMessage;
	res: ServerResponse;
	url: URL;
	requestId: string;
	region: string;
}

// Query parameters that never select a different operation.
const IGNORED_PARAMS = /^(x-id|x-amz-[a-z-]+|response-[a-z-]+)$/i;

/**
 * Starts an S3-compatible server for path-style requests (`/bucket/key`): buckets (create,
 * head, delete, list objects v2), objects (put, get with ranges, head, delete, copy) and
 * DeleteObjects. Any SigV4-shaped credentials are accepted; signatures are not verified.
 */
export async function startS3Fake(options: S3FakeOptions): Promise<S3Fake> {
	const store = new ObjectStore(options.dataDir ? join(options.dataDir, 's3') : null);
	await store.load();

	async function handle(req: IncomingMessage, res: ServerResponse): Promise<void> {
		const url = new URL(req.url ?? '/', 'http://fake.invalid');
		const requestId = randomBytes(8).toString('hex').toUpperCase();
		res.setHeader('x-amz-request-id', requestId);
		res.setHeader('x-amz-id-2', randomBytes(24).toString('base64'));
		res.setHeader('server', 'TaplineLocalS3');
		// Permissive CORS so browser uploads to presigned URLs work without a bucket CORS config.
		res.setHeader('access-control-allow-origin', header(req, 'origin') ?? '*');
		res.setHeader('access-control-expose-headers', 'ETag, x-amz-request-id, x-amz-version-id');
		res.setHeader('vary', 'Origin');
		if (req.method === 'OPTIONS') {
			res.writeHead(200, {
				'access-control-allow-methods': 'GET, PUT, POST, DELETE, HEAD',
				'access-control-allow-headers': header(req, 'access-control-request-headers') ?? '*',
				'access-control-max-age': '3000'
			});
			res.end();
			return;
		}
		try {
			const region = authenticate(req, url);
			await route({ req, res, url, requestId, region });
		} catch (err) {
			if (err instanceof S3Error) {
				sendError({ req, res, url, requestId, region: '' }, err);
				return;
			}
			if (err instanceof BodyTooLargeError) {
				sendError(
					{ req, res, url, requestId, region: '' },
					new S3Error(
						400,
						'EntityTooLarge',
						'Your proposed upload exceeds the maximum allowed size.'
					)
				);
				return;
			}
			throw err;
		}
	}

	/** Returns the region named in the credential scope. */
	function authenticate(req: IncomingMessage, url: URL): string {
		const auth = header(req, 'authorization');
		if (auth !== undefined) {
			const match = AUTH_HEADER.exec(auth.trim());
			if (!match) {
				throw new S3Error(403, 'AccessDenied', 'Authorization header is not AWS4-HMAC-SHA256.');
			}
			return match[1] ?? 'us-east-1';
		}
		const q = url.searchParams;
		if (q.get('X-Amz-Algorithm') === 'AWS4-HMAC-SHA256') {
			const credential = PRESIGN_CREDENTIAL.exec(q.get('X-Amz-Credential') ?? '');
			const date = /^(\d{4})(\d{2})(\d{2})T(\d{2})(\d{2})(\d{2})Z$/.exec(q.get('X-Amz-Date') ?? '');
			const expires = Number(q.get('X-Amz-Expires'));
			if (
				!credential ||
				!date ||
				!Number.isInteger(expires) ||
				expires < 1 ||
				expires > MAX_PRESIGN_SECONDS ||
				!/^[0-9a-f]{64}$/.test(q.get('X-Amz-Signature') ?? '')
			) {
				throw new S3Error(403, 'AuthorizationQueryParametersError', 'Malformed presigned URL.');
			}
			const [, y, mo, d, h, mi, s] = date.map(Number);
			const signedAt = Date.UTC(y ?? 0, (mo ?? 1) - 1, d ?? 0, h ?? 0, mi ?? 0, s ?? 0);
			if (Date.now() > signedAt + expires * 1000) {
				throw new S3Error(403, 'AccessDenied', 'Request has expired');
			}
			return credential[1] ?? 'us-east-1';
		}
		throw new S3Error(403, 'AccessDenied', 'Access Denied');
	}

	async function route(ctx: RequestContext): Promise<void> {
		const { req, url } = ctx;
		const method = req.method ?? 'GET';
		// Path-style: the first segment is the bucket, everything after the next slash the key.
		const rawPath = url.pathname.slice(1);
		const slash = rawPath.indexOf('/');
		const bucket = decodePath(slash < 0 ? rawPath : rawPath.slice(0, slash));
		const key = slash < 0 ? '' : decodePath(rawPath.slice(slash + 1));
		const subresources = [...url.searchParams.keys()].filter((k) => !IGNORED_PARAMS.test(k));

		if (bucket === '') {
			if (method !== 'GET') throw methodNotAllowed();
			listBuckets(ctx);
			return;
		}
		if (!isValidBucketName(bucket)) {
			throw new S3Error(400, 'InvalidBucketName', 'The specified bucket is not valid.', {
				BucketName: bucket
			});
		}
		if (key === '') {
			await bucketOperation(ctx, method, bucket, subresources);
			return;
		}
		if (Buffer.byteLength(key) > MAX_KEY_BYTES) {
			throw new S3Error(400, 'KeyTooLongError', 'Your key is too long.');
		}
		if (subresources.length > 0) {
			throw notImplemented(subresources);
		}
		switch (method) {
			case 'PUT':
				if (header(req, 'x-amz-copy-source') !== undefined) {
					await copyObject(ctx, bucket, key);
				} else {
					await putObject(ctx, bucket, key);
				}
				return;
			case 'GET':
			case 'HEAD':
				getObject(ctx, bucket, key, method === 'HEAD');
				return;
			case 'DELETE':
				await store.delete(bucket, key);
				ctx.res.writeHead(204);
				ctx.res.end();
				return;
			default:
				throw methodNotAllowed();
		}
	}

	async function bucketOperation(
		ctx: RequestContext,
		method: string,
		bucket: string,
		subresources: string[]
	): Promise<void> {
		const { res, url } = ctx;
		const objects = store.buckets.get(bucket);
		const noSuchBucket = (): S3Error =>
			new S3Error(404, 'NoSuchBucket', 'The specified bucket does not exist', {
				BucketName: bucket
			});
		const only = subresources.length === 0;

		if (method === 'PUT' && only) {
			await readBody(ctx.req, 64 * 1024);
			// Outside us-east-1, S3 answers a repeated create by the owner with this 409.
			if (objects) {
				throw new S3Error(
					409,
					'BucketAlreadyOwnedByYou',
					'Your previous request to create the named bucket succeeded and you already own it.',
					{ BucketName: bucket }
				);
			}
			await store.createBucket(bucket);
			res.writeHead(200, { location: `/${bucket}`, 'content-length': 0 });
			res.end();
			return;
		}
		if (!objects) throw noSuchBucket();
		if (method === 'HEAD' && only) {
			res.writeHead(200, { 'x-amz-bucket-region': ctx.region || 'us-east-1' });
			res.end();
			return;
		}
		if (method === 'DELETE' && only) {
			if (objects.size > 0) {
				throw new S3Error(409, 'BucketNotEmpty', 'The bucket you tried to delete is not empty', {
					BucketName: bucket
				});
			}
			await store.deleteBucket(bucket);
			res.writeHead(204);
			res.end();
			return;
		}
		if (method === 'GET' && subresources.every((s) => LIST_PARAMS.has(s))) {
			listObjects(ctx, bucket, objects);
			return;
		}
		if (method === 'GET' && subresources.length === 1 && url.searchParams.has('location')) {
			const region = ctx.region === 'us-east-1' || !ctx.region ? '' : xml(ctx.region);
			sendXml(ctx, 200, `<LocationConstraint xmlns="${S3_XMLNS}">${region}</LocationConstraint>`);
			return;
		}
		if (method === 'POST' && subresources.length === 1 && url.searchParams.has('delete')) {
			await deleteObjects(ctx, bucket);
			return;
		}
		throw notImplemented(subresources.length ? subresources : [method]);
	}

	function listBuckets(ctx: RequestContext): void {
		const entries = [...store.buckets.keys()]
			.sort()
			.map(
				(name) =>
					`<Bucket><Name>${xml(name)}</Name><CreationDate>${new Date(0).toISOString()}</CreationDate></Bucket>`
			)
			.join('');
		sendXml(
			ctx,
			200,
			`<ListAllMyBucketsResult xmlns="${S3_XMLNS}"><Owner><ID>local</ID><DisplayName>local</DisplayName></Owner><Buckets>${entries}</Buckets></ListAllMyBucketsResult>`
		);
	}

	function listObjects(
		ctx: RequestContext,
		bucket: string,
		objects: Map<string, StoredObject>
	): void {
		const q = ctx.url.searchParams;
		const v2 = q.get('list-type') === '2';
		const prefix = q.get('prefix') ?? '';
		const delimiter = q.get('delimiter') ?? '';
		const maxKeysParam = Number(q.get('max-keys') ?? MAX_LIST_KEYS);
		const maxKeys =
			Number.isInteger(maxKeysParam) && maxKeysParam >= 0
				? Math.min(maxKeysParam, MAX_LIST_KEYS)
				: MAX_LIST_KEYS;
		const token = q.get('continuation-token');
		// Tokens are opaque to clients; here: the last key or common prefix returned, and which.
		const resume = token !== null ? decodeToken(token) : null;
		const after = resume ? resume.k : ((v2 ? q.get('start-after') : q.get('marker')) ?? '');
		const afterIsPrefix = resume?.p === true;

		const contents: StoredObject[] = [];
		const prefixes: string[] = [];
		let truncated = false;
		let last = { k: '', p: false };
		for (const key of [...objects.keys()].sort()) {
			if (!key.startsWith(prefix) || key <= after) continue;
			// Skip keys rolled up in a common prefix already returned on an earlier page.
			if (afterIsPrefix && key.startsWith(after)) continue;
			let rolled: string | null = null;
			if (delimiter !== '') {
				const at = key.indexOf(delimiter, prefix.length);
				if (at >= 0) rolled = key.slice(0, at + delimiter.length);
			}
			if (rolled !== null && prefixes.at(-1) === rolled) continue;
			if (contents.length + prefixes.length >= maxKeys) {
				truncated = true;
				break;
			}
			if (rolled !== null) {
				prefixes.push(rolled);
				last = { k: rolled, p: true };
			} else {
				const object = objects.get(key);
				if (object) contents.push(object);
				last = { k: key, p: false };
			}
		}
		const items = contents
			.map(
				(o) =>
					`<Contents><Key>${xml(o.key)}</Key><LastModified>${o.lastModified.toISOString()}</LastModified><ETag>${xml(o.etag)}</ETag><Size>${o.body.length}</Size><StorageClass>STANDARD</StorageClass></Contents>`
			)
			.join('');
		const common = prefixes
			.map((p) => `<CommonPrefixes><Prefix>${xml(p)}</Prefix></CommonPrefixes>`)
			.join('');
		const next = truncated
			? v2
				? `<NextContinuationToken>${Buffer.from(JSON.stringify(last)).toString('base64url')}</NextContinuationToken>`
				: `<NextMarker>${xml(last.k)}</NextMarker>`
			: '';
		const paging = v2
			? `<KeyCount>${contents.length + prefixes.length}</KeyCount>${token !== null ? `<ContinuationToken>${xml(token)}</ContinuationToken>` : ''}${q.has('start-after') ? `<StartAfter>${xml(q.get('start-after') ?? '')}</StartAfter>` : ''}`
			: `<Marker>${xml(q.get('marker') ?? '')}</Marker>`;
		sendXml(
			ctx,
			200,
			`<ListBucketResult xmlns="${S3_XMLNS}"><Name>${xml(bucket)}</Name><Prefix>${xml(prefix)}</Prefix>${paging}<MaxKeys>${maxKeys}</MaxKeys>${delimiter ? `<Delimiter>${xml(delimiter)}</Delimiter>` : ''}<IsTruncated>${truncated}</IsTruncated>${items}${common}${next}</ListBucketResult>`
		);
	}

	async function putObject(ctx: RequestContext, bucket: string, key: string): Promise<void> {
		const { req, res } = ctx;
		const encoded = await readBody(req, MAX_OBJECT_BYTES + 64 * 1024);
		const contentEncodings = (header(req, 'content-encoding') ?? '')
			.split(',')
			.map((e) => e.trim())
			.filter((e) => e !== '');
		const chunked =
			contentEncodings.includes('aws-chunked') ||
			(header(req, 'x-amz-content-sha256') ?? '').startsWith('STREAMING-');
		let body = encoded;
		let trailers = new Map<string, string>();
		if (chunked) {
			({ body, trailers } = decodeAwsChunked(encoded));
			const declared = header(req, 'x-amz-decoded-content-length');
			if (declared !== undefined && Number(declared) !== body.length) {
				throw new S3Error(
					400,
					'IncompleteBody',
					'You did not provide the number of bytes specified by the x-amz-decoded-content-length HTTP header.'
				);
			}
		}
		if (body.length > MAX_OBJECT_BYTES) {
			throw new S3Error(
				400,
				'EntityTooLarge',
				'Your proposed upload exceeds the maximum allowed size.'
			);
		}

		const md5 = createHash('md5').update(body);
		const md5Base64 = md5.copy().digest('base64');
		const contentMd5 = header(req, 'content-md5');
		if (contentMd5 !== undefined && contentMd5 !== md5Base64) {
			throw new S3Error(
				400,
				'BadDigest',
				'The Content-MD5 you specified did not match what we received.'
			);
		}
		const checksums = await verifyChecksums(req, trailers, body);

		const metadata: Record<string, string> = {};
		for (const [name, value] of Object.entries(req.headers)) {
			if (name.startsWith('x-amz-meta-') && value !== undefined) {
				metadata[name.slice('x-amz-meta-'.length)] = Array.isArray(value) ? value.join(',') : value;
			}
		}
		const remainingEncoding = contentEncodings.filter((e) => e !== 'aws-chunked').join(', ');
		const object: StoredObject = {
			key,
			body,
			contentType: header(req, 'content-type') ?? DEFAULT_CONTENT_TYPE,
			metadata,
			checksums,
			etag: `"${md5.digest('hex')}"`,
			lastModified: new Date()
		};
		if (remainingEncoding) object.contentEncoding = remainingEncoding;
		const disposition = header(req, 'content-disposition');
		if (disposition) object.contentDisposition = disposition;
		const language = header(req, 'content-language');
		if (language) object.contentLanguage = language;
		const cacheControl = header(req, 'cache-control');
		if (cacheControl) object.cacheControl = cacheControl;
		await store.put(bucket, object);

		const out: Record<string, string | number> = { etag: object.etag, 'content-length': 0 };
		for (const [algorithm, value] of Object.entries(checksums)) {
			out[`x-amz-checksum-${algorithm}`] = value;
		}
		res.writeHead(200, out);
		res.end();
	}

	async function verifyChecksums(
		req: IncomingMessage,
		trailers: Map<string, string>,
		body: Buffer
	): Promise<Partial<Record<ChecksumAlgorithm, string>>> {
		const checksums: Partial<Record<ChecksumAlgorithm, string>> = {};
		for (const algorithm of CHECKSUM_ALGORITHMS) {
			const name = `x-amz-checksum-${algorithm}`;
			const given = header(req, name) ?? trailers.get(name);
			if (given === undefined) continue;
			if ((await computeChecksum(algorithm, body)) !== given) {
				throw new S3Error(
					400,
					'BadDigest',
					`The ${algorithm.toUpperCase()} you specified did not match the calculated checksum.`
				);
			}
			checksums[algorithm] = given;
		}
		return checksums;
	}

	async function copyObject(ctx: RequestContext, bucket: string, key: string): Promise<void> {
		const { req } = ctx;
		await readBody(req, 64 * 1024);
		const source = decodePath((header(req, 'x-amz-copy-source') ?? '').split('?')[0] ?? '').replace(
			/^\//,
			''
		);
		const slash = source.indexOf('/');
		const sourceBucket = slash < 0 ? source : source.slice(0, slash);
		const sourceKey = slash < 0 ? '' : source.slice(slash + 1);
		const found = store.buckets.get(sourceBucket)?.get(sourceKey);
		if (!found) {
			throw new S3Error(404, 'NoSuchKey', 'The specified key does not exist.', { Key: sourceKey });
		}
		const replace = (header(req, 'x-amz-metadata-directive') ?? 'COPY').toUpperCase() === 'REPLACE';
		const copy: StoredObject = { ...found, key, lastModified: new Date() };
		if (replace) {
			copy.contentType = header(req, 'content-type') ?? DEFAULT_CONTENT_TYPE;
			copy.metadata = {};
			for (const [name, value] of Object.entries(req.headers)) {
				if (name.startsWith('x-amz-meta-') && typeof value === 'string') {
					copy.metadata[name.slice('x-amz-meta-'.length)] = value;
				}
			}
		} else if (sourceBucket === bucket && sourceKey === key) {
			throw new S3Error(
				400,
				'InvalidRequest',
				"This copy request is illegal because it is trying to copy an object to itself without changing the object's metadata, storage class, website redirect location or encryption attributes."
			);
		}
		await store.put(bucket, copy);
		sendXml(
			ctx,
			200,
			`<CopyObjectResult xmlns="${S3_XMLNS}"><LastModified>${copy.lastModified.toISOString()}</LastModified><ETag>${xml(copy.etag)}</ETag></CopyObjectResult>`
		);
	}

	function getObject(ctx: RequestContext, bucket: string, key: string, headOnly: boolean): void {
		const { req, res, url } = ctx;
		const objects = store.buckets.get(bucket);
		if (!objects) {
			throw new S3Error(404, 'NoSuchBucket', 'The specified bucket does not exist', {
				BucketName: bucket
			});
		}
		const object = objects.get(key);
		if (!object) {
			throw new S3Error(404, 'NoSuchKey', 'The specified key does not exist.', { Key: key });
		}
		const ifMatch = header(req, 'if-match');
		if (
			ifMatch !== undefined &&
			ifMatch !== '*' &&
			!ifMatch
				.split(',')
				.map((e) => e.trim())
				.includes(object.etag)
		) {
			throw new S3Error(
				412,
				'PreconditionFailed',
				'At least one of the pre-conditions you specified did not hold',
				{ Condition: 'If-Match' }
			);
		}
		const ifNoneMatch = header(req, 'if-none-match');
		if (
			ifNoneMatch !== undefined &&
			(ifNoneMatch === '*' ||
				ifNoneMatch
					.split(',')
					.map((e) => e.trim())
					.includes(object.etag))
		) {
			res.writeHead(304, { etag: object.etag, 'last-modified': object.lastModified.toUTCString() });
			res.end();
			return;
		}

		const headers: Record<string, string | number> = {
			'content-type': url.searchParams.get('response-content-type') ?? object.contentType,
			etag: object.etag,
			'last-modified': object.lastModified.toUTCString(),
			'accept-ranges': 'bytes'
		};
		const optional: [string, string | undefined][] = [
			[
				'content-encoding',
				url.searchParams.get('response-content-encoding') ?? object.contentEncoding
			],
			[
				'content-disposition',
				url.searchParams.get('response-content-disposition') ?? object.contentDisposition
			],
			[
				'content-language',
				url.searchParams.get('response-content-language') ?? object.contentLanguage
			],
			['cache-control', url.searchParams.get('response-cache-control') ?? object.cacheControl]
		];
		for (const [name, value] of optional) {
			if (value) headers[name] = value;
		}
		for (const [name, value] of Object.entries(object.metadata)) {
			headers[`x-amz-meta-${name}`] = value;
		}

		let status = 200;
		let body = object.body;
		const range = parseRange(header(req, 'range'), object.body.length);
		if (range === 'unsatisfiable') {
			throw new S3Error(416, 'InvalidRange', 'The requested range is not satisfiable', {
				RangeRequested: header(req, 'range') ?? '',
				ActualObjectSize: String(object.body.length)
			});
		}
		if (range) {
			status = 206;
			body = object.body.subarray(range.start, range.end + 1);
			headers['content-range'] = `bytes ${range.start}-${range.end}/${object.body.length}`;
		} else if ((header(req, 'x-amz-checksum-mode') ?? '').toUpperCase() === 'ENABLED') {
			// Whole-object checksums only; S3 leaves them off ranged reads.
			for (const [algorithm, value] of Object.entries(object.checksums)) {
				headers[`x-amz-checksum-${algorithm}`] = value;
			}
			if (Object.keys(object.checksums).length > 0) headers['x-amz-checksum-type'] = 'FULL_OBJECT';
		}
		headers['content-length'] = body.length;
		res.writeHead(status, headers);
		res.end(headOnly ? undefined : body);
	}

	async function deleteObjects(ctx: RequestContext, bucket: string): Promise<void> {
		const text = (await readBody(ctx.req, 2 * 1024 * 1024)).toString('utf8');
		const quiet = /<Quiet>\s*true\s*<\/Quiet>/i.test(text);
		const keys = [...text.matchAll(/<Key>([\s\S]*?)<\/Key>/g)].map((m) => unxml(m[1] ?? ''));
		if (keys.length > MAX_LIST_KEYS) {
			throw new S3Error(
				400,
				'MalformedXML',
				'The XML you provided was not well-formed or did not validate against our published schema.'
			);
		}
		for (const key of keys) await store.delete(bucket, key);
		const deleted = quiet
			? ''
			: keys.map((k) => `<Deleted><Key>${xml(k)}</Key></Deleted>`).join('');
		sendXml(ctx, 200, `<DeleteResult xmlns="${S3_XMLNS}">${deleted}</DeleteResult>`);
	}

	const running = await listenHttp(handle, options.host, options.port);
	return { url: running.url, port: running.port, close: running.close };
}

function decodeToken(token: string): { k: string; p: boolean } {
	try {
		const parsed: unknown = JSON.parse(Buffer.from(token, 'base64url').toString('utf8'));
		if (
			typeof parsed === 'object' &&
			parsed !== null &&
			'k' in parsed &&
			typeof parsed.k === 'string' &&
			'p' in parsed &&
			typeof parsed.p === 'boolean'
		) {
			return { k: parsed.k, p: parsed.p };
		}
	} catch {
		// fall through to the S3 error below
	}
	throw new S3Error(400, 'InvalidArgument', 'The continuation token provided is incorrect');
}

/** Percent-decodes a path segment, answering S3's InvalidURI for malformed escapes. */
function decodePath(text: string): string {
	try {
		return decodeURIComponent(text);
	} catch {
		throw new S3Error(400, 'InvalidURI', "Couldn't parse the specified URI.");
	}
}

const LIST_PARAMS = new Set([
	'list-type',
	'prefix',
	'delimiter',
	'max-keys',
	'continuation-token',
	'start-after',
	'marker',
	'encoding-type',
	'fetch-owner'
]);

/**
 * Parses a single `bytes=` range (RFC 9110 §14.1.2); multi-range requests are served whole,
 * as S3 does.
 */
function parseRange(
	value: string | undefined,
	size: number
): { start: number; end: number } | 'unsatisfiable' | null {
	const match = value === undefined ? null : /^bytes=(\d*)-(\d*)$/.exec(value.trim());
	if (!match) return null;
	const [, from = '', to = ''] = match;
	if (from === '' && to === '') return null;
	if (from === '') {
		const suffix = Number(to);
		if (suffix === 0) return 'unsatisfiable';
		return { start: Math.max(0, size - suffix), end: size - 1 };
	}
	const start = Number(from);
	if (start >= size) return 'unsatisfiable';
	const end = to === '' ? size - 1 : Math.min(Number(to), size - 1);
	return end < start ? null : { start, end };
}

function methodNotAllowed(): S3Error {
	return new S3Error(
		405,
		'MethodNotAllowed',
		'The specified method is not allowed against this resource.'
	);
}

function notImplemented(what: string[]): S3Error {
	return new S3Error(
		501,
		'NotImplemented',
		`The local S3 fake does not implement: ${what.join(', ')}.`
	);
}

function sendXml(ctx: RequestContext, status: number, body: string): void {
	const text = `<?xml version="1.0" encoding="UTF-8"?>\n${body}`;
	ctx.res.writeHead(status, {
		'content-type': 'application/xml',
		'content-length': Buffer.byteLength(text)
	});
	ctx.res.end(text);
}

/** S3's error body (S3 API Reference, "Error responses"); HEAD responses carry no body. */
function sendError(ctx: RequestContext, err: S3Error): void {
	// Drain whatever the client is still sending so the socket can be reused.
	ctx.req.resume();
	if (ctx.req.method === 'HEAD') {
		ctx.res.writeHead(err.status, { 'x-amz-error-code': err.code });
		ctx.res.end();
		return;
	}
	const extra = Object.entries(err.extra)
		.map(([name, value]) => `<${name}>${xml(value)}</${name}>`)
		.join('');
	sendXml(
		ctx,
		err.status,
		`<Error><Code>${xml(err.code)}</Code><Message>${xml(err.message)}</Message>${extra}<RequestId>${ctx.requestId}</RequestId><HostId>${xml(String(ctx.res.getHeader('x-amz-id-2') ?? ''))}</HostId></Error>`
	);
}
