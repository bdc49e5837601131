/**
 * The authorisation matrix: every page (and its `__data.json` data route), form action and
 * endpoint found in src/routes, requested as eight personas, against the expected answers in
 * `access-matrix.table.ts`. A route missing from the table fails, so a route added later is
 * covered the day it is added.
 *
 * The world: a new owner and a new vetted installer with a paid booking whose fit report is filed
 * and on which the owner raised a problem with a photo (so the booking, its receipt, record, fit
 * report, dispute and their photos all exist), the owner's draft job with a photo, and the
 * installer's uploaded document. Another owner, another vetted installer, an unvetted installer
 * (application saved, not vetted), a suspended installer (signed in, then suspended) and the demo
 * admin ask for the same paths: their answers are the object-level checks.
 *
 * Every cell whose expected answer is a refusal is sent first, all of them, between two readings of
 * every table's checksum: refused requests change no row. The cells a persona may use come after
 * (an action is sent an empty form, so it is refused for what was sent, not for who sent it), with
 * sign-out last, as it ends each persona's session.
 */
import type { APIRequestContext, APIResponse } from '@playwright/test';
import { DEMO, expect, jpegPhoto, test } from './fixtures';
import {
	EXPECTED,
	OBJECT_CASES,
	PERSONAS,
	REFUSALS,
	type Answer,
	type Cell,
	type Persona
} from './access-matrix.table';
import { changedTables, tableChecksums } from './support/checksums';
import { LEAKS } from './support/leaks';
import { fileFitReport, paidBooking, raiseProblem } from './support/fit-booking';
import {
	BASE_URL,
	BROWSER_HEADERS,
	closeQueries,
	newAccount,
	newInstallerWithProfile,
	postForm,
	query,
	signedIn
} from './support/requests';
import { fillPattern, routeTargets, targetName, type RouteTarget } from './support/routes';

test.describe.configure({ mode: 'serial' });

/** One request of the matrix: a route target, asked as a page or as its data route. */
interface Probe {
	target: RouteTarget;
	/** The table's key. */
	name: string;
	/** The data route of a page. */
	data: boolean;
}

interface World {
	ownerJobBooked: string;
	ownerDraftJob: string;
	bookingId: string;
	installerId: string;
	unvettedId: string;
	throwawayId: string;
	disputeId: string;
	jobPhotoId: string;
	disputePhotoId: string;
	fitReportPhotoId: string;
	documentId: string;
}

const contexts = {} as Record<Persona, APIRequestContext>;
const closers: Array<() => Promise<void>> = [];
let world: World;
/** Every cell's answer, by `persona target` (and ` data` for a data route). */
const answers = new Map<string, { answer: Answer; status: number; where: string }>();

test.afterAll(async () => {
	for (const close of closers) await close();
	await closeQueries();
});

const asList = (cell: Cell): readonly Answer[] => (typeof cell === 'string' ? [cell] : cell);
const isRefusal = (cell: Cell) => asList(cell).every((a) => REFUSALS.includes(a));

/** The path with the world's objects in it, chosen by what the route is about. */
function pathOf(t: RouteTarget): string {
	const p = t.pattern;
	const id = (() => {
		if (p.startsWith('/owner/jobs/[id=uuid]/quotes')) return world.ownerJobBooked;
		if (p.startsWith('/owner/jobs/[id=uuid]')) return world.ownerDraftJob;
		if (p.startsWith('/installer/jobs/[id=uuid]')) return world.ownerJobBooked;
		if (p.startsWith('/installers/')) return world.installerId;
		if (p.startsWith('/admin/users/')) return world.throwawayId;
		if (p.startsWith('/admin/vetting/')) return world.unvettedId;
		if (p.startsWith('/admin/disputes/')) return world.disputeId;
		if (p.startsWith('/media/job-photos/')) return world.jobPhotoId;
		if (p.startsWith('/media/dispute-photos/')) return world.disputePhotoId;
		if (p.startsWith('/media/fit-report-photos/')) return world.fitReportPhotoId;
		if (p.startsWith('/media/installer-documents/')) return world.documentId;
		// Fit notes and their photos: none is made here (see the table).
		if (p.startsWith('/installer/fit-notes/[id=uuid]') || p.startsWith('/media/fit-note-photos/')) {
			return '00000000-0000-4000-8000-000000000000';
		}
		// Bookings, payout statements, the fit note a booking would publish.
		return world.bookingId;
	})();
	return fillPattern(p, { id, installerId: world.installerId, variant: 'thumb' });
}

function urlOf(probe: Probe): string {
	const path = pathOf(probe.target);
	if (probe.data) return `${path === '/' ? '' : path}/__data.json`;
	if (probe.target.kind !== 'action' || probe.target.action === 'default') return path;
	return `${path}?/${probe.target.action}`;
}

async function send(persona: Persona, probe: Probe): Promise<APIResponse> {
	const request = contexts[persona];
	const url = urlOf(probe);
	const t = probe.target;
	if (t.method === 'GET') {
		return request.get(url, {
			maxRedirects: 0,
			headers: { accept: t.kind === 'endpoint' ? '*/*' : 'text/html' }
		});
	}
	if (t.kind === 'endpoint') {
		return request.fetch(url, {
			method: t.method,
			data: '{}',
			headers: { ...BROWSER_HEADERS, 'content-type': 'application/json' },
			maxRedirects: 0
		});
	}
	// An empty form (one field no route reads).
	return request.fetch(url, {
		method: 'POST',
		form: { matrix: 'empty' },
		headers: BROWSER_HEADERS,
		maxRedirects: 0
	});
}

const toSignIn = (location: string) => new URL(location, BASE_URL).pathname === '/sign-in';

/** What a response means, in the table's words. */
async function answerOf(res: APIResponse, data: boolean): Promise<Answer> {
	let status = res.status();
	let location = res.headers()['location'] ?? '';
	if (data && status === 200) {
		// A data route answers with 200 and says in its JSON what the loads did: a redirect, or one
		// node per layout and page, where a load that failed is an error node with its status.
		const body = (await res.json()) as {
			type?: string;
			location?: string;
			status?: number;
			nodes?: Array<{ type?: string; status?: number } | null>;
		};
		const failed = body.nodes?.find((node) => node?.type === 'error');
		if (body.type === 'redirect') {
			status = 303;
			location = body.location ?? '';
		} else if (body.type === 'error') {
			status = body.status ?? 500;
		} else if (failed) {
			status = failed.status ?? 500;
		}
	}
	if (status >= 300 && status < 400) return toSignIn(location) ? 'signin' : 'away';
	if (status >= 200 && status < 300) return 'ok';
	if (status === 401) return 'unauthorised';
	if (status === 403) return 'forbidden';
	if (status === 404) return 'missing';
	if ([400, 409, 410, 422].includes(status)) return 'refused';
	throw new Error(`unexpected status ${status}`);
}

async function ask(persona: Persona, probe: Probe) {
	const res = await send(persona, probe);
	const where = `${persona} ${probe.target.method} ${urlOf(probe)} → ${res.status()}`;
	expect(res.status(), `${where}: no 5xx`).toBeLessThan(500);
	const text = (await res.body()).toString('utf8');
	for (const pattern of LEAKS) {
		expect(pattern.exec(text)?.[0], `${where}: the body shows ${pattern}`).toBeUndefined();
	}
	const answer = await answerOf(res, probe.data);
	answers.set(`${persona} ${probe.name}${probe.data ? ' data' : ''}`, {
		answer,
		status: res.status(),
		where
	});
	return { answer, where };
}

function probes(): Probe[] {
	return routeTargets().flatMap((target) => {
		const name = targetName(target);
		const page = { target, name, data: false };
		return target.kind === 'page' ? [page, { ...page, data: true }] : [page];
	});
}

test.beforeAll(async ({ browser }) => {
	test.setTimeout(240_000);
	// The owner and the vetted installer, with a paid booking between them.
	const { bookingId, ownerPage, phone } = await paidBooking(browser, 'matrix');
	const [b] = await query<{ owner_id: string; installer_id: string; job_id: string }>(
		`SELECT owner_id, installer_id, job_id FROM booking WHERE id = $1`,
		[bookingId]
	);
	// The booked job was written straight into the database without its place; a posted job has
	// one (Walkerville, South Australia), and an installer's job page needs it.
	await query(
		`UPDATE job SET latitude = -34.8936, longitude = 138.6167, location_mode = 'mobile' WHERE id = $1`,
		[b!.job_id]
	);
	// The fit report, filed through the page, then a problem raised with a photo.
	await fileFitReport(phone, bookingId, await jpegPhoto(), { rear: true });
	await ownerPage.goto(`/owner/bookings/${bookingId}/problem`);
	await raiseProblem(
		ownerPage,
		'A trim clip by the rear cable came away after the fit.',
		await jpegPhoto()
	);
	contexts.owner = ownerPage.context().request;
	contexts.installer = phone.context().request;
	closers.push(
		() => ownerPage.context().close(),
		() => phone.context().close()
	);

	// The owner's draft job with a photo; the installer's document.
	const created = await postForm(contexts.owner, '/owner/jobs/new', {});
	const draftJob = /\/owner\/jobs\/([0-9a-f-]{36})/.exec(created.headers()['location'] ?? '')?.[1];
	expect(draftJob, 'a draft job').toBeTruthy();
	const upload = async (request: APIRequestContext, path: string, kind: string, file: string) => {
		const res = await request.post(path, {
			multipart: {
				kind,
				[file]: { name: `${kind}.jpg`, mimeType: 'image/jpeg', buffer: await jpegPhoto() }
			},
			headers: BROWSER_HEADERS,
			maxRedirects: 0
		});
		expect(res.status(), `${path} uploads`).toBeLessThan(400);
	};
	await upload(contexts.owner, `/owner/jobs/${draftJob}/photos?/upload`, 'fuse-box', 'photo');
	// Not a gallery photo, which a public profile shows to everyone: a private one.
	await upload(contexts.installer, '/installer/documents?/upload', 'photo-id', 'file');

	// The other personas.
	const otherOwner = await newAccount(browser, 'owner', 'matrix-other-owner');
	const otherInstaller = await newInstallerWithProfile(browser, 'matrix-other-installer');
	const unvetted = await newInstallerWithProfile(browser, 'matrix-unvetted');
	const suspended = await newInstallerWithProfile(browser, 'matrix-suspended');
	const throwaway = await newAccount(browser, 'owner', 'matrix-throwaway');
	await throwaway.context.close();
	await query(
		`UPDATE installer_profile SET vetting_status = 'approved' WHERE user_id = ANY($1::text[])`,
		[[otherInstaller.id, suspended.id]]
	);
	await query(`UPDATE "user" SET suspended_at = now() WHERE id = $1`, [suspended.id]);
	const admin = await signedIn(browser, DEMO.admin);
	const anonymous = await browser.newContext({ baseURL: BASE_URL });
	Object.assign(contexts, {
		anonymous: anonymous.request,
		otherOwner: otherOwner.request,
		otherInstaller: otherInstaller.request,
		unvettedInstaller: unvetted.request,
		suspendedInstaller: suspended.request,
		admin: admin.request
	});
	for (const c of [anonymous, admin, otherOwner.context, otherInstaller.context]) {
		closers.push(() => c.close());
	}
	closers.push(
		() => unvetted.context.close(),
		() => suspended.context.close()
	);

	const one = async (sql: string, params: unknown[]) => {
		const [row] = await query<{ id: string }>(sql, params);
		expect(row, sql).toBeTruthy();
		return row!.id;
	};
	const disputeId = await one(`SELECT id FROM dispute WHERE booking_id = $1`, [bookingId]);
	world = {
		ownerJobBooked: b!.job_id,
		ownerDraftJob: draftJob!,
		bookingId,
		installerId: b!.installer_id,
		unvettedId: unvetted.id,
		throwawayId: throwaway.id,
		disputeId,
		jobPhotoId: await one(`SELECT id FROM job_photo WHERE job_id = $1`, [draftJob]),
		disputePhotoId: await one(`SELECT id FROM dispute_photo WHERE dispute_id = $1`, [disputeId]),
		fitReportPhotoId: await one(
			`SELECT p.id FROM fit_report_photo p JOIN fit_report r ON r.id = p.fit_report_id
			 WHERE r.booking_id = $1`,
			[bookingId]
		),
		documentId: await one(`SELECT id FROM installer_document WHERE installer_id = $1`, [
			b!.installer_id
		])
	};
	// The suspended installer's next request finds its session ended (and removes it): done here,
	// so the refusals' checksums below start after it.
	const first = await contexts.suspendedInstaller.get('/installer', { maxRedirects: 0 });
	expect(first.status()).toBe(303);
});

test('every route is in the table of expected answers, and the table names no route that is gone', () => {
	const names = routeTargets().map(targetName);
	const missing = names.filter((n) => !(n in EXPECTED));
	expect(missing, 'routes with no expected answers in access-matrix.table.ts').toEqual([]);
	const gone = Object.keys(EXPECTED).filter((n) => !names.includes(n));
	expect(gone, 'table rows for routes that no longer exist').toEqual([]);
	expect(names.length).toBeGreaterThan(100);
});

test('every refusal in the matrix is given, and the refused requests change no row', async () => {
	test.setTimeout(300_000);
	const before = await tableChecksums();
	const wrong: string[] = [];
	let sent = 0;
	for (const probe of probes()) {
		const row = EXPECTED[probe.name];
		if (!row) continue; // reported by the test above
		for (const persona of PERSONAS) {
			if (!isRefusal(row[persona])) continue;
			const { answer, where } = await ask(persona, probe);
			sent++;
			if (!asList(row[persona]).includes(answer)) {
				wrong.push(`${where}: ${answer}, expected ${asList(row[persona]).join(' or ')}`);
			}
		}
	}
	expect(wrong, `${wrong.length} of ${sent} refused cells answered otherwise`).toEqual([]);
	expect(changedTables(before, await tableChecksums()), 'tables changed by refusals').toEqual([]);
	console.log(`access matrix: ${sent} refused cells, every one refused; no table changed`);
});

test('every persona gets in where the table lets them', async () => {
	test.setTimeout(300_000);
	const wrong: string[] = [];
	let sent = 0;
	const all = probes();
	// Sign-out ends the persona's session: last.
	const ordered = [
		...all.filter((p) => p.name !== 'POST /sign-out ?/default'),
		...all.filter((p) => p.name === 'POST /sign-out ?/default')
	];
	for (const probe of ordered) {
		const row = EXPECTED[probe.name];
		if (!row) continue;
		for (const persona of PERSONAS) {
			if (isRefusal(row[persona])) continue;
			const { answer, where } = await ask(persona, probe);
			if (process.env.MATRIX_TRACE) console.log(`GRANTED ${where} ${answer}`);
			sent++;
			if (!asList(row[persona]).includes(answer)) {
				wrong.push(`${where}: ${answer}, expected ${asList(row[persona]).join(' or ')}`);
			}
		}
	}
	expect(wrong, `${wrong.length} of ${sent} granted cells answered otherwise`).toEqual([]);
	const total = probes().length * PERSONAS.length;
	expect(answers.size).toBe(total);
	console.log(
		`access matrix: ${routeTargets().length} routes, ${probes().length} requests (pages also ` +
			`as data routes) × ${PERSONAS.length} personas = ${total} cells; ${sent} granted`
	);
});

test('the object-level cases: another owner or installer is refused what is not theirs', () => {
	for (const c of OBJECT_CASES) {
		const row = EXPECTED[c.target];
		expect(row, c.target).toBeTruthy();
		const refusal = c.answer ?? 'missing';
		expect(row![c.persona], `${c.what}: the table`).toBe(refusal);
		const got = answers.get(`${c.persona} ${c.target}`);
		expect(got?.answer, `${c.what}: ${got?.where}`).toBe(refusal);
		// And the object's own party gets in (the same path, the owner's or installer's).
		const party = c.persona === 'otherOwner' ? 'owner' : 'installer';
		const own = answers.get(`${party} ${c.target}`);
		expect(REFUSALS, `${c.what}: its party, ${own?.where}`).not.toContain(own?.answer);
	}
});
