/**
 * The demo scenario: Adelaide, South Australia. Every person and business here is invented;
 * suburbs, postcodes and their coordinates are real (approximate centres).
 */
import { ADELAIDE_SUBURBS } from '../local-fakes/data/adelaide-suburbs';
import { isValidAbn } from '../src/lib/people/abn';
import type { InstallerSkill } from '../src/lib/people/vetting';

export { DEMO_TOUR_PASSWORD as DEMO_PASSWORD } from '../src/lib/demo-tour.js';

export interface DemoInstaller {
	email: string;
	displayName: string;
	businessName: string;
	suburb: string;
	radiusKm: number;
	mobile: boolean;
	workshop: boolean;
	status: 'applied' | 'waiting_on_installer' | 'approved' | 'rejected' | 'suspended';
}

export const DEMO_ADMIN = { email: 'demo.admin@tapline.test', displayName: 'Priya Venkataraman' };

export const DEMO_OWNERS = [
	{ email: 'demo.owner@tapline.test', displayName: 'Marnie Okafor' },
	{ email: 'tobias.wren@tapline.test', displayName: 'Tobias Wren' },
	{ email: 'leilani.fox@tapline.test', displayName: 'Leilani Fox' },
	{ email: 'dmitri.hale@tapline.test', displayName: 'Dmitri Hale' }
] as const;

export const DEMO_INSTALLERS: readonly DemoInstaller[] = [
	{
		email: 'demo.installer@tapline.test',
		displayName: 'Jarrah Whitcombe',
		businessName: 'Fuse & Fettle Auto Electrics',
		suburb: 'Norwood',
		radiusKm: 30,
		mobile: true,
		workshop: true,
		status: 'approved'
	},
	{
		email: 'ines.calder@tapline.test',
		displayName: 'Ines Calder',
		businessName: 'Quiet Wire Mobile Fitting',
		suburb: 'Glenelg',
		radiusKm: 25,
		mobile: true,
		workshop: false,
		status: 'approved'
	},
	{
		email: 'bao.tran@tapline.test',
		displayName: 'Bao Tran',
		businessName: 'Northside Cam Fitters',
		suburb: 'Salisbury',
		radiusKm: 35,
		mobile: true,
		workshop: true,
		status: 'approved'
	},
	{
		email: 'ruth.akande@tapline.test',
		displayName: 'Ruth Akande',
		businessName: 'Headliner Hands',
		suburb: 'Prospect',
		radiusKm: 20,
		mobile: true,
		workshop: false,
		status: 'approved'
	},
	{
		email: 'cormac.lynd@tapline.test',
		displayName: 'Cormac Lynd',
		businessName: 'Portside Twelve Volt',
		suburb: 'Port Adelaide',
		radiusKm: 25,
		mobile: false,
		workshop: true,
		status: 'approved'
	},
	{
		email: 'sione.latu@tapline.test',
		displayName: 'Sione Latu',
		businessName: 'Southern Vales Dash Fits',
		suburb: 'Noarlunga Centre',
		radiusKm: 40,
		mobile: true,
		workshop: false,
		status: 'approved'
	},
	{
		email: 'hattie.brun@tapline.test',
		displayName: 'Hattie Brun',
		businessName: 'Hills Circuit Co.',
		suburb: 'Mount Barker',
		radiusKm: 45,
		mobile: true,
		workshop: true,
		status: 'approved'
	},
	{
		email: 'omar.kassab@tapline.test',
		displayName: 'Omar Kassab',
		businessName: 'Clean Run Installs',
		suburb: 'Marion',
		radiusKm: 25,
		mobile: true,
		workshop: false,
		status: 'approved'
	},
	{
		email: 'freya.ostby@tapline.test',
		displayName: 'Freya Østby',
		businessName: 'Lakes Auto Accessories',
		suburb: 'Mawson Lakes',
		radiusKm: 30,
		mobile: true,
		workshop: true,
		status: 'applied'
	},
	{
		email: 'kwame.boateng@tapline.test',
		displayName: 'Kwame Boateng',
		businessName: 'Beachside Cable Craft',
		suburb: 'Henley Beach',
		radiusKm: 20,
		mobile: true,
		workshop: false,
		status: 'waiting_on_installer'
	},
	{
		email: 'niamh.doyle@tapline.test',
		displayName: 'Niamh Doyle',
		businessName: 'Eastern Grid Fitouts',
		suburb: 'Modbury',
		radiusKm: 30,
		mobile: true,
		workshop: false,
		status: 'approved'
	},
	{
		email: 'arjun.mehra@tapline.test',
		displayName: 'Arjun Mehra',
		businessName: 'Elizabeth Park Auto Sparks',
		suburb: 'Elizabeth',
		radiusKm: 35,
		mobile: false,
		workshop: true,
		status: 'suspended'
	}
];

/** Looks a suburb up in the shared demo gazetteer; throws on a typo so the seed never guesses. */
export function suburbPoint(name: string) {
	const found = ADELAIDE_SUBURBS.find((s) => s.name === name);
	if (!found) throw new Error(`Unknown demo suburb: ${name}`);
	return found;
}

/** What each demo installer fits, by position in {@link DEMO_INSTALLERS}. */
const SKILL_SETS: readonly InstallerSkill[][] = [
	['parking-mode', 'tailgate-rear', 'vans-utes', 'obd-power', 'cabin-camera'],
	['parking-mode', 'tailgate-rear', 'cabin-camera'],
	['parking-mode', 'vans-utes', 'obd-power'],
	['parking-mode', 'tailgate-rear'],
	['parking-mode', 'vans-utes', 'tailgate-rear'],
	['parking-mode', 'obd-power'],
	['parking-mode', 'tailgate-rear', 'vans-utes'],
	['parking-mode', 'cabin-camera'],
	['parking-mode', 'tailgate-rear', 'obd-power'],
	['parking-mode'],
	['parking-mode', 'tailgate-rear', 'cabin-camera'],
	['parking-mode', 'vans-utes']
];

/** Demo installers (by index) not registered for GST: Headliner Hands and Clean Run Installs. */
export const NOT_GST_REGISTERED: readonly number[] = [3, 7];

const INSURERS = ['Gumleaf Mutual', 'Saltbush Underwriting', 'Red Gum Trade Cover'] as const;

/**
 * An invented ABN that passes the ABN check: the nine digits after the first two are made from
 * `seed`, and the first two are the one pair (10–99) that makes the weighted sum divide by 89.
 * (Australian Business Register, "ABN format": the pair's weighted value (d1 − 1) x 10 + d2 runs
 * through 0–89, so exactly one residue class fits.)
 */
export function demoAbn(seed: number): string {
	const body = String(100_000_000 + ((seed * 7_654_321) % 900_000_000)).slice(0, 9);
	for (let first = 1; first <= 9; first++) {
		for (let second = 0; second <= 9; second++) {
			const abn = `${first}${second}${body}`;
			if (isValidAbn(abn)) return abn;
		}
	}
	throw new Error(`No ABN prefix fits ${body}`);
}

const addDays = (day: Date, days: number) =>
	new Date(day.getTime() + days * 86_400_000).toISOString().slice(0, 10);

/** The application details of the demo installer at `index`, relative to the seeding date. */
export function demoInstallerDetails(index: number, today: Date) {
	const installer = DEMO_INSTALLERS[index];
	if (!installer) throw new Error(`No demo installer ${index}`);
	return {
		contactName: installer.displayName,
		phone: `04${String(10_000_000 + index * 1_234_567).slice(0, 8)}`,
		abn: demoAbn(index + 1),
		// Two sole traders under the GST turnover threshold, not registered: their quotes show no GST.
		gstRegistered: !NOT_GST_REGISTERED.includes(index),
		yearsInTrade: 2 + ((index * 5) % 19),
		skills: SKILL_SETS[index] ?? ['parking-mode'],
		workshopAddress: installer.workshop ? `${10 + index * 3} Demo Lane, ${installer.suburb}` : null,
		travelFeeCentsPerKm: installer.mobile ? 100 + (index % 3) * 50 : 0,
		freeRadiusKm: installer.mobile ? 10 : 0,
		insurer: INSURERS[index % INSURERS.length] ?? INSURERS[0],
		policyNumber: `PL-${String(400_000 + index * 7919)}`,
		// $20M for most, $10M (the default minimum) for a few.
		coverCents: index % 4 === 3 ? 10_000_000_00 : 20_000_000_00,
		// Well past the 30-day reminder, so a fresh demo sends no reminders on its first morning.
		insuranceExpiresOn: addDays(today, 120 + index * 20)
	};
}

/** Weekly hours of the demo installers: weekdays 08:00–17:00, every third one Saturdays too. */
export function demoWeeklyHours(index: number) {
	const weekdays = [1, 2, 3, 4, 5].map((weekday) => ({
		weekday,
		startMinute: 8 * 60,
		endMinute: 17 * 60
	}));
	return index % 3 === 0
		? [...weekdays, { weekday: 6, startMinute: 9 * 60, endMinute: 13 * 60 }]
		: weekdays;
}

/**
 * The documents an application needs before it can be sent (and an admin can approve it): an
 * insurance certificate and photo ID (src/lib/people/vetting.ts, missingParts and approvalProblems).
 * The rows name objects under `demo/`; seed/documents.ts generates the files and stores them.
 * @param sizes the generated files' sizes in bytes
 */
export function demoVettingDocuments(
	installerId: string,
	sizes: { insurance: number; photoId: number }
) {
	return [
		{
			kind: 'insurance' as const,
			objectKey: `demo/installer-documents/${installerId}/insurance-certificate.pdf`,
			contentType: 'application/pdf',
			bytes: sizes.insurance,
			originalName: 'insurance-certificate.pdf'
		},
		{
			kind: 'photo-id' as const,
			objectKey: `demo/installer-documents/${installerId}/photo-id.jpg`,
			contentType: 'image/jpeg',
			bytes: sizes.photoId,
			originalName: 'photo-id.jpg'
		}
	];
}
