/**
 * Hostile input against the running app (issue 11, items 5, 6 and 16): where a sign-in may send
 * a person, NUL characters in fields and addresses, unreadable form bodies, days that do not
 * exist and insurance dates long past. Each must be a clear 4xx that writes nothing, never a 500.
 */
import { DEMO, DEMO_PASSWORD, expect, test, uniqueEmail } from './fixtures';
import {
	BASE_URL,
	closeQueries,
	newAccount,
	newInstallerWithProfile,
	postBrokenMultipart,
	postForm,
	query
} from './support/requests';

test.afterAll(closeQueries);

const NUL = '\u0000';
const onThisSite = (location: string | undefined) =>
	new URL(location ?? 'missing:', BASE_URL).origin === new URL(BASE_URL).origin;

// What browsers make of a Location header (WHATWG URL): tabs and newlines are dropped and
// backslashes are slashes, so each of these, taken as it is, leads to another site or to a 500.
const HOSTILE_TARGETS = [
	'/\t/other.example',
	'/\n/other.example',
	'/\r\n/other.example',
	'/\\other.example',
	'//other.example',
	'https://other.example/',
	// Dot segments that collapse to a path starting `//` (issue 27).
	'/..//other.example/x',
	'/./..//other.example/x',
	'/a/../..//other.example/x',
	'/%2e%2e//other.example/x',
	'/%2E%2E//other.example/x',
	'/.%2e//other.example/x',
	'/..//\\other.example/x'
];

test('a signed-in owner sent to sign-in with a dot-segment target stays on this site in Chromium', async ({
	ownerPage
}) => {
	for (const target of HOSTILE_TARGETS) {
		// Both spellings of the query: the target encoded once, and as a person would paste it.
		for (const query of [encodeURIComponent(target), target]) {
			await ownerPage.goto(`/sign-in?redirectTo=${query}`).catch(() => null);
			expect({ target, query, onThisSite: onThisSite(ownerPage.url()) }).toEqual({
				target,
				query,
				onThisSite: true
			});
		}
	}
});

test('signing in goes only to paths on this site, however the target is spelled', async ({
	request
}) => {
	for (const redirectTo of HOSTILE_TARGETS) {
		const res = await postForm(request, '/sign-in', {
			email: DEMO.owner,
			password: DEMO_PASSWORD,
			redirectTo
		});
		const location = res.headers()['location'];
		expect({ redirectTo, status: res.status(), onThisSite: onThisSite(location) }).toEqual({
			redirectTo,
			status: 303,
			onThisSite: true
		});
	}
	// Already signed in (the last post left a session): the page's own redirect is checked too.
	for (const redirectTo of HOSTILE_TARGETS) {
		const res = await request.get(`/sign-in?redirectTo=${encodeURIComponent(redirectTo)}`, {
			maxRedirects: 0
		});
		expect({ redirectTo, status: res.status() }).toEqual({ redirectTo, status: 303 });
		expect(onThisSite(res.headers()['location'])).toBe(true);
	}
	// A real path still works.
	const res = await postForm(request, '/sign-in', {
		email: DEMO.owner,
		password: DEMO_PASSWORD,
		redirectTo: '/owner/jobs/new'
	});
	expect(res.headers()['location']).toBe('/owner/jobs/new');
});

test('a NUL in a signed-out form field is a 400, and no account is made', async ({ request }) => {
	const email = uniqueEmail('nul');
	const cases: Array<[string, Record<string, string>]> = [
		[
			'/sign-up',
			{ role: 'owner', displayName: `Nul${NUL}Name`, email, password: 'long enough passphrase' }
		],
		['/sign-up', { role: 'owner', displayName: 'Nul Name', email, password: `long${NUL}enough` }],
		['/sign-in', { email: DEMO.owner, password: DEMO_PASSWORD, redirectTo: `/owner${NUL}` }],
		[
			'/reset-password',
			{
				token: `abcdefghijklmnop${NUL}qrstuvwxyz`,
				password: 'long enough passphrase',
				confirmPassword: 'long enough passphrase'
			}
		],
		['/verify-email?/confirm', { token: `abcdefghijklmnop${NUL}qrst` }]
	];
	for (const [path, fields] of cases) {
		const res = await postForm(request, path, fields);
		expect({ path, fields: Object.keys(fields), status: res.status() }).toMatchObject({
			path,
			status: 400
		});
	}
	expect(await query(`SELECT id FROM "user" WHERE email = $1`, [email])).toEqual([]);
});

test('a NUL in a signed-in form field is a 400 and leaves the data as it was', async ({
	browser
}) => {
	const owner = await newAccount(browser, 'owner', 'nul-owner');
	const created = await postForm(owner.request, '/owner/jobs/new', {});
	const jobId = created.headers()['location']?.match(/\/owner\/jobs\/([^/]+)\/vehicle/)?.[1];
	expect(jobId).toBeTruthy();
	const draft = async () =>
		(await query<{ draft: unknown }>(`SELECT draft FROM job WHERE id = $1`, [jobId]))[0]?.draft;
	const before = await draft();

	const vehicle = {
		make: 'Demo',
		model: 'Tourer',
		year: '2019',
		bodyStyle: 'wagon',
		fuseFamily: 'mini',
		batteryType: 'agm',
		curtainAirbags: 'yes'
	};
	const place = { locationMode: 'mobile', place: 'Norwood', addressLine: '12 Example Street' };
	const cases: Array<[string, Record<string, string>]> = [
		[`/owner/jobs/${jobId}/vehicle`, { ...vehicle, make: `De${NUL}mo` }],
		[`/owner/jobs/${jobId}/vehicle`, { ...vehicle, model: `Tour${NUL}er` }],
		[`/owner/jobs/${jobId}/place`, { ...place, place: `Nor${NUL}wood` }],
		[`/owner/jobs/${jobId}/place`, { ...place, addressLine: `12 Example${NUL} Street` }]
	];
	for (const [path, fields] of cases) {
		const res = await postForm(owner.request, path, fields);
		expect({ path, status: res.status() }).toEqual({ path, status: 400 });
	}
	expect(await draft()).toEqual(before);

	const installer = await newAccount(browser, 'installer', 'nul-installer');
	const application = await postForm(installer.request, '/installer/application', {
		businessName: `Nul${NUL} Fitting`,
		contactName: 'Testing Person',
		phone: '0412 345 678',
		abn: '51 824 753 556',
		yearsInTrade: '5',
		skills: ['parking-mode'],
		workMode: 'mobile',
		baseSuburb: 'Norwood'
	});
	expect(application.status()).toBe(400);
	expect(
		await query(`SELECT user_id FROM installer_profile WHERE user_id = $1`, [installer.id])
	).toEqual([]);
	await Promise.all([owner.context.close(), installer.context.close()]);
});

test('a NUL in the address or a route parameter is a 400, not a 500', async ({
	request,
	ownerPage
}) => {
	const anonymous = [
		'/installers/%00',
		'/installers/abc%00def',
		'/media/installer-documents/%00',
		'/sign-in?redirectTo=%2Fowner%00'
	];
	const signedIn = [
		'/owner/jobs/%00',
		'/owner/jobs/%00/vehicle',
		'/owner/bookings/%00',
		'/media/job-photos/%00/full',
		'/api/places?q=Nor%00wood'
	];
	for (const path of anonymous) {
		const res = await request.get(path, { maxRedirects: 0 });
		expect({ path, status: res.status() }).toEqual({ path, status: 400 });
	}
	for (const path of signedIn) {
		const res = await ownerPage.request.get(path, { maxRedirects: 0 });
		expect({ path, status: res.status() }).toEqual({ path, status: 400 });
	}
});

// Found by the fuzz suite (fuzz.spec.ts): a path with a broken %-encoding in a role's area made a
// hook redirect or refuse it, SvelteKit left that rejection unhandled and the app process stopped.
test('a path with a broken %-encoding is a 400 wherever it points, and the app keeps answering', async ({
	request,
	installerPage
}) => {
	const paths = [
		'/owner/%FF',
		'/owner/jobs/%C3%28/vehicle',
		'/admin/users/aaaa%FF',
		'/installer/%E2%80',
		'/%FF%00'
	];
	for (const path of paths) {
		for (const [who, context] of [
			['anonymous', request],
			['installer', installerPage.request]
		] as const) {
			const get = await context.get(path, { maxRedirects: 0 });
			expect({ who, path, status: get.status() }).toEqual({ who, path, status: 400 });
			const post = await context.post(`${path}?/reinstate`, {
				headers: { origin: BASE_URL },
				maxRedirects: 0
			});
			expect({ who, path, status: post.status() }).toEqual({ who, path, status: 400 });
		}
	}
	// Still up: a page answers after all of them.
	expect((await request.get('/sign-in')).status()).toBe(200);
});

/** The demo installer's working hours, as rows. */
const demoInstallerHours = () =>
	query(
		`SELECT h.* FROM installer_hours h JOIN "user" u ON u.id = h.installer_id
		 WHERE u.email = $1 ORDER BY h.weekday`,
		[DEMO.installer]
	);

// Found by the fuzz suite: a file posted where a time belongs was a 500 (the refused form, file
// and all, could not be sent back to the page).
test('a file where working hours belong is a 400, and the hours stay as they were', async ({
	installerPage
}) => {
	const before = await demoInstallerHours();
	const res = await installerPage.request.post('/installer/hours?/saveHours', {
		headers: { origin: BASE_URL, accept: 'text/html' },
		multipart: {
			days: '1',
			start: { name: 'start.txt', mimeType: 'text/plain', buffer: Buffer.from('08:00') },
			end: '17:00'
		},
		maxRedirects: 0
	});
	expect(res.status()).toBe(400);
	expect(await demoInstallerHours()).toEqual(before);
});

// Found by the fuzz suite (seed 1162325913 on quotes, after the hours above): every action reads
// its form through readForm, which takes such files out of a refused form.
test('a file where text belongs is a 400 on any form, not only working hours', async ({
	installerPage
}) => {
	const file = { name: 'x.txt', mimeType: 'text/plain', buffer: Buffer.from('12') };
	// A job on the demo installer's board.
	const [job] = await query<{ id: string }>(
		`SELECT id FROM job WHERE status = 'collecting_quotes' ORDER BY created_at LIMIT 1`
	);
	expect(job).toBeTruthy();
	const posts: [string, Record<string, string | typeof file>][] = [
		[`/installer/jobs/${job!.id}?/quote`, { labourDollars: file, partDollars: file }],
		['/installer/hours?/block', { day: file, note: file }],
		['/installer/service-area', { latitude: file, serviceRadiusKm: file }]
	];
	for (const [path, multipart] of posts) {
		const res = await installerPage.request.post(path, {
			headers: { origin: BASE_URL, accept: 'text/html' },
			multipart,
			maxRedirects: 0
		});
		expect({ path, status: res.status() }).toEqual({ path, status: 400 });
	}
});

// Found by the fuzz suite (seed 753609822): a form body declared as UTF-16 was read as an empty
// form, which passed as "no working days" and wiped the installer's hours with a 200.
test('a working-hours post that cannot be read, or lacks the times, is refused and changes nothing', async ({
	installerPage
}) => {
	const before = await demoInstallerHours();
	expect(before.length).toBeGreaterThan(0);
	const post = (contentType: string, body: string) =>
		installerPage.request.post('/installer/hours?/saveHours', {
			headers: { origin: BASE_URL, accept: 'text/html', 'content-type': contentType },
			data: Buffer.from(body),
			maxRedirects: 0
		});
	const cases: [string, string, number][] = [
		['application/x-www-form-urlencoded; charset=utf-16', 'days=1&start=\u000008:00', 415],
		['application/x-www-form-urlencoded; charset=UTF-16LE', '', 415],
		['multipart/form-data; boundary=x; charset=iso-8859-1', '--x--\r\n', 415],
		['application/x-www-form-urlencoded', '', 400],
		['application/x-www-form-urlencoded', 'days=1', 400],
		['text/plain', 'days=1', 400]
	];
	for (const [type, body, status] of cases) {
		const res = await post(type, body);
		expect({ type, body, status: res.status() }).toEqual({ type, body, status });
		expect(await res.text()).not.toMatch(/at .*\.js:\d+|SELECT|INSERT/);
	}
	expect(await demoInstallerHours()).toEqual(before);
});

// Found by the authorisation matrix: SvelteKit reserves the name of the default action, and a post
// to `?/default` threw (a 500).
test('a post to the reserved action name is a 400', async ({ request }) => {
	for (const path of ['/sign-in?/default', '/forgot-password?/default']) {
		const res = await request.post(path, {
			form: { email: 'nobody@example.test' },
			headers: { origin: BASE_URL, accept: 'text/html' },
			maxRedirects: 0
		});
		expect({ path, status: res.status() }).toEqual({ path, status: 400 });
	}
});

test('actions that read the form themselves answer an unreadable body with 400', async ({
	request,
	browser
}) => {
	expect((await postBrokenMultipart(request, '/verify-email?/confirm')).status()).toBe(400);

	const owner = await newAccount(browser, 'owner', 'broken-body');
	const created = await postForm(owner.request, '/owner/jobs/new', {});
	const jobPath = created.headers()['location']?.replace(/\/vehicle$/, '');
	expect(jobPath).toMatch(/^\/owner\/jobs\//);
	for (const action of ['upload', 'remove']) {
		const res = await postBrokenMultipart(owner.request, `${jobPath}/photos?/${action}`);
		expect({ action, status: res.status() }).toEqual({ action, status: 400 });
	}

	const installer = await newInstallerWithProfile(browser, 'broken-body');
	for (const path of ['/installer/documents?/upload', '/installer/hours?/unblock']) {
		const res = await postBrokenMultipart(installer.request, path);
		expect({ path, status: res.status() }).toEqual({ path, status: 400 });
	}
	expect(
		await query(`SELECT id FROM installer_document WHERE installer_id = $1`, [installer.id])
	).toEqual([]);
	await Promise.all([owner.context.close(), installer.context.close()]);
});

test('days that do not exist are refused where they are typed', async ({ browser }) => {
	// The next 30 February (no year has one), within the 90 days an owner may look ahead.
	const year = new Date().getUTCFullYear() + 1;
	const owner = await newAccount(browser, 'owner', 'bad-date');
	const created = await postForm(owner.request, '/owner/jobs/new', {});
	const jobPath = created.headers()['location']?.replace(/\/vehicle$/, '');
	const place = await postForm(owner.request, `${jobPath}/place`, {
		locationMode: 'workshop',
		place: 'Norwood',
		date1: `${year}-02-30`,
		window1: 'morning'
	});
	expect(place.status()).toBe(400);
	expect(await place.text()).toContain('Choose a date that exists on the calendar');

	const installer = await newInstallerWithProfile(browser, 'bad-date');
	for (const day of [`${year}-02-30`, `${year}-04-31`, `${year}-13-01`]) {
		const res = await postForm(installer.request, '/installer/hours?/unblock', { day });
		expect({ day, status: res.status() }).toEqual({ day, status: 400 });
	}
	await Promise.all([owner.context.close(), installer.context.close()]);
});

test('an insurance expiry date long past is refused with a reason, and not saved', async ({
	browser
}) => {
	const installer = await newInstallerWithProfile(browser, 'old-cover');
	const insurance = {
		insurer: 'Gumleaf Mutual',
		policyNumber: 'PL-778899',
		coverDollars: '20000000'
	};
	for (const expiresOn of ['1999-06-30', '2001-01-01']) {
		const res = await postForm(installer.request, '/installer/documents?/saveInsurance', {
			...insurance,
			expiresOn
		});
		expect(res.status()).toBe(400);
		expect(await res.text()).toContain('more than a year ago');
	}
	const [row] = await query<{ insurer: string | null }>(
		`SELECT insurer FROM installer_profile WHERE user_id = $1`,
		[installer.id]
	);
	expect(row?.insurer ?? null).toBeNull();
	await installer.context.close();
});
