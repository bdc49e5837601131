/**
 * Who may fetch what, against the running app (issue 11, items 9, 10 and 12): gallery photos of a
 * profile that is not public, hostile PDFs and how documents are served, and role areas reached
 * through other spellings of their paths.
 */
import { cleanPdf, hostilePdfs, htmlWithPdfSignature } from '../support/pdfs';
import { DEMO, expect, test } from './fixtures';
import {
	BROWSER_HEADERS,
	closeQueries,
	newInstallerWithProfile,
	query,
	signedIn
} from './support/requests';

test.afterAll(closeQueries);

// A 1x1 PNG (PNG specification, ISO/IEC 15948: signature, IHDR, IDAT, IEND chunks).
const PNG = Buffer.from(
	'iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mNkYPhfDwAChwGA60e6kgAAAABJRU5ErkJggg==',
	'base64'
);

type Installer = Awaited<ReturnType<typeof newInstallerWithProfile>>;

/** Uploads a file as the installer would, without JavaScript; returns the page's answer. */
async function upload(installer: Installer, kind: string, name: string, buffer: Buffer) {
	const mimeType = name.endsWith('.png') ? 'image/png' : 'application/pdf';
	const res = await installer.request.post('/installer/documents?/upload', {
		multipart: { kind, file: { name, mimeType, buffer } },
		headers: BROWSER_HEADERS,
		maxRedirects: 0
	});
	return { status: res.status(), text: await res.text() };
}

const documentsOf = (installerId: string) =>
	query<{ id: string; kind: string; original_name: string }>(
		`SELECT id, kind, original_name FROM installer_document WHERE installer_id = $1 ORDER BY created_at`,
		[installerId]
	);

test('gallery photos of a profile that is not public are for the installer and admins only', async ({
	browser,
	request
}) => {
	const [installer, owner, admin] = await Promise.all([
		newInstallerWithProfile(browser, 'gallery'),
		signedIn(browser, DEMO.owner),
		signedIn(browser, DEMO.admin)
	]);
	expect((await upload(installer, 'gallery', 'fit.png', PNG)).status).toBe(200);
	const [photo] = await documentsOf(installer.id);
	expect(photo?.kind).toBe('gallery');
	const path = `/media/installer-documents/${photo!.id}`;

	// The application is not approved, so there is no public profile and no public gallery.
	expect((await request.get(`/installers/${installer.id}`)).status()).toBe(404);
	expect((await request.get(path)).status()).toBe(401);
	expect((await request.get(`${path}?thumb`)).status()).toBe(401);
	expect((await owner.request.get(path)).status()).toBe(403);
	// Its installer and admins still see it.
	const own = await installer.request.get(path);
	expect(own.status()).toBe(200);
	expect(own.headers()['content-type']).toBe('image/jpeg');
	expect((await admin.request.get(`${path}?thumb`)).status()).toBe(200);
	await Promise.all([installer.context.close(), owner.close(), admin.close()]);
});

test('PDFs with scripts, actions or attachments, and HTML posing as a PDF, are refused', async ({
	browser
}) => {
	const installer = await newInstallerWithProfile(browser, 'pdf');
	const hostile = { ...(await hostilePdfs()), 'HTML page': htmlWithPdfSignature() };
	for (const [what, bytes] of Object.entries(hostile)) {
		const answer = await upload(installer, 'insurance', 'certificate.pdf', bytes);
		expect({ what, status: answer.status }).toEqual({ what, status: 400 });
		expect(answer.text).toMatch(/contains scripts|could not read that PDF/);
	}
	expect(await documentsOf(installer.id)).toEqual([]);
	await installer.context.close();
});

test('documents are served as attachments named for their type, never sniffed', async ({
	browser
}) => {
	const [installer, admin] = await Promise.all([
		newInstallerWithProfile(browser, 'attachment'),
		signedIn(browser, DEMO.admin)
	]);
	expect((await upload(installer, 'insurance', 'certificate.html', await cleanPdf())).status).toBe(
		200
	);
	expect((await upload(installer, 'photo-id', 'licence.png', PNG)).status).toBe(200);
	const [certificate, photoId] = await documentsOf(installer.id);
	expect([certificate?.kind, photoId?.kind]).toEqual(['insurance', 'photo-id']);

	for (const viewer of [installer.request, admin.request]) {
		const pdf = await viewer.get(`/media/installer-documents/${certificate!.id}`);
		expect(pdf.status()).toBe(200);
		expect(pdf.headers()['content-type']).toBe('application/pdf');
		expect(pdf.headers()['content-disposition']).toBe('attachment; filename="certificate.pdf"');
		expect(pdf.headers()['x-content-type-options']).toBe('nosniff');
		expect(pdf.headers()['cache-control']).toBe('private, no-store');

		const id = await viewer.get(`/media/installer-documents/${photoId!.id}`);
		expect(id.headers()['content-disposition']).toBe('attachment; filename="licence.jpg"');
		expect(id.headers()['x-content-type-options']).toBe('nosniff');
	}
	await Promise.all([installer.context.close(), admin.close()]);
});

test('role areas are guarded however their paths are spelled', async ({ ownerPage: page }) => {
	// Percent-encoded letters, doubled slashes and dot segments reach the same pages. The guard in
	// hooks refuses them before any page code runs: its refusal is the plain fallback error page
	// (src/error.html), and a data request gets a 403 itself rather than a page error inside it.
	for (const path of [
		'/%69nstaller',
		'/%69nstaller/jobs',
		'/%61dmin/team',
		'/%2561dmin/team',
		'/%41dmin/vetting'
	]) {
		const res = await page.request.get(path, { headers: BROWSER_HEADERS, maxRedirects: 0 });
		expect({ path, status: res.status() }).toEqual({ path, status: 403 });
		expect(await res.text()).toContain('Not for this account, or not available');
	}
	const data = await page.request.get('/%61dmin/team/__data.json', { maxRedirects: 0 });
	expect(data.status()).toBe(403);
	// The owner's own area still opens, however spelled.
	expect((await page.request.get('/%6fwner')).status()).toBe(200);
});
