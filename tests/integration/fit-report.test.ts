// Filing the fit report of a paid booking and the install record built from it. Rules: the
// lifecycle issue (Tapline's own): only the booking's installer, only paid and 'to fit', once.
import { and, eq } from 'drizzle-orm';
import { PDFDocument, PDFRawStream, decodePDFRawStream } from 'pdf-lib';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startS3Fake } from '../../local-fakes/s3';
import { db } from '$lib/server/db';
import { booking, emailOutbox, fitReport, fitReportPhoto, user } from '$lib/server/db/schema';
import { getObject } from '$lib/server/files/storage';
import { fitReportSchemaFor } from '$lib/forms/fit-report';
import {
	fileFitReport,
	findViewableFitReportPhoto,
	getInstallRecord,
	getReportableBooking
} from '$lib/server/work/fit-reports';
import { installRecordPdf } from '$lib/server/work/install-record-pdf';
import { makeUser } from './matching-helpers';
import {
	bookAndOpenCheckout,
	paidBookingIn,
	startPaymentsWorld,
	type PaymentsWorld
} from './payments-helpers';

let world: PaymentsWorld;
let closeS3: () => Promise<void>;
beforeAll(async () => {
	world = await startPaymentsWorld();
	const s3 = await startS3Fake({ host: '127.0.0.1', port: 0 });
	closeS3 = s3.close;
	process.env.S3_ENDPOINT = s3.url;
	process.env.S3_BUCKET = 'fit-report-test';
});
afterAll(async () => {
	await world.close();
	await closeS3();
});

const HOUR = 3_600_000;

const REPORT = {
	switchedTap: 'done',
	switchedPosition: 'F12 cabin box',
	switchedOriginalAmps: '10',
	switchedAddedAmps: '5',
	permanentTap: 'na',
	permanentTapReason: 'Switched supply only for this kit',
	fuseFamily: 'mini',
	tapOrientation: 'done',
	ground: 'done',
	groundPoint: 'Kick-panel stud, passenger side',
	groundBareMetal: true,
	cutOff: 'na',
	cutOffReason: 'No parking mode on this fit',
	parkingMode: 'na',
	parkingModeReason: 'No parking mode on this fit',
	cableHidden: 'done',
	airbagRouting: 'done',
	cameraPlacement: 'done',
	rearDemister: 'done',
	minutesTaken: 80,
	notes: 'Camera behind the mirror housing.'
};

async function formFor(bookingId: string, installerId: string) {
	const found = await getReportableBooking(bookingId, installerId);
	return fitReportSchemaFor(found!.rearCamera).parse(REPORT);
}

async function photo(colour = '#557799') {
	const bytes = await sharp({
		create: { width: 800, height: 600, channels: 3, background: colour }
	})
		.jpeg()
		.toBuffer();
	return new File([new Uint8Array(bytes)], 'fit.jpg', { type: 'image/jpeg' });
}

/** The text a PDF draws, from its pages' decoded content streams (hex strings of Helvetica). */
async function pdfText(bytes: Uint8Array): Promise<string> {
	const doc = await PDFDocument.load(bytes);
	let text = '';
	for (const page of doc.getPages()) {
		const contents = page.node.Contents();
		const streams = contents && 'asArray' in contents ? contents.asArray() : [contents];
		for (const ref of streams) {
			const stream = doc.context.lookup(ref as never);
			if (!(stream instanceof PDFRawStream)) continue;
			const decoded = Buffer.from(decodePDFRawStream(stream).decode()).toString('latin1');
			for (const [, hex] of decoded.matchAll(/<([0-9A-Fa-f]+)>\s*Tj/g)) {
				text += Buffer.from(hex!, 'hex').toString('latin1') + '\n';
			}
		}
	}
	return text;
}

describe('filing the fit report', () => {
	it('writes the report and photos, moves the booking to reported and mails the owner', async () => {
		const made = await paidBookingIn(world);
		const installerId = made.chosen.installerId;
		const at = new Date();
		const filed = await fileFitReport(
			made.bookingId,
			installerId,
			await formFor(made.bookingId, installerId),
			[await photo(), await photo('#aa7755')],
			at
		);
		expect(filed).toMatchObject({ ok: true, visit: 1 });
		const [b] = await db.select().from(booking).where(eq(booking.id, made.bookingId));
		expect(b!.stage).toBe('reported');
		// 72 h: the lifecycle issue's default confirmation window.
		expect(b!.confirmBy!.getTime() - at.getTime()).toBe(72 * HOUR);
		const [owner] = await db.select().from(user).where(eq(user.id, made.ownerId));
		const mails = await db
			.select()
			.from(emailOutbox)
			.where(
				and(eq(emailOutbox.template, 'fit-reported-owner'), eq(emailOutbox.toAddress, owner!.email))
			);
		expect(mails).toHaveLength(1);

		const [report] = await db
			.select()
			.from(fitReport)
			.where(eq(fitReport.bookingId, made.bookingId));
		expect(report).toMatchObject({ visit: 1, installerId, minutesTaken: 80 });
		expect(report!.details).toMatchObject({
			switched: { position: 'F12 cabin box', originalAmps: 10, addedAmps: 5 },
			permanent: null,
			fuseFamily: 'mini'
		});
		const photos = await db
			.select()
			.from(fitReportPhoto)
			.where(eq(fitReportPhoto.fitReportId, report!.id));
		expect(photos.map((p) => p.position).sort()).toEqual([0, 1]);
		for (const p of photos) expect(await getObject(p.objectKey)).not.toBeNull();

		// The photos are the owner's, the installer's and admins', no one else's.
		const first = photos[0]!.id;
		expect(
			await findViewableFitReportPhoto(first, { id: made.ownerId, role: 'owner' })
		).not.toBeNull();
		expect(
			await findViewableFitReportPhoto(first, { id: installerId, role: 'installer' })
		).not.toBeNull();
		const stranger = await makeUser('owner', 'fit-stranger');
		expect(await findViewableFitReportPhoto(first, { id: stranger.id, role: 'owner' })).toBeNull();
		const otherInstaller = made.installers[1] ?? (await makeUser('installer', 'fit-other'));
		expect(
			await findViewableFitReportPhoto(first, { id: otherInstaller.id, role: 'installer' })
		).toBeNull();

		// A second report for the same visit is refused, and nothing more is written.
		const again = await fileFitReport(
			made.bookingId,
			installerId,
			await formFor(made.bookingId, installerId),
			[await photo()]
		);
		expect(again).toMatchObject({ ok: false, status: 409 });
		expect(
			await db.select().from(fitReport).where(eq(fitReport.bookingId, made.bookingId))
		).toHaveLength(1);
	});

	it('answers 404 to another installer and leaves the booking to fit', async () => {
		const made = await paidBookingIn(world, 2);
		const other = made.installers[1]!;
		const refused = await fileFitReport(
			made.bookingId,
			other.id,
			await formFor(made.bookingId, made.chosen.installerId),
			[await photo()]
		);
		expect(refused).toMatchObject({ ok: false, status: 404 });
		const [b] = await db.select().from(booking).where(eq(booking.id, made.bookingId));
		expect(b!.stage).toBe('to_fit');
		expect(await getInstallRecord(made.bookingId, { id: other.id, role: 'installer' })).toBeNull();
	});

	it('answers 409 for a booking not yet paid', async () => {
		const made = await bookAndOpenCheckout();
		const installerId = made.chosen.installerId;
		const refused = await fileFitReport(
			made.bookingId,
			installerId,
			await formFor(made.bookingId, installerId),
			[await photo()]
		);
		expect(refused).toMatchObject({ ok: false, status: 409 });
		expect(
			await db.select().from(fitReport).where(eq(fitReport.bookingId, made.bookingId))
		).toHaveLength(0);
	});

	it('answers 400 without a photo or with a file that is not a picture', async () => {
		const made = await paidBookingIn(world);
		const installerId = made.chosen.installerId;
		const form = await formFor(made.bookingId, installerId);
		expect(await fileFitReport(made.bookingId, installerId, form, [])).toMatchObject({
			ok: false,
			status: 400,
			message: 'Add at least one photo of the finished fit'
		});
		const text = new File(['not a picture'], 'notes.txt', { type: 'text/plain' });
		const refused = await fileFitReport(made.bookingId, installerId, form, [await photo(), text]);
		expect(refused).toMatchObject({ ok: false, status: 400 });
		expect(refused.ok ? '' : refused.message).toMatch(/^Photo 2: /);
		const [b] = await db.select().from(booking).where(eq(booking.id, made.bookingId));
		expect(b!.stage).toBe('to_fit');
	});
});

describe('the install record', () => {
	it('shows the owner the vehicle, circuits and photos, and makes a valid PDF of them', async () => {
		const made = await paidBookingIn(world);
		const installerId = made.chosen.installerId;
		const filed = await fileFitReport(
			made.bookingId,
			installerId,
			await formFor(made.bookingId, installerId),
			[await photo()]
		);
		expect(filed.ok).toBe(true);
		const record = await getInstallRecord(made.bookingId, { id: made.ownerId, role: 'owner' });
		expect(record?.report?.photos).toHaveLength(1);
		expect(record?.stage).toBe('reported');
		const bytes = await installRecordPdf(record!);
		expect(Buffer.from(bytes.subarray(0, 5)).toString('latin1')).toBe('%PDF-');
		const doc = await PDFDocument.load(bytes);
		expect(doc.getTitle()).toBe(`Install record: ${record!.title}`);
		const text = await pdfText(bytes);
		expect(text).toContain('Install record');
		expect(text).toContain(record!.vehicle);
		expect(text).toContain('Fuse F12 cabin box: original 10 A, added circuit 5 A (mini blade)');
		expect(text).toContain('Kick-panel stud, passenger side, on bare metal');
		expect(text).toContain('Does not apply: No parking mode on this fit');
		expect(text).toContain(record!.businessName);
	});
});
