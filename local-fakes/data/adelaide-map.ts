/**
 * A small hand-made map of the Adelaide area for the tile fake: the coast of Gulf St Vincent, a
 * few main roads and two rivers, as [latitude, longitude] points typed in by hand from memory.
 *
 * APPROXIMATE AND HAND-MADE: each line is a handful of points, off by up to a kilometre or so
 * and straight between them. It is there so a person can tell the sea from the land and find
 * the suburb they live in on a demo map; it is not survey data, and no address, business or
 * route should be read off it. Suburb labels come from `adelaide-suburbs.ts`.
 */

/** A point as [latitude, longitude] in WGS84 degrees. */
export type LatLon = readonly [number, number];

/** A named line drawn on the map. */
export interface MapLine {
	name: string;
	points: readonly LatLon[];
}

/**
 * The gulf's eastern shore from Port Wakefield south past Adelaide's beaches to Cape Jervis,
 * north to south. The Port River and Barker Inlet are left out: the line runs along the
 * Lefevre Peninsula's beaches.
 */
export const EAST_COAST: readonly LatLon[] = [
	[-34.19, 138.15], // Port Wakefield
	[-34.3, 138.19],
	[-34.45, 138.25],
	[-34.57, 138.36],
	[-34.66, 138.45], // Port Gawler
	[-34.7, 138.49],
	[-34.735, 138.5],
	[-34.77, 138.478], // Outer Harbor
	[-34.79, 138.478], // North Haven
	[-34.822, 138.481], // Largs Bay
	[-34.839, 138.475], // Semaphore
	[-34.85, 138.474],
	[-34.9, 138.484], // Grange
	[-34.92, 138.489], // Henley Beach
	[-34.945, 138.5], // West Beach
	[-34.965, 138.508],
	[-34.98, 138.51], // Glenelg
	[-35.0, 138.513],
	[-35.018, 138.516], // Brighton
	[-35.034, 138.518], // Seacliff
	[-35.048, 138.512], // Marino
	[-35.076, 138.497], // Hallett Cove
	[-35.115, 138.472], // O'Sullivan Beach
	[-35.138, 138.466], // Christies Beach
	[-35.15, 138.462], // Port Noarlunga
	[-35.19, 138.465], // Seaford
	[-35.205, 138.468], // Moana
	[-35.235, 138.47], // Maslin Beach
	[-35.262, 138.455], // Port Willunga
	[-35.28, 138.445], // Aldinga Beach
	[-35.34, 138.445], // Sellicks Beach
	[-35.4, 138.38],
	[-35.45, 138.31], // Normanville
	[-35.53, 138.19],
	[-35.605, 138.095] // Cape Jervis
];

/**
 * The sea: the gulf between the coast above and the Yorke Peninsula, and the water south of the
 * Fleurieu Peninsula, closed off by straight lines well away from the demo area. A polygon,
 * drawn over the land colour.
 */
export const SEA: readonly LatLon[] = [
	...EAST_COAST,
	[-35.64, 138.25],
	[-35.62, 138.42],
	[-35.56, 138.62], // Victor Harbor
	[-35.53, 138.69], // Port Elliot
	[-35.56, 138.88], // Murray Mouth
	[-35.75, 139.1],
	[-36.1, 139.45],
	[-36.6, 139.6],
	[-36.6, 136.4],
	[-35.3, 136.4],
	[-35.3, 136.88], // Cape Spencer
	[-35.24, 137.0],
	[-35.2, 137.4],
	[-35.16, 137.68], // Troubridge Point
	[-35.09, 137.75], // Edithburgh
	[-34.91, 137.8], // Stansbury
	[-34.78, 137.86], // Port Vincent
	[-34.57, 137.88], // Pine Point
	[-34.42, 137.92], // Ardrossan
	[-34.22, 138.02], // Port Clinton
	[-34.15, 138.1]
];

/** Kangaroo Island, drawn as land over the sea polygon. */
export const ISLANDS: readonly (readonly LatLon[])[] = [
	[
		[-35.72, 138.12],
		[-35.72, 137.94], // Penneshaw
		[-35.65, 137.64], // Kingscote
		[-35.58, 137.2],
		[-35.6, 136.8],
		[-35.75, 136.55],
		[-36.05, 136.7],
		[-36.05, 137.4],
		[-35.95, 137.7],
		[-35.84, 138.13] // Cape Willoughby
	]
];

/** Rivers, drawn as thin blue lines. */
export const RIVERS: readonly MapLine[] = [
	{
		name: 'River Torrens',
		points: [
			[-34.85, 138.72],
			[-34.875, 138.68],
			[-34.885, 138.64],
			[-34.9, 138.615],
			[-34.915, 138.6],
			[-34.92, 138.58],
			[-34.915, 138.56],
			[-34.925, 138.53],
			[-34.936, 138.496] // Breakout Creek outlet
		]
	},
	{
		name: 'Port River',
		points: [
			[-34.86, 138.51],
			[-34.845, 138.5],
			[-34.82, 138.5],
			[-34.79, 138.495],
			[-34.772, 138.49]
		]
	}
];

/** Main roads, drawn as plain lines without names. */
export const MAIN_ROADS: readonly MapLine[] = [
	{
		name: 'Main North Road',
		points: [
			[-34.905, 138.598],
			[-34.86, 138.603],
			[-34.845, 138.605],
			[-34.79, 138.63],
			[-34.76, 138.645],
			[-34.715, 138.67],
			[-34.68, 138.685],
			[-34.6, 138.745]
		]
	},
	{
		name: 'Port Wakefield Road',
		points: [
			[-34.845, 138.601],
			[-34.8, 138.595],
			[-34.74, 138.58],
			[-34.662, 138.56],
			[-34.55, 138.47],
			[-34.4, 138.3],
			[-34.19, 138.16]
		]
	},
	{
		name: 'Port Road',
		points: [
			[-34.921, 138.585],
			[-34.907, 138.568],
			[-34.88, 138.54],
			[-34.865, 138.525],
			[-34.848, 138.505]
		]
	},
	{
		name: 'Anzac Highway',
		points: [
			[-34.938, 138.588],
			[-34.955, 138.56],
			[-34.97, 138.535],
			[-34.978, 138.516]
		]
	},
	{
		name: 'South Road',
		points: [
			[-34.86, 138.575],
			[-34.895, 138.565],
			[-34.925, 138.57],
			[-34.95, 138.575],
			[-34.98, 138.573],
			[-35.03, 138.565]
		]
	},
	{
		name: 'Main South Road',
		points: [
			[-35.03, 138.565],
			[-35.095, 138.535],
			[-35.13, 138.525],
			[-35.18, 138.5],
			[-35.25, 138.49],
			[-35.33, 138.47],
			[-35.4, 138.42],
			[-35.45, 138.33]
		]
	},
	{
		name: 'Southern Expressway',
		points: [
			[-35.035, 138.57],
			[-35.08, 138.56],
			[-35.14, 138.505]
		]
	},
	{
		name: 'South Eastern Freeway',
		points: [
			[-34.96, 138.65],
			[-34.995, 138.705],
			[-35.005, 138.72],
			[-35.03, 138.8],
			[-35.06, 138.855]
		]
	},
	{
		name: 'Grand Junction Road',
		points: [
			[-34.85, 138.51],
			[-34.855, 138.56],
			[-34.855, 138.6],
			[-34.855, 138.67],
			[-34.85, 138.695]
		]
	},
	{
		name: 'North East Road',
		points: [
			[-34.895, 138.615],
			[-34.875, 138.64],
			[-34.85, 138.665],
			[-34.835, 138.685],
			[-34.815, 138.72]
		]
	},
	{
		name: 'Greenhill Road',
		points: [
			[-34.94, 138.57],
			[-34.94, 138.64]
		]
	},
	{
		name: 'Magill Road',
		points: [
			[-34.918, 138.61],
			[-34.912, 138.675]
		]
	},
	{
		name: 'Portrush Road',
		points: [
			[-34.88, 138.625],
			[-34.96, 138.645]
		]
	}
];

/** Suburbs labelled from zoom 8, before the rest: the city and the main regional centres. */
export const MAJOR_PLACES: readonly string[] = [
	'Adelaide',
	'Port Adelaide',
	'Glenelg',
	'Elizabeth',
	'Gawler',
	'Modbury',
	'Noarlunga Centre',
	'Mount Barker',
	'Aldinga Beach',
	'Salisbury',
	'Marion'
];
