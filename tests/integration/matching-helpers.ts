// Shared set-up for the marketplace integration tests: installers, open jobs and quotes written
// straight into the tables (their own forms are tested elsewhere), and slots in working hours.
import { db } from '$lib/server/db';
import { installerHours, installerProfile, job, user } from '$lib/server/db/schema';
import type { QuoteInput } from '$lib/server/marketplace/quotes';
import type { LatLng } from '$lib/geo';
import { type JobRequestInput } from '$lib/scope';
import { formatInZone, localToUtc } from '$lib/time';
import { SAMPLE_REQUEST } from '../../seed/sample-request';
import { postedJobColumns } from '$lib/marketplace/posted-job';

export const ZONE = 'Australia/Adelaide';
export const ADELAIDE: LatLng = { lat: -34.9285, lng: 138.6007 };

let n = 0;

/** A fresh account; returns its id and address. */
export async function makeUser(role: 'owner' | 'installer', label: string = role) {
	const id = crypto.randomUUID();
	const email = `${label}${++n}.${id.slice(0, 8)}@example.test`;
	await db.insert(user).values({
		id,
		email,
		passwordHash: 'unused',
		role,
		displayName: `${label} ${n}`,
		emailVerifiedAt: new Date()
	});
	return { id, email };
}

export interface InstallerOptions {
	base?: LatLng;
	radiusKm?: number;
	skills?: string[];
	status?: 'applied' | 'approved' | 'suspended';
	pausedReason?: string | null;
	mobile?: boolean;
	workshop?: boolean;
	freeRadiusKm?: number;
	travelFeeCentsPerKm?: number;
	/** Registered for GST; true unless said otherwise. */
	gstRegistered?: boolean;
	/** Payouts set up (quoting needs it); true unless said otherwise. */
	payoutsEnabled?: boolean;
}

/** A vetted installer (by default) working weekdays 08:00–17:00 Adelaide time. */
export async function makeInstaller(options: InstallerOptions = {}) {
	const account = await makeUser('installer');
	const base = options.base ?? ADELAIDE;
	await db.insert(installerProfile).values({
		userId: account.id,
		businessName: `Test Fitting ${String(n)}`,
		gstRegistered: options.gstRegistered ?? true,
		suburb: 'Adelaide',
		postcode: '5000',
		latitude: base.lat,
		longitude: base.lng,
		serviceRadiusKm: options.radiusKm ?? 25,
		skills: options.skills ?? [
			'parking-mode',
			'tailgate-rear',
			'vans-utes',
			'obd-power',
			'cabin-camera'
		],
		offersMobile: options.mobile ?? true,
		offersWorkshop: options.workshop ?? true,
		freeRadiusKm: options.freeRadiusKm ?? 10,
		travelFeeCentsPerKm: options.travelFeeCentsPerKm ?? 150,
		vettingStatus: options.status ?? 'approved',
		pausedReason: options.pausedReason ?? null,
		// Quoting needs payouts; tests that pay out give the installer a real account in the fake.
		payoutsEnabled: options.payoutsEnabled ?? true,
		submittedAt: new Date()
	});
	await db.insert(installerHours).values(
		[1, 2, 3, 4, 5].map((weekday) => ({
			installerId: account.id,
			weekday,
			startMinute: 8 * 60,
			endMinute: 17 * 60
		}))
	);
	return account;
}

/** The shared sample request (see seed/sample-request.ts). */
export const HATCH_REQUEST: JobRequestInput = SAMPLE_REQUEST;

/** An open job, posted, at a point. */
export async function makeOpenJob(
	at: LatLng = ADELAIDE,
	options: {
		request?: Partial<JobRequestInput>;
		locationMode?: 'mobile' | 'workshop';
		ownerId?: string;
	} = {}
) {
	const owner = options.ownerId ? { id: options.ownerId } : await makeUser('owner');
	const request = { ...HATCH_REQUEST, ...options.request } as JobRequestInput;
	const [row] = await db
		.insert(job)
		.values({
			ownerId: owner.id,
			status: 'collecting_quotes',
			...postedJobColumns(request),
			locationMode: options.locationMode ?? 'mobile',
			suburb: 'Adelaide',
			postcode: '5000',
			latitude: at.lat,
			longitude: at.lng,
			addressLine: '1 Secret Street',
			preferredWindows: [{ date: localDay(5), window: 'morning' }],
			submittedAt: new Date()
		})
		.returning();
	if (!row) throw new Error('job not inserted');
	return { job: row, ownerId: owner.id };
}

/** The Adelaide calendar date `days` from now. */
export function localDay(days: number): string {
	return formatInZone(new Date(Date.now() + days * 86_400_000), ZONE, 'yyyy-MM-dd');
}

/** The `k`-th weekday (Mon–Fri) in Adelaide from 3 days ahead, 'YYYY-MM-DD'. */
export function workday(k: number): string {
	const found: string[] = [];
	for (let d = 3; found.length <= k; d++) {
		const day = localDay(d);
		const weekday = new Date(`${day}T12:00:00Z`).getUTCDay();
		if (weekday >= 1 && weekday <= 5) found.push(day);
	}
	return found[k]!;
}

/** A slot on a local date, Adelaide time. */
export function slotOn(day: string, start: string, end: string) {
	return { start: localToUtc(day, start, ZONE), end: localToUtc(day, end, ZONE) };
}

/** A quote that passes every check for a job with `partCount` priced parts. */
export function goodQuote(partCount: number, overrides: Partial<QuoteInput> = {}): QuoteInput {
	return {
		labourCents: 19_800,
		partUnitCents: Array.from({ length: partCount }, () => 500),
		cameraSupplied: false,
		cameraCents: 0,
		warrantyMonths: 12,
		slots: [slotOn(workday(0), '09:00', '11:00'), slotOn(workday(1), '13:00', '15:00')],
		message: null,
		expiresAt: new Date(Date.now() + 14 * 86_400_000),
		...overrides
	};
}

/** Parts on the job's scope sheet that the quote prices (the camera is priced separately). */
export const pricedParts = (row: { scope: { parts: Array<{ code: string }> } | null }) =>
	(row.scope?.parts ?? []).filter((p) => p.code !== 'camera').length;
