import { realpathSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { z } from 'zod';
import { startGeocodeFake } from './geocode';
import { startS3Fake } from './s3';
import { startStripeFake } from './stripe';
import { startMailFake } from './smtp';
import { startTilesFake } from './tiles';

/** Where each fake listens; port 0 asks the OS for a free port. */
export interface FakesConfig {
	host?: string;
	smtpPort?: number;
	mailHttpPort?: number;
	s3Port?: number;
	geocodePort?: number;
	tilesPort?: number;
	stripePort?: number;
	/** Where the payments fake POSTs its events (the app's webhook route). */
	stripeWebhookUrl?: string;
	/** The signing secret shared with the app (`whsec_…`). */
	stripeWebhookSecret?: string;
	/** First retry delay of a failed webhook delivery, doubling each time. */
	stripeRetryBaseMs?: number;
	/** Folder for persistence (`mail/`, `s3/` inside); in memory only when absent. */
	dataDir?: string;
}

/** The URLs the running fakes answer on, with the ports actually bound. */
export interface FakesUrls {
	smtp: string;
	mailApi: string;
	s3: string;
	geocode: string;
	tiles: string;
	stripe: string;
}

/** Ports actually bound, useful when the config asked for port 0. */
export interface FakesPorts {
	smtp: number;
	mailHttp: number;
	s3: number;
	geocode: number;
	tiles: number;
	stripe: number;
}

/** Handle on running fakes. */
export interface RunningFakes {
	urls: FakesUrls;
	ports: FakesPorts;
	close(): Promise<void>;
}

/** Default ports, kept clear of the app (5173/4173/3000) and PostgreSQL (5432). */
export const DEFAULT_PORTS = {
	smtp: 2525,
	mailHttp: 2580,
	s3: 9010,
	geocode: 2590,
	tiles: 2595,
	stripe: 2600
} as const;

/**
 * Starts every fake and resolves once all listen. If one fails to start, those already
 * started are closed before the error is rethrown, so a port clash leaves nothing behind.
 */
export async function startFakes(config: FakesConfig = {}): Promise<RunningFakes> {
	const host = config.host ?? '127.0.0.1';
	const closers: (() => Promise<void>)[] = [];
	try {
		const mail = await startMailFake({
			host,
			smtpPort: config.smtpPort ?? DEFAULT_PORTS.smtp,
			httpPort: config.mailHttpPort ?? DEFAULT_PORTS.mailHttp,
			...(config.dataDir ? { dataDir: config.dataDir } : {})
		});
		closers.push(mail.close);
		const s3 = await startS3Fake({
			host,
			port: config.s3Port ?? DEFAULT_PORTS.s3,
			...(config.dataDir ? { dataDir: config.dataDir } : {})
		});
		closers.push(s3.close);
		const geocode = await startGeocodeFake({
			host,
			port: config.geocodePort ?? DEFAULT_PORTS.geocode
		});
		closers.push(geocode.close);
		const tiles = await startTilesFake({ host, port: config.tilesPort ?? DEFAULT_PORTS.tiles });
		closers.push(tiles.close);
		const stripe = await startStripeFake({
			host,
			port: config.stripePort ?? DEFAULT_PORTS.stripe,
			...(config.dataDir ? { dataDir: config.dataDir } : {}),
			...(config.stripeWebhookUrl ? { webhookUrl: config.stripeWebhookUrl } : {}),
			...(config.stripeWebhookSecret ? { webhookSecret: config.stripeWebhookSecret } : {}),
			...(config.stripeRetryBaseMs !== undefined ? { retryBaseMs: config.stripeRetryBaseMs } : {})
		});
		closers.push(stripe.close);
		return {
			urls: {
				smtp: mail.smtpUrl,
				mailApi: mail.httpUrl,
				s3: s3.url,
				geocode: geocode.url,
				tiles: tiles.url,
				stripe: stripe.url
			},
			ports: {
				smtp: mail.smtpPort,
				mailHttp: mail.httpPort,
				s3: s3.port,
				geocode: geocode.port,
				tiles: tiles.port,
				stripe: stripe.port
			},
			close: async () => {
				await Promise.all(closers.map((close) => close()));
			}
		};
	} catch (err) {
		await Promise.allSettled(closers.map((close) => close()));
		throw err;
	}
}

const port = z.coerce.number().int().min(0).max(65_535);
const envSchema = z.object({
	FAKES_HOST: z.string().min(1).default('127.0.0.1'),
	FAKE_SMTP_PORT: port.default(DEFAULT_PORTS.smtp),
	FAKE_MAIL_HTTP_PORT: port.default(DEFAULT_PORTS.mailHttp),
	FAKE_S3_PORT: port.default(DEFAULT_PORTS.s3),
	FAKE_GEOCODE_PORT: port.default(DEFAULT_PORTS.geocode),
	FAKE_TILES_PORT: port.default(DEFAULT_PORTS.tiles),
	FAKE_STRIPE_PORT: port.default(DEFAULT_PORTS.stripe),
	FAKE_STRIPE_WEBHOOK_URL: z.url().optional(),
	STRIPE_WEBHOOK_SECRET: z.string().min(1).optional(),
	FAKE_STRIPE_RETRY_BASE_MS: z.coerce.number().int().min(1).optional(),
	FAKES_DATA_DIR: z.string().min(1).optional()
});

/**
 * Reads the fakes' configuration from environment variables (see README.md); empty values
 * count as unset.
 */
export function configFromEnv(env: NodeJS.ProcessEnv): FakesConfig {
	const present = Object.fromEntries(Object.entries(env).filter(([, value]) => value !== ''));
	const parsed = envSchema.parse(present);
	return {
		host: parsed.FAKES_HOST,
		smtpPort: parsed.FAKE_SMTP_PORT,
		mailHttpPort: parsed.FAKE_MAIL_HTTP_PORT,
		s3Port: parsed.FAKE_S3_PORT,
		geocodePort: parsed.FAKE_GEOCODE_PORT,
		tilesPort: parsed.FAKE_TILES_PORT,
		stripePort: parsed.FAKE_STRIPE_PORT,
		...(parsed.FAKE_STRIPE_WEBHOOK_URL ? { stripeWebhookUrl: parsed.FAKE_STRIPE_WEBHOOK_URL } : {}),
		...(parsed.STRIPE_WEBHOOK_SECRET ? { stripeWebhookSecret: parsed.STRIPE_WEBHOOK_SECRET } : {}),
		...(parsed.FAKE_STRIPE_RETRY_BASE_MS
			? { stripeRetryBaseMs: parsed.FAKE_STRIPE_RETRY_BASE_MS }
			: {}),
		...(parsed.FAKES_DATA_DIR ? { dataDir: parsed.FAKES_DATA_DIR } : {})
	};
}

async function main(): Promise<void> {
	const config = configFromEnv(process.env);
	const fakes = await startFakes(config);
	console.log(`mail       ${fakes.urls.smtp}  (inbox and API ${fakes.urls.mailApi})`);
	console.log(`S3         ${fakes.urls.s3}  (path-style, any credentials)`);
	console.log(`geocoder   ${fakes.urls.geocode}/search?q=glenelg&format=json`);
	console.log(`map tiles  ${fakes.urls.tiles}/{z}/{x}/{y}.png`);
	console.log(
		`payments   ${fakes.urls.stripe}  (Stripe-compatible API; webhooks to ${config.stripeWebhookUrl ?? 'nowhere'})`
	);
	console.log(config.dataDir ? `data kept in    ${config.dataDir}` : 'data kept in memory only');

	let stopping = false;
	const stop = (signal: NodeJS.Signals): void => {
		if (stopping) {
			// A second Ctrl-C means "now".
			process.exit(1);
		}
		stopping = true;
		console.log(`${signal}: closing fakes`);
		fakes.close().then(
			() => process.exit(0),
			(err: unknown) => {
				console.error(err);
				process.exit(1);
			}
		);
	};
	process.on('SIGINT', stop);
	process.on('SIGTERM', stop);
	process.on('SIGHUP', stop);
}

function isEntryPoint(): boolean {
	const script = process.argv[1];
	if (!script) return false;
	try {
		return realpathSync(script) === realpathSync(fileURLToPath(import.meta.url));
	} catch {
		return false;
	}
}

if (isEntryPoint()) {
	main().catch((err: unknown) => {
		console.error(err);
		process.exit(1);
	});
}
