import { createServer, type IncomingMessage, type Server, type ServerResponse } from 'node:http';
import type { AddressInfo } from 'node:net';

/** Thrown by {@link readBody} when a request body is larger than the fake is willing to hold. */
export class BodyTooLargeError extends Error {
	constructor(readonly limit: number) {
		super(`request body larger than ${limit} bytes`);
	}
}

/**
 * Reads a whole request body into memory.
 * The fakes keep everything in memory anyway, so streaming would buy nothing here.
 */
export async function readBody(req: IncomingMessage, limit: number): Promise<Buffer> {
	const chunks: Buffer[] = [];
	let size = 0;
	for await (const chunk of req) {
		const buf = Buffer.isBuffer(chunk) ? chunk : Buffer.from(String(chunk));
		size += buf.length;
		if (size > limit) {
			throw new BodyTooLargeError(limit);
		}
		chunks.push(buf);
	}
	return Buffer.concat(chunks);
}

/**
 * Reads a small JSON request body; an empty body reads as an empty object so that
 * `curl -X POST` without data behaves like `{}`.
 */
export async function readJson(req: IncomingMessage): Promise<unknown> {
	const body = await readBody(req, 64 * 1024);
	if (body.length === 0) {
		return {};
	}
	return JSON.parse(body.toString('utf8')) as unknown;
}

/** Writes a JSON response. */
export function sendJson(res: ServerResponse, status: number, data: unknown): void {
	const body = JSON.stringify(data);
	res.writeHead(status, {
		'content-type': 'application/json; charset=utf-8',
		'content-length': Buffer.byteLength(body),
		'cache-control': 'no-store'
	});
	res.end(body);
}

/** Escapes text for HTML element content and double- or single-quoted attribute values. */
export function escapeHtml(text: string): string {
	return text
		.replaceAll('&', '&amp;')
		.replaceAll('<', '&lt;')
		.replaceAll('>', '&gt;')
		.replaceAll('"', '&quot;')
		.replaceAll("'", '&#39;');
}

/** A request handler that may be async; rejections become 500 responses. */
export type RequestHandler = (req: IncomingMessage, res: ServerResponse) => void | Promise<void>;

/** A running HTTP listener with its bound port and a close that does not wait on idle keep-alives. */
export interface RunningHttpServer {
	server: Server;
	port: number;
	url: string;
	close(): Promise<void>;
}

/**
 * Starts an HTTP server on host:port (port 0 picks a free one) and resolves once it listens.
 */
export async function listenHttp(
	handler: RequestHandler,
	host: string,
	port: number
): Promise<RunningHttpServer> {
	const server = createServer((req, res) => {
		Promise.resolve()
			.then(() => handler(req, res))
			.catch((err: unknown) => {
				const message = err instanceof Error ? err.message : String(err);
				if (!res.headersSent) {
					sendJson(res, 500, { error: message });
				} else {
					res.destroy();
				}
			});
	});
	await new Promise<void>((resolve, reject) => {
		server.once('error', reject);
		server.listen(port, host, () => {
			server.off('error', reject);
			resolve();
		});
	});
	const bound = (server.address() as AddressInfo).port;
	return {
		server,
		port: bound,
		url: `http://${urlHost(host)}:${bound}`,
		close: () =>
			new Promise<void>((resolve, reject) => {
				server.close((err) => (err ? reject(err) : resolve()));
				// Keep-alive sockets from SDK clients would otherwise hold close() open for seconds.
				server.closeAllConnections();
			})
	};
}

/** Brackets IPv6 literals so the host can sit inside a URL. */
export function urlHost(host: string): string {
	return host.includes(':') ? `[${host}]` : host;
}
