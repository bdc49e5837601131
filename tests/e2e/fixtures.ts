import { test as base, expect, type Page } from '@playwright/test';
import sharp from 'sharp';

export const DEMO_PASSWORD = 'tapline-demo-2026';
export const DEMO = {
	owner: 'demo.owner@tapline.test',
	installer: 'demo.installer@tapline.test',
	admin: 'demo.admin@tapline.test'
} as const;

const MAIL_API = process.env.FAKE_MAIL_API ?? 'http://127.0.0.1:3580';

interface Mail {
	subject: string;
	text: string;
	html: string;
	to: string[];
}

/** Reads the SMTP fake's inbox for one address, waiting for a message whose subject matches. */
export async function waitForMail(to: string, subject: RegExp): Promise<Mail> {
	let found: Mail | undefined;
	await expect
		.poll(
			async () => {
				const res = await fetch(`${MAIL_API}/api/messages?to=${encodeURIComponent(to)}`);
				const list = (await res.json()) as Mail[];
				found = list.find((m) => subject.test(m.subject));
				return Boolean(found);
			},
			{ timeout: 30_000, message: `e-mail to ${to} matching ${subject}` }
		)
		.toBe(true);
	return found!;
}

/** The first link in a message's plain-text part that starts with the app's address. */
export function linkIn(mail: Mail, pathStart: string): string {
	const match = mail.text.match(
		new RegExp(`https?://\\S+${pathStart.replace(/[?/]/g, '\\$&')}\\S*`)
	);
	if (!match) throw new Error(`No ${pathStart} link in: ${mail.text}`);
	return match[0];
}

/** Opens the confirmation link e-mailed to `email` and confirms it: the account is then signed in. */
export async function confirmFromInbox(page: Page, email: string) {
	const mail = await waitForMail(email, /Confirm your e-mail/);
	await page.goto(linkIn(mail, '/verify-email?token='));
	await page.getByRole('button', { name: 'Confirm my address' }).click();
	await expect(page.getByText('Your e-mail address is confirmed')).toBeVisible();
}

export async function signIn(page: Page, email: string, password = DEMO_PASSWORD) {
	await page.goto('/sign-in');
	await page.getByLabel('E-mail').fill(email);
	await page.getByLabel('Password').fill(password);
	await page.getByRole('button', { name: 'Sign in' }).click();
	await expect(page.getByRole('button', { name: 'Sign out' })).toBeVisible();
}

/** A fresh address per test run, so reruns against the same database never collide. */
export const uniqueEmail = (label: string) =>
	`${label}.${Date.now().toString(36)}${Math.floor(Math.random() * 1e4)}@example.test`;

/** A plain JPEG photo of the given size, made with sharp. */
export async function jpegPhoto(width = 640, height = 480): Promise<Buffer> {
	return sharp({ create: { width, height, channels: 3, background: '#556677' } })
		.jpeg()
		.toBuffer();
}

/** Uploads a photo into the photo step's box with this test id and waits for its picture. */
export async function uploadJobPhoto(page: Page, testId: string, buffer: Buffer) {
	const box = page.getByTestId(testId);
	await box.locator('input[type=file]').setInputFiles({
		name: 'photo.jpg',
		mimeType: 'image/jpeg',
		buffer
	});
	await box.getByRole('button', { name: 'Upload photo' }).click();
	await expect(box.getByRole('img')).toBeVisible();
	return box;
}

/** Chromium's console wording when the Content-Security-Policy blocks something. */
export const CSP_VIOLATION = /violates the following Content Security Policy/i;

export const test = base.extend<{
	ownerPage: Page;
	installerPage: Page;
	adminPage: Page;
	cspViolations: string[];
}>({
	// Every test, in every spec: nothing the pages do may be blocked by the Content-Security-Policy
	// (scripts, styles, map tiles, fonts). Pages of the test's own context are watched.
	cspViolations: [
		async ({ context }, use) => {
			const violations: string[] = [];
			context.on('console', (message) => {
				if (CSP_VIOLATION.test(message.text())) violations.push(message.text());
			});
			await use(violations);
			expect(violations, 'Content-Security-Policy violations').toEqual([]);
		},
		{ auto: true }
	],
	ownerPage: async ({ page }, use) => {
		await signIn(page, DEMO.owner);
		await use(page);
	},
	installerPage: async ({ page }, use) => {
		await signIn(page, DEMO.installer);
		await use(page);
	},
	adminPage: async ({ page }, use) => {
		await signIn(page, DEMO.admin);
		await use(page);
	}
});

export { expect };
