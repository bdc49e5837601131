import { describe, expect, it } from 'vitest';
import { installerReviewSchema, ownerReviewSchema, starsNotWhole } from './review';

const posted = (stars: string, fields: string[]) => {
	const data = new FormData();
	for (const field of fields) data.set(field, stars);
	data.set('text', 'A tidy fit, on time and well explained.');
	return data;
};

describe('starsNotWhole', () => {
	const owner = ['workmanship', 'tidiness', 'communication', 'punctuality'];

	it.each(['1', '3', '5'])('accepts the plain digit %s', (stars) => {
		expect(starsNotWhole(posted(stars, owner), ownerReviewSchema)).toEqual([]);
	});

	// The form library reads these with parseInt (1e308 as 1, 3.5 as 3); each must be refused.
	it.each(['1e308', '1e0', '3.5', '1.0', ' 3', '0', '6', '-1', '', '0x3'])(
		'refuses %j for every aspect',
		(stars) => {
			expect(starsNotWhole(posted(stars, owner), ownerReviewSchema)).toEqual(owner);
		}
	);

	it('checks the installer side and a missing body too', () => {
		const installer = ['vehicleReady', 'communication', 'accurateJob'];
		expect(starsNotWhole(posted('1e308', installer), installerReviewSchema)).toEqual(installer);
		expect(starsNotWhole(null, installerReviewSchema)).toEqual(installer);
	});
});
