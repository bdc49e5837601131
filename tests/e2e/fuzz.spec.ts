/**
 * Property-based fuzzing of every page load, form action and endpoint found in src/routes (issue
 * 17), with fast-check, against the running app, its database and the fakes. Each request is sent
 * as anonymous, the demo owner, installer or admin, with generated path parameters, query strings
 * and bodies (urlencoded, multipart, broken multipart, JSON, text), full of NUL bytes, bidi and
 * zero-width marks, very long strings, odd numbers, repeated keys and broken percent-encodings.
 *
 * For every request: no 5xx, no stack trace or SQL text in the body; and when every request of a
 * run was refused (a 4xx, or a redirect to sign in), no row of any table changed.
 *
 * Replay: FUZZ_SEED=<the seed printed below>. FUZZ_RUNS sets the runs per target (default 8).
 */
import type { APIRequestContext, APIResponse } from '@playwright/test';
import fc from 'fast-check';
import { DEMO, expect, test } from './fixtures';
import { BASE_URL, closeQueries, query, signedIn } from './support/requests';
import { changedTables, tableChecksums } from './support/checksums';
import { LEAKS } from './support/leaks';
import {
	fieldNames,
	fillPattern,
	routeTargets,
	targetName,
	type RouteTarget
} from './support/routes';

/**
 * The seed: FUZZ_SEED when given, else one drawn per `npm test` run (from its database's name, which
 * is new each run), so a worker restarted after a failure goes on with the same seed.
 */
const SEED = process.env.FUZZ_SEED
	? Number(process.env.FUZZ_SEED)
	: hashOf(process.env.DATABASE_URL ?? String(Date.now())) % 2 ** 31;
const RUNS = Number(process.env.FUZZ_RUNS ?? 8);
/** The whole spec's time budget, shared out among the targets (fast-check stops a target early). */
const BUDGET_MS = Number(process.env.FUZZ_BUDGET_MS ?? 100_000);
console.log(`fuzz: seed ${SEED} (replay with FUZZ_SEED=${SEED}), ${RUNS} runs per target`);

const TARGETS = routeTargets();
const TIME_PER_TARGET_MS = Math.max(500, Math.floor(BUDGET_MS / TARGETS.length));

type Persona = 'anonymous' | 'owner' | 'installer' | 'admin';
const PERSONAS: Persona[] = ['anonymous', 'owner', 'installer', 'admin'];

/** Who a route group lets in; everyone for routes outside a role's group. */
function allowedPersonas(t: RouteTarget): Persona[] {
	switch (t.group) {
		case 'owner':
		case 'installer':
		case 'admin':
			return [t.group];
		case 'account':
			return ['owner', 'installer', 'admin'];
		default:
			return PERSONAS;
	}
}

/**
 * Answers a target must give whatever it is sent, beside the general rules. The payments webhook
 * is fuzzed like every endpoint, but nothing generated carries the provider's signature.
 */
const EXPECTED_STATUS: Record<string, number[]> = {
	// 400 for a body without a valid signature; 415 for a form body in a charset other than UTF-8,
	// refused by the hooks before the route (the provider posts JSON).
	'POST /api/webhooks/stripe': [400, 415]
};

/**
 * Personas a target is fuzzed as. An action that never reads the request acts on its path alone,
 * so any body carries it out: with no path parameter, it is sent only as personas it refuses
 * (otherwise the fuzz would sign the demo accounts out, close nothing but post new drafts, submit
 * applications, ask for payout set-up...); with one, it gets no real ids (see below).
 */
function personasFor(t: RouteTarget): Persona[] {
	if (t.kind !== 'action' || t.readsRequest || t.params.length > 0) return PERSONAS;
	const allowed = allowedPersonas(t);
	const refused = PERSONAS.filter((p) => !allowed.includes(p));
	// Routes open to everyone (sign-out, resending a confirmation): anonymous has nothing to lose.
	return refused.length > 0 ? refused : ['anonymous'];
}

// ---------------------------------------------------------------------------------------------
// Generated values

const SPECIAL = [
	'\u0000',
	'\u202E', // right-to-left override
	'\u202B',
	'\u2066',
	'\u200B', // zero-width space
	'\u200D',
	'\uFEFF',
	'\r\n',
	'\t',
	'\\',
	'"',
	"'",
	'<script>x</script>',
	'../',
	'%',
	'\uD800', // a lone surrogate (becomes U+FFFD in UTF-8)
	'😀'
];
/** Written into URLs and urlencoded bodies as they are: broken or awkward percent-encodings. */
const RAW_TOKENS = [
	'',
	'',
	'',
	'%C3%28',
	'%FF',
	'%',
	'%0',
	'%E2%80%AE',
	'%ZZ',
	'%00',
	'%F0%9F',
	'+'
];
const ODD_VALUES = [
	'',
	' ',
	'NaN',
	'Infinity',
	'-Infinity',
	'-1',
	'-0.0000001',
	'1e400',
	'-1e400',
	'9'.repeat(40),
	'0x1F',
	'1_000',
	'١٢٣',
	'true',
	'null',
	'undefined',
	'[]',
	'{}',
	'[object Object]',
	"' OR 1=1 --",
	'2026-02-30',
	'2026-13-01',
	'9999-12-31T25:61:00Z',
	'00000000-0000-0000-0000-000000000000'
];

const hostileString: fc.Arbitrary<string> = fc.oneof(
	{ weight: 3, arbitrary: fc.constantFrom(...ODD_VALUES) },
	{ weight: 2, arbitrary: fc.string({ unit: 'binary', maxLength: 40 }) },
	{
		weight: 3,
		arbitrary: fc
			.tuple(
				fc.string({ maxLength: 12 }),
				fc.constantFrom(...SPECIAL),
				fc.string({ maxLength: 12 })
			)
			.map(([a, s, b]) => a + s + b)
	},
	{
		weight: 1,
		arbitrary: fc
			.tuple(
				fc.constantFrom('a', '\u202E', 'é', '9', '\u200B'),
				fc.constantFrom(300, 5_000, 200_000)
			)
			.map(([c, n]) => c.repeat(n))
	}
);

/** Percent-encodes every byte of the UTF-8 text that is not unreserved. */
function pctEncode(text: string): string {
	let out = '';
	for (const byte of Buffer.from(text, 'utf8')) {
		const c = String.fromCharCode(byte);
		out += /[A-Za-z0-9\-_.~]/.test(c) ? c : `%${byte.toString(16).toUpperCase().padStart(2, '0')}`;
	}
	return out;
}

const QUERY_KEYS = [
	'page',
	'q',
	'sort',
	'dir',
	'from',
	'to',
	'status',
	'role',
	'standing',
	'redirectTo',
	'token',
	'needed',
	'lat',
	'lng',
	'radius',
	'cursor',
	'limit',
	'id',
	'download',
	'__proto__'
];
const SPECIAL_KEYS = [
	'__proto__',
	'constructor',
	'a[]',
	'a[0]',
	'a.b',
	'__superform_id',
	'__superform_json'
];

interface Pair {
	key: string;
	value: string;
	raw: string;
}
const pairOf = (keys: fc.Arbitrary<string>): fc.Arbitrary<Pair> =>
	fc.record({ key: keys, value: hostileString, raw: fc.constantFrom(...RAW_TOKENS) });

function keyArb(known: string[]): fc.Arbitrary<string> {
	return fc.oneof(
		...(known.length > 0 ? [{ weight: 4, arbitrary: fc.constantFrom(...known) }] : []),
		{ weight: 1, arbitrary: fc.constantFrom(...SPECIAL_KEYS) },
		{ weight: 1, arbitrary: hostileString.map((s) => s.slice(0, 60)) }
	);
}

const encodePairs = (pairs: Pair[]) =>
	pairs.map((p) => `${pctEncode(p.key)}=${pctEncode(p.value)}${p.raw}`).join('&');

interface FilePart {
	name: string;
	filename: string;
	type: string;
	bytes: Uint8Array;
}
const filePart = (known: string[]): fc.Arbitrary<FilePart> =>
	fc.record({
		name: keyArb(known),
		filename: fc.oneof(
			fc.constantFrom('photo.jpg', 'doc.pdf', '', '../../etc/passwd'),
			hostileString
		),
		type: fc.constantFrom('image/jpeg', 'application/pdf', 'text/plain', '', 'image/svg+xml'),
		bytes: fc.oneof(
			fc.uint8Array({ maxLength: 2_000 }),
			// Right magic bytes, wrong contents.
			fc.uint8Array({ maxLength: 500 }).map((b) => Uint8Array.from([0xff, 0xd8, 0xff, 0xe0, ...b])),
			fc
				.uint8Array({ maxLength: 500 })
				.map((b) => Uint8Array.from([...Buffer.from('%PDF-1.7\n'), ...b]))
		)
	});

function multipartBody(boundary: string, pairs: Pair[], files: FilePart[]): Buffer {
	const chunks: Buffer[] = [];
	// Header values are written without CR/LF; anything else (NUL, bidi marks) stays.
	const headerSafe = (s: string) => s.replace(/[\r\n"]/g, '_');
	for (const p of pairs) {
		chunks.push(
			Buffer.from(
				`--${boundary}\r\nContent-Disposition: form-data; name="${headerSafe(p.key)}"\r\n\r\n${p.value}\r\n`
			)
		);
	}
	for (const f of files) {
		chunks.push(
			Buffer.from(
				`--${boundary}\r\nContent-Disposition: form-data; name="${headerSafe(f.name)}"; filename="${headerSafe(f.filename)}"\r\n` +
					(f.type ? `Content-Type: ${f.type}\r\n` : '') +
					'\r\n'
			),
			Buffer.from(f.bytes),
			Buffer.from('\r\n')
		);
	}
	chunks.push(Buffer.from(`--${boundary}--\r\n`));
	return Buffer.concat(chunks);
}

interface Body {
	label: string;
	contentType?: string;
	data?: Buffer;
}

/** A request body; `poison` puts a NUL into every value, so no body can be a valid one. */
function bodyArb(known: string[], poison: boolean): fc.Arbitrary<Body> {
	const knownPairs = fc
		.subarray(known)
		.chain((names) =>
			fc
				.tuple(
					...names.map(() =>
						fc.record({ value: hostileString, raw: fc.constantFrom(...RAW_TOKENS) })
					)
				)
				.map((vs) => vs.map((v, i) => ({ key: names[i]!, ...v })))
		);
	const pairs = fc
		.tuple(knownPairs, fc.array(pairOf(keyArb(known)), { maxLength: 6 }))
		.map(([a, b]) => [...a, ...b])
		.map((ps) => (poison ? ps.map((p) => ({ ...p, value: `${p.value}\u0000` })) : ps));
	const boundary = '----tapline-fuzz-boundary';
	return fc.oneof(
		fc.constant<Body>({ label: 'empty' }),
		pairs.map<Body>((ps) => ({
			label: 'urlencoded',
			contentType: 'application/x-www-form-urlencoded',
			data: Buffer.from(encodePairs(ps))
		})),
		fc.tuple(pairs, fc.array(filePart(known), { maxLength: 2 })).map<Body>(([ps, files]) => ({
			label: 'multipart',
			contentType: `multipart/form-data; boundary=${boundary}`,
			data: multipartBody(boundary, ps, files)
		})),
		fc
			.tuple(
				pairs,
				fc.array(filePart(known), { maxLength: 1 }),
				fc.nat(),
				fc.constantFrom('cut', 'no-boundary', 'other-boundary', 'no-blank-line')
			)
			.map<Body>(([ps, files, cut, how]) => {
				const whole = multipartBody(boundary, ps, files);
				const broken =
					how === 'cut'
						? whole.subarray(0, cut % Math.max(1, whole.length))
						: how === 'no-blank-line'
							? Buffer.from(whole.toString('latin1').replace(/\r\n\r\n/g, '\r\n'), 'latin1')
							: whole;
				return {
					label: `broken multipart (${how})`,
					contentType:
						how === 'no-boundary'
							? 'multipart/form-data'
							: how === 'other-boundary'
								? 'multipart/form-data; boundary=not-the-one-used'
								: `multipart/form-data; boundary=${boundary}`,
					data: broken
				};
			}),
		fc.tuple(pairs, fc.jsonValue({ maxDepth: 2 })).map<Body>(([ps, extra]) => ({
			label: 'json',
			contentType: 'application/json',
			data: Buffer.from(
				JSON.stringify({ ...Object.fromEntries(ps.map((p) => [p.key, p.value])), extra })
			)
		})),
		fc
			.tuple(
				fc.constantFrom(
					'text/plain',
					'application/x-www-form-urlencoded; charset=utf-16',
					'application/octet-stream'
				),
				fc.uint8Array({ maxLength: 1_000 })
			)
			.map<Body>(([type, bytes]) => ({
				label: type,
				contentType: type,
				data: Buffer.from(bytes)
			}))
	);
}

interface FuzzRequest {
	persona: Persona;
	params: Record<string, string>;
	/** Whether a path parameter is the id of a real row. */
	realId: boolean;
	query: string;
	accept: string;
	body?: Body;
	poisoned: boolean;
}

let realIds: string[] = ['00000000-0000-4000-8000-000000000000'];

function paramArb(matcher: string | undefined, allowReal: boolean) {
	const malformed = fc
		.tuple(hostileString, fc.constantFrom(...RAW_TOKENS))
		.map(([s, raw]) => ({ value: pctEncode(s.slice(0, 100)) + raw, real: false }));
	if (matcher === 'uuid') {
		return fc.oneof(
			fc.uuid().map((value) => ({ value, real: false })),
			...(allowReal ? [fc.constantFrom(...realIds).map((value) => ({ value, real: true }))] : []),
			fc.constantFrom(...realIds).map((id) => ({ value: `${id}%20`, real: false })),
			malformed
		);
	}
	return fc.oneof(
		fc.constantFrom('full', 'thumb').map((value) => ({ value, real: false })),
		malformed
	);
}

function requestArb(t: RouteTarget): fc.Arbitrary<FuzzRequest> {
	const known = fieldNames(t);
	const allowed = allowedPersonas(t);
	return fc.constantFrom(...personasFor(t)).chain((persona) => {
		const isAllowed = allowed.includes(persona);
		// An action that does not read the request, sent with a real id by someone it lets in,
		// would be carried out (cancel a booking, withdraw a quote, post a draft): never a real id.
		const allowReal = !(t.kind === 'action' && !t.readsRequest && isAllowed);
		const params = fc.tuple(...t.params.map((p) => paramArb(p.matcher, allowReal)));
		return fc
			.record({
				params,
				query: fc.array(pairOf(fc.oneof(fc.constantFrom(...QUERY_KEYS), keyArb([]))), {
					maxLength: 4
				}),
				accept: fc.constantFrom('text/html,application/xhtml+xml', 'application/json', '*/*')
			})
			.chain(({ params: values, query, accept }) => {
				const realId = values.some((v) => v.real);
				// A body that might be valid, sent with a real id (or to a route without one) by a
				// person the route lets in, could change the shared demo data other specs use (rename
				// the demo owner, change settings, message, quote, review): those bodies carry a NUL in
				// every value, and must change no row whatever the answer.
				const poisoned =
					t.kind === 'action' && t.readsRequest && isAllowed && (realId || t.params.length === 0);
				const base = {
					persona,
					params: Object.fromEntries(t.params.map((p, i) => [p.name, values[i]!.value])),
					realId,
					// Kept well under Node's 16 KB for the request line and headers (long values go in bodies).
					query: encodePairs(
						query.map((p) => ({ ...p, key: p.key.slice(0, 40), value: p.value.slice(0, 100) }))
					),
					accept,
					poisoned
				};
				if (t.method === 'GET') return fc.constant<FuzzRequest>(base);
				return bodyArb(known, poisoned).map<FuzzRequest>((body) => ({ ...base, body }));
			});
	});
}

// ---------------------------------------------------------------------------------------------
// Sending and checking

const contexts: Partial<Record<Persona, APIRequestContext>> = {};
const closers: Array<() => Promise<void>> = [];

function urlOf(t: RouteTarget, r: FuzzRequest): string {
	const path = fillPattern(t.pattern, r.params);
	const action = t.kind === 'action' && t.action !== 'default' ? `/${t.action}` : '';
	const search = [action, r.query].filter(Boolean).join('&');
	return `${BASE_URL}${path}${search ? `?${search}` : ''}`;
}

/**
 * The status and redirect an answer stands for. A form action asked for JSON (as `use:enhance`
 * does) answers 200 with `{ type, status, location }` in the body; that inner status counts.
 */
function outcome(
	t: RouteTarget,
	res: APIResponse,
	text: string
): { status: number; location: string } {
	const status = res.status();
	const location = res.headers()['location'] ?? '';
	if (t.kind !== 'action' || status !== 200 || !/json/.test(res.headers()['content-type'] ?? '')) {
		return { status, location };
	}
	const answer = JSON.parse(text) as { type?: string; status?: number; location?: string };
	if (answer.type === 'failure' || answer.type === 'error')
		return { status: answer.status ?? 500, location: '' };
	if (answer.type === 'redirect')
		return { status: answer.status ?? 303, location: answer.location ?? '' };
	return { status, location };
}

function refused({ status, location }: { status: number; location: string }): boolean {
	if (status >= 400 && status < 500) return true;
	return (
		status >= 300 &&
		status < 400 &&
		/^(\/|https?:\/\/[^/]+\/)(sign-in|verify-email)\b/.test(location)
	);
}

const counts = {
	targets: 0,
	runs: 0,
	requests: 0,
	refused: 0,
	accepted: 0,
	resets: 0,
	comparisons: 0
};

// Tables whose rows change on their own: rate_limit (throttling counters), session (expiry is
// extended on use; only which sessions exist is compared) and email_outbox (the sender marks rows
// sent in the background; only which messages exist is compared).
/** The last few requests sent, named in the error when the app stops answering. */
const recent: string[] = [];

async function send(t: RouteTarget, r: FuzzRequest): Promise<APIResponse | null> {
	const context = contexts[r.persona]!;
	recent.push(
		`${r.persona} ${t.method} ${urlOf(t, r).slice(0, 400)} [${r.body?.label ?? 'no body'}] ${r.body?.data?.toString('utf8').slice(0, 400) ?? ''}`
	);
	if (recent.length > 5) recent.shift();
	const headers: Record<string, string> = { origin: BASE_URL, accept: r.accept };
	if (r.body?.contentType) headers['content-type'] = r.body.contentType;
	try {
		return await context.fetch(urlOf(t, r), {
			method: t.method,
			headers,
			data: r.body?.data,
			maxRedirects: 0,
			failOnStatusCode: false,
			timeout: 30_000
		});
	} catch (e) {
		// A server may answer a refused request before reading its body and close the connection,
		// which the client sees as a reset while it is still sending: that is a refusal, as long as
		// the app still answers.
		if (/ECONNRESET|EPIPE/.test(String(e))) {
			const alive = await fetch(`${BASE_URL}/sign-in`).catch(() => null);
			if (alive?.status === 200) {
				counts.resets++;
				return null;
			}
		}
		throw new Error(
			`No answer (${String(e).slice(0, 200)}); the last requests were:\n${recent.join('\n')}`,
			{ cause: e }
		);
	}
}

function describe(t: RouteTarget, r: FuzzRequest, res: APIResponse | null) {
	return `${r.persona} ${t.method} ${urlOf(t, r).slice(0, 300)} [${r.body?.label ?? 'no body'}${r.poisoned ? ', poisoned' : ''}] → ${res?.status() ?? 'closed unread'}`;
}

/** Checks one answer; returns whether it was a refusal. */
async function check(t: RouteTarget, r: FuzzRequest, res: APIResponse | null): Promise<boolean> {
	if (!res) return true; // closed before the body was read (see send)
	const where = describe(t, r, res);
	const text = (await res.body()).toString('utf8');
	const answer = outcome(t, res, text);
	const status = answer.status;
	expect(status, `${where}: no 5xx\n${text.slice(0, 500)}`).toBeLessThan(500);
	const expected = EXPECTED_STATUS[targetName(t)];
	if (expected) expect(expected, where).toContain(status);
	for (const pattern of LEAKS) {
		const m = pattern.exec(text);
		expect(m?.[0], `${where}: the body shows ${pattern}`).toBeUndefined();
	}
	return refused(answer);
}

function hashOf(text: string): number {
	let h = 2166136261;
	for (const c of text) h = Math.imul(h ^ c.charCodeAt(0), 16777619);
	return h >>> 0;
}

test.beforeAll(async ({ browser }) => {
	const anonymous = await browser.newContext({ baseURL: BASE_URL });
	contexts.anonymous = anonymous.request;
	closers.push(() => anonymous.close());
	for (const persona of ['owner', 'installer', 'admin'] as const) {
		const context = await signedIn(browser, DEMO[persona]);
		contexts[persona] = context.request;
		closers.push(() => context.close());
	}
	const ids = await query<{ id: string }>(`
		(SELECT id::text FROM job ORDER BY created_at LIMIT 4)
		UNION ALL (SELECT id::text FROM booking ORDER BY created_at LIMIT 4)
		UNION ALL (SELECT id FROM "user" WHERE role <> 'admin' ORDER BY created_at LIMIT 4)
		UNION ALL (SELECT id::text FROM job_photo LIMIT 2)
		UNION ALL (SELECT id::text FROM installer_document LIMIT 2)`);
	realIds = ids.map((r) => r.id);
});

test.afterAll(async () => {
	console.log(
		`fuzz: seed ${SEED}; ${counts.targets} targets, ${counts.runs} runs, ${counts.requests} requests ` +
			`(${counts.refused} refused, ${counts.resets} of them closed unread, ${counts.accepted} answered), ` +
			`${counts.comparisons} table-checksum comparisons`
	);
	for (const close of closers) await close();
	await closeQueries();
});

test('the route tree yields targets of every kind', () => {
	// If the parser stopped finding routes, every other test here would pass vacuously.
	const kinds = new Set(TARGETS.map((t) => t.kind));
	expect([...kinds].sort()).toEqual(['action', 'endpoint', 'page']);
	expect(TARGETS.length).toBeGreaterThan(50);
	expect(TARGETS.map(targetName)).toContain('POST /owner/jobs/[id=uuid]/vehicle ?/default');
});

for (const target of TARGETS) {
	const name = targetName(target);
	test(`fuzz ${name}`, async () => {
		test.setTimeout(TIME_PER_TARGET_MS + 90_000);
		counts.targets++;
		const seed = (SEED + hashOf(name)) % 2 ** 31;
		// Table checksums are taken per batch: from the target's start, or from just after a request
		// that was let through and may have written, to the end. Every request in a batch was
		// refused, poisoned (a NUL in every value) or a GET (a load or a data route, which never
		// writes), so no row may differ.
		let baseline: Record<string, string> | undefined = await tableChecksums();
		let batch: string[] = [];
		// The time budget: runs after the deadline pass without sending (at least one run sends).
		const deadline = Date.now() + TIME_PER_TARGET_MS;
		let sent = 0;
		await fc.assert(
			fc.asyncProperty(
				fc.array(requestArb(target), { minLength: 1, maxLength: 2 }),
				async (requests) => {
					if (sent > 0 && Date.now() > deadline) return;
					sent++;
					counts.runs++;
					baseline ??= await tableChecksums();
					for (const r of requests) {
						const res = await send(target, r);
						counts.requests++;
						const wasRefused = await check(target, r, res);
						if (wasRefused) counts.refused++;
						else counts.accepted++;
						if (wasRefused || r.poisoned || target.method === 'GET') {
							batch.push(describe(target, r, res));
						} else {
							baseline = undefined;
							batch = [];
						}
					}
				}
			),
			{
				seed,
				numRuns: RUNS,
				// Shrinking replays requests against the app; the first counterexample is reported as is.
				endOnFailure: true
			}
		);
		if (!baseline || batch.length === 0) return;
		counts.comparisons++;
		const after = await tableChecksums();
		const changed = changedTables(baseline, after);
		expect(
			changed,
			`seed ${SEED}: rows changed although every request was refused or a GET:\n${batch.join('\n')}`
		).toEqual([]);
	});
}
