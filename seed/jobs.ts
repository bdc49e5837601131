/**
 * Open demo jobs for the demo owners, so the demo installers find work on their job board. Cars
 * are invented ('Demo' make), places are real suburb centres from the shared demo gazetteer, and
 * preferred dates count from the seeding day.
 */
import { eq } from 'drizzle-orm';
import type { NodePgDatabase } from 'drizzle-orm/node-postgres';
import { job, user } from '../src/lib/server/db/schema';
import type { JobRequestInput } from '../src/lib/scope';
import { suburbPoint } from './scenario';
import { postedJobColumns } from '../src/lib/marketplace/posted-job';
import { SAMPLE_REQUEST } from './sample-request';

interface DemoJob {
	ownerEmail: string;
	suburb: string;
	locationMode: 'mobile' | 'workshop';
	addressLine: string | null;
	request: Partial<JobRequestInput> & Pick<JobRequestInput, 'model' | 'year' | 'bodyStyle'>;
	/** Preferred dates as days after seeding. */
	inDays: number[];
}

/** The demo jobs; the first is the one the end-to-end marketplace test quotes and books. */
export const DEMO_JOBS: readonly DemoJob[] = [
	{
		ownerEmail: 'demo.owner@tapline.test',
		suburb: 'Walkerville',
		locationMode: 'mobile',
		addressLine: '14 Demo Court, Walkerville',
		request: { model: 'Hatch', year: '2018', bodyStyle: 'hatchback' },
		inDays: [6, 8]
	},
	{
		ownerEmail: 'tobias.wren@tapline.test',
		suburb: 'Mitcham',
		locationMode: 'workshop',
		addressLine: null,
		request: {
			model: 'Ute',
			year: '2020',
			bodyStyle: 'ute',
			power: 'hardwired-switched',
			fuseFamily: 'low-profile-mini'
		},
		inDays: [9]
	},
	{
		ownerEmail: 'leilani.fox@tapline.test',
		suburb: 'Unley',
		locationMode: 'mobile',
		addressLine: '3 Sample Street, Unley',
		request: {
			model: 'Sedan',
			year: '2016',
			bodyStyle: 'sedan',
			cameras: 'front',
			power: 'socket'
		},
		inDays: [5, 7]
	},
	{
		ownerEmail: 'dmitri.hale@tapline.test',
		suburb: 'Glenelg',
		locationMode: 'mobile',
		addressLine: '27 Example Parade, Glenelg',
		request: {
			model: 'Wagon',
			year: '2021',
			bodyStyle: 'wagon',
			power: 'obd',
			startStop: true,
			batteryType: 'agm'
		},
		inDays: [10]
	},
	{
		ownerEmail: 'demo.owner@tapline.test',
		suburb: 'Kensington',
		locationMode: 'workshop',
		addressLine: null,
		request: {
			model: 'People Mover',
			year: '2019',
			bodyStyle: 'people-mover',
			cameras: 'front-rear-cabin'
		},
		inDays: [12]
	},
	{
		ownerEmail: 'leilani.fox@tapline.test',
		suburb: 'Port Adelaide',
		locationMode: 'workshop',
		addressLine: null,
		request: { model: 'Van', year: '2017', bodyStyle: 'van', fuseFamily: 'standard' },
		inDays: [8, 11]
	}
];

const day = (from: Date, days: number) =>
	new Date(from.getTime() + days * 86_400_000).toISOString().slice(0, 10);

/** Inserts the demo jobs, open for quotes. */
export async function seedDemoJobs(db: NodePgDatabase, today: Date): Promise<void> {
	for (const demo of DEMO_JOBS) {
		const [owner] = await db
			.select({ id: user.id })
			.from(user)
			.where(eq(user.email, demo.ownerEmail));
		if (!owner) throw new Error(`No demo owner ${demo.ownerEmail}`);
		const request: JobRequestInput = { ...SAMPLE_REQUEST, ...demo.request };
		const place = suburbPoint(demo.suburb);
		await db.insert(job).values({
			ownerId: owner.id,
			status: 'collecting_quotes',
			draftStep: 'review',
			draft: { ...request },
			...postedJobColumns(request),
			locationMode: demo.locationMode,
			suburb: place.name,
			postcode: place.postcode,
			latitude: place.lat,
			longitude: place.lon,
			addressLine: demo.addressLine,
			preferredWindows: demo.inDays.map((d) => ({
				date: day(today, d),
				window: 'morning' as const
			})),
			submittedAt: today
		});
	}
}
