/**
 * The demo's bookings, every stage of one, made by the product's own code: jobs are posted rows
 * (as seed/jobs.ts makes them), and from the first quote on everything goes through the domain
 * functions and the payments fake. Checkouts are opened by Tapline, paid on the fake with the
 * published test card, and confirmed by the fake's signed webhooks; releases, refunds and the late
 * fee are real transfers and refunds on the fake. No money row is written here.
 *
 * History is backdated through the domain functions' clock (their `now`), never by editing rows
 * afterwards; the fake's own timestamps stay real. Dates count from the seeding day.
 */
import type { Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { eq } from 'drizzle-orm';
import sharp from 'sharp';
import { fitReportSchemaFor } from '$lib/forms/fit-report';
import { fitNoteSchema } from '$lib/forms/fit-note';
import { postedJobColumns } from '$lib/marketplace/posted-job';
import type { AspectStars, ReviewSide } from '$lib/work/reviews';
import type { JobRequestInput } from '$lib/scope';
import { formatInZone, localToUtc } from '$lib/time';
import { bookQuote } from '$lib/server/marketplace/bookings';
import { confirmWork } from '$lib/server/work/completion';
import { db } from '$lib/server/db';
import { booking, job, payment, user } from '$lib/server/db/schema';
import { openDispute } from '$lib/server/work/disputes';
import { storeUpload } from '$lib/server/files/uploads';
import { fileFitReport, getReportableBooking } from '$lib/server/work/fit-reports';
import { markFitNote, publishFitNote } from '$lib/server/fit-notes/fit-notes';
import { cancelPaidBooking, startHeldFundsPayment } from '$lib/server/money/payments';
import { submitQuote } from '$lib/server/marketplace/quotes';
import { submitReview } from '$lib/server/work/reviews';
import { postJobMessage } from '$lib/server/marketplace/threads';
import { SAMPLE_REQUEST } from './sample-request';
import { suburbPoint } from './scenario';
import { startWebhookReceiver } from './webhook-receiver';

const ZONE = 'Australia/Adelaide';
const HOUR = 3_600_000;
const DAY = 24 * HOUR;
/** The published test card that always succeeds (Stripe's testing docs; the fake accepts it). */
const TEST_CARD = '4242424242424242';

const OWNER = 'demo.owner@tapline.test';
const INSTALLER = 'demo.installer@tapline.test';
const INES = 'ines.calder@tapline.test';
const BAO = 'bao.tran@tapline.test';
const RUTH = 'ruth.akande@tapline.test';
const TOBIAS = 'tobias.wren@tapline.test';
const LEILANI = 'leilani.fox@tapline.test';
const DMITRI = 'dmitri.hale@tapline.test';

/** The `i`-th item of a list, round and round. */
function nth<T>(list: readonly T[], i: number): T {
	const item = list[i % list.length];
	if (item === undefined) throw new Error('empty list');
	return item;
}

// --- time ------------------------------------------------------------------------------------

/** The Adelaide calendar date of an instant, 'YYYY-MM-DD'. */
const dayOf = (at: Date) => formatInZone(at, ZONE, 'yyyy-MM-dd');
const weekdayOf = (day: string) => new Date(`${day}T12:00:00Z`).getUTCDay();
const addDays = (day: string, days: number) =>
	new Date(Date.parse(`${day}T12:00:00Z`) + days * DAY).toISOString().slice(0, 10);

/**
 * Whether the demo installers work on the day: weekdays for all, Saturday mornings for the demo
 * installer too (see demoWeeklyHours).
 */
const isWorkday = (day: string, saturdays = false) =>
	(weekdayOf(day) >= 1 && weekdayOf(day) <= 5) || (saturdays && weekdayOf(day) === 6);

/** The nearest working day from `day` in `step` direction (the day itself when it is one). */
function workdayFrom(day: string, step: 1 | -1, saturdays = false): string {
	let d = day;
	while (!isWorkday(d, saturdays)) d = addDays(d, step);
	return d;
}

interface Slot {
	start: Date;
	end: Date;
}
const slotOn = (day: string, from: string, to: string): Slot => ({
	start: localToUtc(day, from, ZONE),
	end: localToUtc(day, to, ZONE)
});
/** The second time every quote offers: the next weekday's late afternoon, a band no booking uses. */
const alternativeTo = (day: string) => slotOn(workdayFrom(addDays(day, 1), 1), '15:15', '16:45');

// --- the payments fake ----------------------------------------------------------------------

/**
 * The fake's webhooks, received here while the seed runs: the fake signs and POSTs each event as
 * it does to the app's route, and the same function the route calls processes it, at the seed's
 * clock. Afterwards the fake is pointed back at the app.
 */
class PaymentsDesk {
	now = new Date();
	private constructor(
		private readonly base: string,
		private readonly hook: Server
	) {}

	static async open(): Promise<PaymentsDesk> {
		const host = process.env.STRIPE_API_HOST;
		const port = process.env.STRIPE_API_PORT;
		const base = `${process.env.STRIPE_API_PROTOCOL ?? 'https'}://${host ?? ''}:${port ?? ''}`;
		const reachable =
			host && port
				? await fetch(`${base}/`).then(
						(r) => r.ok,
						() => false
					)
				: false;
		if (!reachable) {
			throw new Error(
				`The demo's bookings are paid on the payments fake, which does not answer at ${base}. ` +
					'Start it first (npm run fakes), or use npm start, which starts it before the seed.'
			);
		}
		const hook = await startWebhookReceiver(() => desk.now);
		const desk = new PaymentsDesk(base, hook);
		const { port: hookPort } = hook.address() as AddressInfo;
		await desk.control('/webhook', { url: `http://127.0.0.1:${String(hookPort)}/` });
		return desk;
	}

	async control(path: string, body: unknown = {}): Promise<unknown> {
		const res = await fetch(`${this.base}/control${path}`, {
			method: 'POST',
			headers: { 'content-type': 'application/json' },
			body: JSON.stringify(body)
		});
		if (!res.ok)
			throw new Error(`payments fake ${path}: ${String(res.status)} ${await res.text()}`);
		return res.json();
	}

	/** Points the fake back at the app's webhook route and stops listening. */
	async close(): Promise<void> {
		await this.control('/webhook', { url: process.env.FAKE_STRIPE_WEBHOOK_URL ?? null });
		await new Promise<void>((resolve) => this.hook.close(() => resolve()));
	}
}

const ok = <T extends { ok: true } | { ok: false; message: string }>(
	what: string,
	outcome: T
): Extract<T, { ok: true }> => {
	if (!outcome.ok) throw new Error(`demo ${what}: ${outcome.message}`);
	return outcome as Extract<T, { ok: true }>;
};

async function until(what: string, test: () => Promise<boolean>): Promise<void> {
	for (let i = 0; i < 150; i++) {
		if (await test()) return;
		await new Promise((r) => setTimeout(r, 100));
	}
	throw new Error(`demo: ${what} did not happen within 15 s`);
}

// --- the steps of a booking -----------------------------------------------------------------

interface People {
	id: (email: string) => string;
	name: (email: string) => string;
}

async function people(): Promise<People> {
	const rows = await db
		.select({ id: user.id, email: user.email, name: user.displayName })
		.from(user);
	const byEmail = new Map(rows.map((r) => [r.email, r]));
	const get = (email: string) => {
		const row = byEmail.get(email);
		if (!row) throw new Error(`No demo account ${email}`);
		return row;
	};
	return { id: (email) => get(email).id, name: (email) => get(email).name };
}

interface JobSpec {
	owner: string;
	suburb: string;
	request: Partial<JobRequestInput>;
	addressLine: string;
	/** The preferred day. */
	day: string;
	postedAt: Date;
}

/** A posted job, as seed/jobs.ts writes them: a sedan by default, so every vetted installer fits. */
async function postJob(p: People, spec: JobSpec): Promise<string> {
	const request: JobRequestInput = {
		...SAMPLE_REQUEST,
		model: 'Sedan',
		bodyStyle: 'sedan',
		...spec.request
	};
	const place = suburbPoint(spec.suburb);
	const [row] = await db
		.insert(job)
		.values({
			ownerId: p.id(spec.owner),
			status: 'collecting_quotes',
			draftStep: 'review',
			draft: { ...request },
			...postedJobColumns(request),
			locationMode: 'mobile',
			suburb: place.name,
			postcode: place.postcode,
			latitude: place.lat,
			longitude: place.lon,
			addressLine: spec.addressLine,
			preferredWindows: [{ date: spec.day, window: 'morning' as const }],
			submittedAt: spec.postedAt,
			createdAt: spec.postedAt
		})
		.returning({ id: job.id });
	if (!row) throw new Error('demo job not inserted');
	return row.id;
}

async function quoteOn(
	p: People,
	installer: string,
	jobId: string,
	slot: Slot,
	now: Date,
	labourCents = 21_000
): Promise<string> {
	const [row] = await db.select({ scope: job.scope }).from(job).where(eq(job.id, jobId));
	const parts = (row?.scope?.parts ?? []).filter((part) => part.code !== 'camera').length;
	const sent = await submitQuote(
		p.id(installer),
		jobId,
		{
			labourCents,
			partUnitCents: Array.from({ length: parts }, () => 650),
			cameraSupplied: false,
			cameraCents: 0,
			warrantyMonths: 12,
			slots: [slot, alternativeTo(dayOf(slot.start))],
			message: 'Hard-wired to the fuse box with a low-voltage cut-off; cables hidden.',
			expiresAt: new Date(now.getTime() + 14 * DAY)
		},
		now
	);
	return ok('quote', sent).quoteId;
}

/** Books the quote's first slot as the owner, and pays it with the test card when `pay`. */
async function book(
	desk: PaymentsDesk,
	p: People,
	owner: string,
	jobId: string,
	quoteId: string,
	slot: Slot,
	now: Date,
	pay = true
): Promise<string> {
	const booked = ok(
		'booking',
		await bookQuote(p.id(owner), jobId, quoteId, slot.start.toISOString(), now)
	);
	if (!pay) return booked.bookingId;
	desk.now = new Date(now.getTime() + 5 * 60_000);
	const started = await startHeldFundsPayment(booked.bookingId, desk.now);
	if (!('status' in started) || started.status !== 'redirect') {
		throw new Error(`demo checkout did not open: ${JSON.stringify(started)}`);
	}
	const [row] = await db
		.select({ session: payment.checkoutSessionId })
		.from(payment)
		.where(eq(payment.bookingId, booked.bookingId));
	if (!row?.session) throw new Error('demo checkout without a session');
	await desk.control(`/checkout/sessions/${row.session}/pay`, { card: TEST_CARD });
	await until('the payment webhook', async () => {
		const [b] = await db
			.select({ status: booking.status })
			.from(booking)
			.where(eq(booking.id, booked.bookingId));
		return b?.status === 'confirmed';
	});
	return booked.bookingId;
}

/** A plain JPEG photo of the given colour, as a phone would post it. */
async function photo(colour: string, name: string): Promise<File> {
	const bytes = await sharp({
		create: { width: 960, height: 720, channels: 3, background: colour }
	})
		.jpeg({ quality: 70 })
		.toBuffer();
	return new File([new Uint8Array(bytes)], name, { type: 'image/jpeg' });
}

const REPORT = {
	switchedTap: 'done',
	switchedPosition: 'F19 accessory socket, cabin fuse box',
	switchedOriginalAmps: '15',
	switchedAddedAmps: '5',
	permanentTap: 'done',
	permanentPosition: 'F7 interior light',
	permanentOriginalAmps: '10',
	permanentAddedAmps: '5',
	fuseFamily: 'mini',
	tapOrientation: 'done',
	ground: 'done',
	groundPoint: 'Body stud at the passenger kick panel',
	groundBareMetal: true,
	cutOff: 'done',
	cutOffVolts: 12.0,
	parkingMode: 'done',
	cableHidden: 'done',
	airbagRouting: 'done',
	cameraPlacement: 'done',
	rearDemister: 'done',
	minutesTaken: 95,
	notes:
		'Cable behind the curtain airbag, never across it. Parking mode checked with the doors locked.'
};

async function report(p: People, installer: string, bookingId: string, now: Date): Promise<void> {
	const found = await getReportableBooking(bookingId, p.id(installer));
	if (!found) throw new Error('demo report: no such booking');
	const form = fitReportSchemaFor(found.rearCamera).parse(REPORT);
	const photos = [await photo('#5b6f7d', 'fuse-box.jpg'), await photo('#8a7a62', 'camera.jpg')];
	ok('fit report', await fileFitReport(bookingId, p.id(installer), form, photos, now));
}

async function reviewBoth(
	p: People,
	owner: string,
	installer: string,
	bookingId: string,
	at: Date
) {
	const sides: Array<[ReviewSide, string, AspectStars, string]> = [
		[
			'owner',
			owner,
			{ workmanship: 5, tidiness: 5, communication: 4, punctuality: 5 },
			'Tidy work: not a cable in sight, and parking mode explained before they left.'
		],
		[
			'installer',
			installer,
			{ vehicleReady: 5, communication: 5, accurateJob: 4 },
			'Car was ready and clean, keys on time, and the job was as described.'
		]
	];
	for (const [side, author, stars, text] of sides) {
		ok('review', await submitReview(bookingId, p.id(author), side, { ...stars, text }, at));
	}
}

// --- the story ------------------------------------------------------------------------------

/** What the story made, for the first screen's pointers and the seed's own checks. */
export interface DemoStory {
	quoting: string;
	provisional: string;
	nextWeek: string;
	awaitingConfirmation: string;
	confirmed: string;
	disputed: string;
	cancelledLate: string;
	dueToday: string;
	fitNotes: string[];
}

/**
 * Plays the demo's bookings through the product. Needs the payments fake (STRIPE_API_* in the
 * environment) and the object store (S3_ENDPOINT) running.
 */
export async function seedDemoStory(today = new Date()): Promise<DemoStory> {
	const p = await people();
	const desk = await PaymentsDesk.open();
	try {
		return await playStory(desk, p, today);
	} finally {
		await desk.close();
	}
}

async function playStory(desk: PaymentsDesk, p: People, today: Date): Promise<DemoStory> {
	const ago = (days: number, hours = 0) => new Date(today.getTime() - days * DAY - hours * HOUR);
	const todayDay = dayOf(today);
	const notes: string[] = [];

	// Months of finished work for the overview's charts, the payouts and the public reviews: one
	// booking a week or so, 12 to 4 weeks back, each confirmed by its owner and reviewed by both sides.
	// Ruth stays unreviewed: the marketplace spec ranks a newcomer at the starting rating.
	const historyInstallers = [INSTALLER, INES, INSTALLER, BAO, INSTALLER, BAO, INSTALLER, INES];
	const finished: Array<{ bookingId: string; installer: string }> = [];
	for (const [i, installer] of historyInstallers.entries()) {
		const weeksBack = 12 - i - (i >= 4 ? 1 : 0);
		const postedAt = ago(weeksBack * 7);
		const day = workdayFrom(addDays(dayOf(postedAt), 4), 1);
		const slot = slotOn(day, '09:00', '11:00');
		const owner = nth([TOBIAS, LEILANI, DMITRI], i);
		const jobId = await postJob(p, {
			owner,
			suburb: nth(['Unley', 'Walkerville', 'Mitcham', 'Prospect'], i),
			request: { model: nth(['Sedan', 'Wagon', 'Hatch', 'Coupe'], i), year: '2019' },
			addressLine: `${String(20 + i)} Sample Street`,
			day,
			postedAt
		});
		const quoteId = await quoteOn(
			p,
			installer,
			jobId,
			slot,
			new Date(postedAt.getTime() + 3 * HOUR)
		);
		const bookingId = await book(
			desk,
			p,
			owner,
			jobId,
			quoteId,
			slot,
			new Date(postedAt.getTime() + 20 * HOUR)
		);
		const reportedAt = new Date(slot.end.getTime() + HOUR);
		desk.now = reportedAt;
		await report(p, installer, bookingId, reportedAt);
		const confirmedAt = new Date(reportedAt.getTime() + 20 * HOUR);
		desk.now = confirmedAt;
		ok('confirmation', await confirmWork(bookingId, p.id(owner), confirmedAt));
		await reviewBoth(p, owner, installer, bookingId, new Date(confirmedAt.getTime() + DAY));
		finished.push({ bookingId, installer });
	}

	// The demo owner's confirmed booking with both reviews, about twelve days back.
	const confirmedDay = workdayFrom(addDays(todayDay, -12), -1);
	const confirmedSlot = slotOn(confirmedDay, '13:00', '15:00');
	const confirmedJob = await postJob(p, {
		owner: OWNER,
		suburb: 'Walkerville',
		request: { model: 'Wagon', year: '2021' },
		addressLine: '14 Demo Court, Walkerville',
		day: confirmedDay,
		postedAt: ago(20)
	});
	const confirmed = await book(
		desk,
		p,
		OWNER,
		confirmedJob,
		await quoteOn(p, INSTALLER, confirmedJob, confirmedSlot, ago(19, 20)),
		confirmedSlot,
		ago(19)
	);
	desk.now = new Date(confirmedSlot.end.getTime() + HOUR);
	await report(p, INSTALLER, confirmed, desk.now);
	desk.now = new Date(confirmedSlot.end.getTime() + 18 * HOUR);
	ok('confirmation', await confirmWork(confirmed, p.id(OWNER), desk.now));
	await reviewBoth(p, OWNER, INSTALLER, confirmed, new Date(desk.now.getTime() + DAY));

	// Two fit notes from the demo installer, each marked by other installers.
	const noted = [
		confirmed,
		finished.find((f) => f.installer === INSTALLER)?.bookingId ?? confirmed
	];
	for (const [n, bookingId] of noted.entries()) {
		const note = fitNoteSchema.parse({
			make: 'Demo',
			model: n === 0 ? 'Wagon' : 'Sedan',
			yearFrom: 2017,
			yearTo: 2022,
			bodyStyle: 'sedan',
			fuseFamily: 'mini',
			fuseBoxLocation: "Behind the glovebox, passenger's side",
			fuseBoxAccess: 'Squeeze both glovebox stops and let it drop',
			switchedFuse: 'F19 (accessory socket)',
			switchedRatingAmps: 15,
			permanentFuse: 'F7 (interior light)',
			permanentRatingAmps: 10,
			groundPoints: 'Body stud at the passenger kick panel, 10 mm head',
			trimRemoval: 'A-pillar cover pulls off top first; two clips, keep the tether',
			grommetRoute: 'Boot-lid grommet on the left hinge, pull-through wire needed',
			pitfalls: 'F7 stays live about ten minutes after locking; wait before testing parking mode'
		});
		const published = ok('fit note', await publishFitNote(p.id(INSTALLER), bookingId, note));
		notes.push(published.noteId);
		for (const [marker, verdict, comment] of [
			[INES, 'confirmed', 'Same fuse positions on mine; the stud was where the note says.'],
			[
				BAO,
				n === 0 ? 'confirmed' : 'wrong',
				n === 0
					? 'Held on my fit too; the glovebox drop saved ten minutes.'
					: 'On mine F7 was the horn, not the interior light; check the lid diagram first.'
			]
		] as const) {
			ok('fit note mark', await markFitNote(p.id(marker), published.noteId, { verdict, comment }));
		}
	}

	// Cancelled by the owner a day before the fit: the late fee to the installer, the rest back.
	const cancelledDay = workdayFrom(addDays(todayDay, -6), -1);
	const cancelledSlot = slotOn(cancelledDay, '10:30', '12:30');
	const cancelledJob = await postJob(p, {
		owner: OWNER,
		suburb: 'Norwood',
		request: { model: 'Coupe', year: '2015', cameras: 'front' },
		addressLine: '2 Parade Lane, Norwood',
		day: cancelledDay,
		postedAt: ago(15)
	});
	const cancelledLate = await book(
		desk,
		p,
		OWNER,
		cancelledJob,
		await quoteOn(p, INSTALLER, cancelledJob, cancelledSlot, ago(14, 20)),
		cancelledSlot,
		ago(14)
	);
	desk.now = new Date(cancelledSlot.start.getTime() - 20 * HOUR);
	ok('late cancellation', await cancelPaidBooking(cancelledLate, 'owner', p.id(OWNER), desk.now));

	// The demo owner's problem raised with a photo, on another installer's fit: open for an admin.
	const disputedDay = workdayFrom(addDays(todayDay, -3), -1);
	const disputedSlot = slotOn(disputedDay, '09:00', '11:00');
	const disputedJob = await postJob(p, {
		owner: OWNER,
		suburb: 'Kensington',
		request: { model: 'Hatch', year: '2017', bodyStyle: 'hatchback' },
		addressLine: '9 Sample Road, Kensington',
		day: disputedDay,
		postedAt: ago(10)
	});
	const disputed = await book(
		desk,
		p,
		OWNER,
		disputedJob,
		await quoteOn(p, INES, disputedJob, disputedSlot, ago(9, 20)),
		disputedSlot,
		ago(9)
	);
	const disputeReportAt = new Date(Math.max(disputedSlot.end.getTime() + HOUR, ago(2.5).getTime()));
	desk.now = disputeReportAt;
	await report(p, INES, disputed, disputeReportAt);
	const stored = await storeUpload(await photo('#3d3f44', 'cable.jpg'), `disputes/${disputed}`);
	if (!stored.ok) throw new Error(`demo dispute photo: ${stored.problem}`);
	ok(
		'problem',
		await openDispute(
			{
				bookingId: disputed,
				ownerId: p.id(OWNER),
				reason: 'cable-visible',
				description:
					'The rear camera cable hangs below the headlining at the tailgate; photo attached.',
				photos: [stored.stored]
			},
			new Date(disputeReportAt.getTime() + 10 * HOUR)
		)
	);

	// Fitted by the demo installer on their last working day; the owner has yet to confirm.
	const reportedDay = workdayFrom(addDays(todayDay, -1), -1);
	const reportedSlot = slotOn(reportedDay, '13:00', '15:00');
	const reportedJob = await postJob(p, {
		owner: OWNER,
		suburb: 'Unley',
		request: { model: 'Hatch', year: '2020', bodyStyle: 'hatchback' },
		addressLine: '5 Demo Avenue, Unley',
		day: reportedDay,
		postedAt: ago(9)
	});
	const awaitingConfirmation = await book(
		desk,
		p,
		OWNER,
		reportedJob,
		await quoteOn(p, INSTALLER, reportedJob, reportedSlot, ago(8, 20)),
		reportedSlot,
		ago(8)
	);
	const reportAt = new Date(Math.max(reportedSlot.end.getTime() + HOUR, ago(1.5).getTime()));
	desk.now = reportAt;
	await report(p, INSTALLER, awaitingConfirmation, reportAt);

	// The demo installer's fit today (or their last working day), its report still to file.
	const dueDay = workdayFrom(todayDay, -1, true);
	const dueSlot = slotOn(dueDay, '09:00', '11:00');
	const dueJob = await postJob(p, {
		owner: LEILANI,
		suburb: 'Prospect',
		request: { model: 'Sedan', year: '2022' },
		addressLine: '31 Sample Terrace, Prospect',
		day: dueDay,
		postedAt: ago(6)
	});
	const dueToday = await book(
		desk,
		p,
		LEILANI,
		dueJob,
		await quoteOn(p, INSTALLER, dueJob, dueSlot, ago(5, 20)),
		dueSlot,
		ago(5)
	);

	// Coming fits: the next working day, and the demo owner's paid booking next week.
	const nextWorkday = workdayFrom(addDays(todayDay, 1), 1);
	const soonSlot = slotOn(nextWorkday, '13:00', '15:00');
	const soonJob = await postJob(p, {
		owner: DMITRI,
		suburb: 'Mitcham',
		request: { model: 'Ute', year: '2019', bodyStyle: 'ute', cameras: 'front' },
		addressLine: '8 Sample Crescent, Mitcham',
		day: nextWorkday,
		postedAt: ago(3)
	});
	await book(
		desk,
		p,
		DMITRI,
		soonJob,
		await quoteOn(p, INSTALLER, soonJob, soonSlot, ago(2, 20)),
		soonSlot,
		ago(2)
	);
	const monday = addDays(todayDay, 8 - (weekdayOf(todayDay) || 7));
	const nextWeekSlot = slotOn(addDays(monday, 1), '09:00', '11:00');
	const nextWeekJob = await postJob(p, {
		owner: OWNER,
		suburb: 'Norwood',
		request: { model: 'Wagon', year: '2023' },
		addressLine: '14 Demo Court, Walkerville',
		day: dayOf(nextWeekSlot.start),
		postedAt: ago(2)
	});
	const nextWeek = await book(
		desk,
		p,
		OWNER,
		nextWeekJob,
		await quoteOn(p, INSTALLER, nextWeekJob, nextWeekSlot, ago(1, 20)),
		nextWeekSlot,
		ago(1)
	);

	// Booked a few minutes ago and not paid yet: inside its hold.
	const holdSlot = slotOn(addDays(monday, 2), '13:00', '15:00');
	const holdJob = await postJob(p, {
		owner: OWNER,
		suburb: 'Walkerville',
		request: { model: 'Coupe', year: '2024', cameras: 'front' },
		addressLine: '14 Demo Court, Walkerville',
		day: dayOf(holdSlot.start),
		postedAt: ago(1)
	});
	const provisional = await book(
		desk,
		p,
		OWNER,
		holdJob,
		await quoteOn(p, RUTH, holdJob, holdSlot, ago(0, 6)),
		holdSlot,
		new Date(today.getTime() - 5 * 60_000),
		false
	);

	// Collecting quotes: three installers quoted, and the owner asked the demo installer a question.
	const quotingDay = workdayFrom(addDays(monday, 3), 1);
	const quoting = await postJob(p, {
		owner: OWNER,
		suburb: 'Walkerville',
		request: { model: 'Wagon', year: '2018', cameras: 'front' },
		addressLine: '14 Demo Court, Walkerville',
		day: quotingDay,
		postedAt: ago(2)
	});
	const offers: Array<[string, string, string, number]> = [
		[INSTALLER, '09:00', '11:00', 19_000],
		[INES, '13:00', '15:00', 21_500],
		[RUTH, '13:00', '15:00', 24_000]
	];
	for (const [i, [installer, from, to, labour]] of offers.entries()) {
		const slot = slotOn(quotingDay, from, to);
		await quoteOn(p, installer, quoting, slot, ago(1, 10 - i * 3), labour);
	}
	const thread: Array<[string, string]> = [
		[OWNER, 'Can you run the rear camera cable through the existing grommet rather than drilling?'],
		[
			INSTALLER,
			'Yes: the wagon has a spare grommet in the tailgate hinge loom, so no drilling at all.'
		],
		[OWNER, 'Great, and will parking mode flatten the battery over a long weekend?']
	];
	for (const [author, body] of thread) {
		const role = author === OWNER ? 'owner' : 'installer';
		ok('message', await postJobMessage(quoting, p.id(INSTALLER), { id: p.id(author), role }, body));
	}

	return {
		quoting,
		provisional,
		nextWeek,
		awaitingConfirmation,
		confirmed,
		disputed,
		cancelledLate,
		dueToday,
		fitNotes: notes
	};
}
