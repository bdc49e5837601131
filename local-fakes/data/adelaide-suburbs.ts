/**
 * Adelaide-area suburbs for the demo market: real names and postcodes, centre points
 * approximate (to roughly a kilometre), from memory. Good enough to place demo jobs and
 * installers on a map; not a gazetteer.
 */

/** One suburb with its postcode and an approximate centre point (WGS84 degrees). */
export interface Suburb {
	name: string;
	postcode: string;
	lat: number;
	lon: number;
}

/** The state every suburb here sits in. */
export const SUBURB_STATE = 'South Australia';

/** ISO 3166-1 alpha-2 code for Australia. */
export const SUBURB_COUNTRY_CODE = 'au';

// Postcodes from memory (Australia Post assignments); coordinates from memory, rounded.
export const ADELAIDE_SUBURBS: readonly Suburb[] = [
	{ name: 'Adelaide', postcode: '5000', lat: -34.9285, lon: 138.6007 },
	{ name: 'North Adelaide', postcode: '5006', lat: -34.9065, lon: 138.593 },
	{ name: 'Hindmarsh', postcode: '5007', lat: -34.907, lon: 138.569 },
	{ name: 'Woodville', postcode: '5011', lat: -34.877, lon: 138.541 },
	{ name: 'Port Adelaide', postcode: '5015', lat: -34.8467, lon: 138.503 },
	{ name: 'Semaphore', postcode: '5019', lat: -34.839, lon: 138.482 },
	{ name: 'West Lakes', postcode: '5021', lat: -34.873, lon: 138.494 },
	{ name: 'Henley Beach', postcode: '5022', lat: -34.92, lon: 138.494 },
	{ name: 'Findon', postcode: '5023', lat: -34.9, lon: 138.533 },
	{ name: 'Thebarton', postcode: '5031', lat: -34.917, lon: 138.57 },
	{ name: 'Goodwood', postcode: '5034', lat: -34.951, lon: 138.586 },
	{ name: 'Marion', postcode: '5043', lat: -35.01, lon: 138.556 },
	{ name: 'Glenelg', postcode: '5045', lat: -34.9799, lon: 138.5156 },
	{ name: 'Glenelg North', postcode: '5045', lat: -34.968, lon: 138.517 },
	{ name: 'Brighton', postcode: '5048', lat: -35.018, lon: 138.523 },
	{ name: 'Blackwood', postcode: '5051', lat: -35.021, lon: 138.614 },
	{ name: 'Unley', postcode: '5061', lat: -34.95, lon: 138.608 },
	{ name: 'Mitcham', postcode: '5062', lat: -34.978, lon: 138.622 },
	{ name: 'Glen Osmond', postcode: '5064', lat: -34.96, lon: 138.648 },
	{ name: 'Glenside', postcode: '5065', lat: -34.943, lon: 138.632 },
	{ name: 'Burnside', postcode: '5066', lat: -34.94, lon: 138.65 },
	{ name: 'Norwood', postcode: '5067', lat: -34.921, lon: 138.63 },
	{ name: 'Kensington', postcode: '5068', lat: -34.924, lon: 138.647 },
	{ name: 'Magill', postcode: '5072', lat: -34.91, lon: 138.676 },
	{ name: 'Campbelltown', postcode: '5074', lat: -34.884, lon: 138.667 },
	{ name: 'Paradise', postcode: '5075', lat: -34.874, lon: 138.669 },
	{ name: 'Walkerville', postcode: '5081', lat: -34.894, lon: 138.616 },
	{ name: 'Prospect', postcode: '5082', lat: -34.883, lon: 138.594 },
	{ name: 'Enfield', postcode: '5085', lat: -34.853, lon: 138.603 },
	{ name: 'Klemzig', postcode: '5087', lat: -34.88, lon: 138.638 },
	{ name: 'Modbury', postcode: '5092', lat: -34.833, lon: 138.683 },
	{ name: 'Mawson Lakes', postcode: '5095', lat: -34.81, lon: 138.61 },
	{ name: 'Parafield Gardens', postcode: '5107', lat: -34.783, lon: 138.613 },
	{ name: 'Salisbury', postcode: '5108', lat: -34.76, lon: 138.64 },
	{ name: 'Elizabeth', postcode: '5112', lat: -34.715, lon: 138.67 },
	{ name: 'Gawler', postcode: '5118', lat: -34.598, lon: 138.745 },
	{ name: 'Golden Grove', postcode: '5125', lat: -34.789, lon: 138.728 },
	{ name: 'Stirling', postcode: '5152', lat: -35.005, lon: 138.717 },
	{ name: 'Hallett Cove', postcode: '5158', lat: -35.079, lon: 138.514 },
	{ name: 'Morphett Vale', postcode: '5162', lat: -35.127, lon: 138.521 },
	{ name: 'Christies Beach', postcode: '5165', lat: -35.138, lon: 138.473 },
	{ name: 'Noarlunga Centre', postcode: '5168', lat: -35.139, lon: 138.496 },
	{ name: 'Seaford', postcode: '5169', lat: -35.19, lon: 138.475 },
	{ name: 'Aldinga Beach', postcode: '5173', lat: -35.278, lon: 138.458 },
	{ name: 'Hahndorf', postcode: '5245', lat: -35.029, lon: 138.81 },
	{ name: 'Mount Barker', postcode: '5251', lat: -35.067, lon: 138.858 }
];
