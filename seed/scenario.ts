/**
 * The demo scenario: Adelaide, South Australia. Every person and business here is invented;
 * suburbs, postcodes and their coordinates are real (approximate centres).
 */
import { ADELAIDE_SUBURBS } from '../local-fakes/data/adelaide-suburbs';

export const DEMO_PASSWORD = 'tapline-demo-2026';

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
