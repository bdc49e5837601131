import { describe, expect, it } from 'vitest';
import { distanceKm, snapToGrid } from '../geo';
import { approximateLocation, matchProblem, requiredSkills, type InstallerReach } from './matching';

describe('requiredSkills', () => {
	it('asks for parking mode and the tailgate run on a front + rear parking-mode hatch', () => {
		// Parking mode needs a permanent supply found and tested; a hatch's rear cable goes
		// through the tailgate grommet (common trade practice).
		expect(
			requiredSkills({ bodyStyle: 'hatchback', cameras: 'front-rear', power: 'hardwired-parking' })
		).toEqual(['parking-mode', 'tailgate-rear']);
	});

	it('needs nothing special for a front camera on the accessory socket', () => {
		expect(requiredSkills({ bodyStyle: 'sedan', cameras: 'front', power: 'socket' })).toEqual([]);
	});

	it('sedans run the rear cable through the parcel shelf, not a tailgate', () => {
		// Sedan rear cable goes through the parcel shelf and C-pillar (common trade practice).
		expect(
			requiredSkills({ bodyStyle: 'sedan', cameras: 'front-rear', power: 'hardwired-switched' })
		).toEqual([]);
	});

	it('vans, OBD power and cabin cameras each need their own skill', () => {
		expect(requiredSkills({ bodyStyle: 'van', cameras: 'front-rear-cabin', power: 'obd' })).toEqual(
			['vans-utes', 'obd-power', 'cabin-camera']
		);
		expect(requiredSkills({ bodyStyle: 'suv', cameras: 'front-rear', power: 'obd' })).toEqual([
			'tailgate-rear',
			'obd-power'
		]);
	});
});

describe('matchProblem', () => {
	const norwood = { lat: -34.9213, lng: 138.6304 };
	const installer: InstallerReach = {
		base: norwood,
		serviceRadiusKm: 10,
		skills: ['parking-mode'],
		offersMobile: true,
		offersWorkshop: false
	};
	const job = {
		location: { lat: -34.95, lng: 138.608 },
		locationMode: 'mobile' as const,
		needs: {
			bodyStyle: 'sedan' as const,
			cameras: 'front' as const,
			power: 'hardwired-parking' as const
		}
	};

	it('matches a nearby job the installer can do', () => {
		expect(matchProblem(job, installer)).toBeNull();
	});

	it('refuses a job outside the circle, one needing a missing skill, and the wrong mode', () => {
		// 0.1° of latitude is about 11.1 km (111.32 km per degree, WGS84 equator figure), beyond 10 km.
		const far = { ...job, location: { lat: norwood.lat - 0.1, lng: norwood.lng } };
		expect(matchProblem(far, installer)?.kind).toBe('outside-area');
		const hatch = {
			...job,
			needs: { ...job.needs, bodyStyle: 'hatchback' as const, cameras: 'front-rear' as const }
		};
		expect(matchProblem(hatch, installer)).toEqual({
			kind: 'skills',
			message: 'This job needs skills you have not listed: rear camera through tailgates.'
		});
		expect(matchProblem({ ...job, locationMode: 'workshop' }, installer)?.kind).toBe('mode');
	});
});

describe('approximateLocation', () => {
	it('is the grid cell centre, the same on every look, within the half-diagonal of the job', () => {
		const jobAt = { lat: -34.9132, lng: 138.6251 };
		const base = { lat: -34.9213, lng: 138.6304 };
		const first = approximateLocation(jobAt, base);
		const again = approximateLocation(jobAt, base);
		expect(again).toEqual(first);
		expect(first.cellId).toBe(snapToGrid(jobAt).cellId);
		// A ~1 km cell's centre is within its half-diagonal, about 0.71 km, of any point in it.
		expect(distanceKm(jobAt, first)).toBeLessThan(0.75);
		// Rounded up to 0.1 km, so the figure shown never sits below the distance that decides.
		expect(first.distanceKm).toBe(Math.ceil(distanceKm(base, first) * 10) / 10);
		expect(first.distanceKm).toBeGreaterThanOrEqual(distanceKm(base, first));
		expect(first.distanceKm - distanceKm(base, first)).toBeLessThan(0.1);
	});
});
