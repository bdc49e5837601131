/**
 * Which installers a job is offered to. Pure: no I/O, so the job board, the quote form, the server
 * and the tests share one source of truth.
 */
import { distanceKm, shownKm, snapToGrid, withinServiceArea, type LatLng } from '../geo';
import type { JobRequestInput } from '../scope/request';
import { SKILL_LABELS } from '../labels';
import { type InstallerSkill } from '../people/vetting';

/** What the skills check needs to know about a job request. */
export type SkillNeeds = Pick<JobRequestInput, 'bodyStyle' | 'cameras' | 'power'>;

/** Body styles whose rear camera cable goes through a tailgate grommet (common trade practice). */
const TAILGATE_BODIES: ReadonlySet<SkillNeeds['bodyStyle']> = new Set([
	'hatchback',
	'wagon',
	'suv',
	'people-mover'
]);

/**
 * The installer skills a job needs, in the order of INSTALLER_SKILLS. Hard-wired parking mode
 * needs someone who finds and tests a permanent supply; OBD power needs the OBD skill; a rear
 * camera on a tailgated body needs the grommet run; utes and vans need their own skill; a cabin
 * camera needs its own.
 * @param request the job's vehicle, cameras and power
 */
export function requiredSkills(request: SkillNeeds): InstallerSkill[] {
	const needs: InstallerSkill[] = [];
	if (request.power === 'hardwired-parking') needs.push('parking-mode');
	if (request.cameras !== 'front' && TAILGATE_BODIES.has(request.bodyStyle)) {
		needs.push('tailgate-rear');
	}
	if (request.bodyStyle === 'ute' || request.bodyStyle === 'van') needs.push('vans-utes');
	if (request.power === 'obd') needs.push('obd-power');
	if (request.cameras === 'front-rear-cabin') needs.push('cabin-camera');
	return needs;
}

/**
 * The skills a job needs that the installer has not listed; empty when they cover it.
 * @param needed from {@link requiredSkills}
 * @param has the installer's skills
 */
export function missingSkills(needed: readonly InstallerSkill[], has: readonly string[]) {
	return needed.filter((skill) => !has.includes(skill));
}

/** The facts about an installer that decide whether a job is offered to them. */
export interface InstallerReach {
	base: LatLng;
	serviceRadiusKm: number;
	skills: readonly string[];
	offersMobile: boolean;
	offersWorkshop: boolean;
}

/** An installer's profile row as far as reach goes: base point, circle, skills, ways of working. */
export interface ReachFields {
	latitude: number;
	longitude: number;
	serviceRadiusKm: number;
	skills: readonly string[];
	offersMobile: boolean;
	offersWorkshop: boolean;
}

/**
 * The reach of an installer's profile, as {@link matchProblem} reads it.
 * @param profile the installer's profile row (or the fields of it that reach needs)
 */
export function reachOf(profile: ReachFields): InstallerReach {
	return {
		base: { lat: profile.latitude, lng: profile.longitude },
		serviceRadiusKm: profile.serviceRadiusKm,
		skills: profile.skills,
		offersMobile: profile.offersMobile,
		offersWorkshop: profile.offersWorkshop
	};
}

/** The facts about a job that decide who it is offered to. */
export interface JobReach {
	location: LatLng;
	locationMode: 'mobile' | 'workshop' | null;
	needs: SkillNeeds;
}

/** Why a job is not offered to an installer, in words for the installer. */
export type MatchProblem =
	| { kind: 'outside-area'; message: string }
	| { kind: 'skills'; message: string }
	| { kind: 'mode'; message: string };

/**
 * Whether a job is offered to an installer: inside the service circle (great-circle distance,
 * inclusive), skills cover the job, and they work the way it asks (at the owner's place or at a
 * workshop). Vetting and pauses are checked separately, where the profile is read.
 * @returns null when it matches, otherwise the first reason it does not
 */
export function matchProblem(job: JobReach, installer: InstallerReach): MatchProblem | null {
	// Decided from the job's grid-cell centre, never its exact point: otherwise an installer could
	// move their base and radius until a job appears and disappears, and find the owner's house.
	if (!withinServiceArea(snapToGrid(job.location), installer.base, installer.serviceRadiusKm)) {
		return {
			kind: 'outside-area',
			message: `This job is outside your service area of ${String(installer.serviceRadiusKm)} km.`
		};
	}
	const missing = missingSkills(requiredSkills(job.needs), installer.skills);
	if (missing.length > 0) {
		return {
			kind: 'skills',
			message: `This job needs skills you have not listed: ${missing.map((s) => SKILL_LABELS[s].toLowerCase()).join(', ')}.`
		};
	}
	if (job.locationMode === 'mobile' && !installer.offersMobile) {
		return { kind: 'mode', message: "This job is at the owner's place and you fit at a workshop." };
	}
	if (job.locationMode === 'workshop' && !installer.offersWorkshop) {
		return { kind: 'mode', message: 'This job is at a workshop and you fit on the road only.' };
	}
	return null;
}

/**
 * Where an installer is told a job is: the centre of its ~1 km grid cell, and the distance from
 * their base to that centre rounded up to 0.1 km ({@link shownKm}: the figure the decision, the
 * filter and the travel fee agree with). The distance is measured to the cell centre, not
 * to the job, so it cannot be combined with the installer's own base to narrow the cell down.
 * @param job the job's true location
 * @param base the installer's base
 */
export function approximateLocation(job: LatLng, base: LatLng) {
	const snapped = snapToGrid(job);
	return {
		lat: snapped.lat,
		lng: snapped.lng,
		cellId: snapped.cellId,
		distanceKm: shownKm(distanceKm(base, snapped) * 1000)
	};
}
