/**
 * Installers' own records: the application, insurance details, service area, the status page,
 * submitting for vetting and the public profile.
 */
import { and, count, desc, eq, gt, inArray, isNull } from 'drizzle-orm';
import {
	isProfilePublic,
	missingParts,
	nextStatus,
	stageOf,
	type DocumentViewer,
	type VettingStage
} from '$lib/people/vetting';
import { unconfirmedEmail } from './confirmed-email';
import { db, type Tx } from '../db';
import {
	installerHours,
	installerProfile,
	user,
	vettingEvent,
	type InstallerProfile
} from '../db/schema';
import { documentKinds, listInstallerDocuments } from './documents';
import { withMail } from '../mail/outbox';
import { refuse, type Refusal } from '../refusal';
import { lockProfile, mailData, recordEvent, type VettingOutcome } from './vetting';

/** A suburb and the point the installer works from, as the geocoder or the map gave it. */
export interface BasePlace {
	suburb: string;
	postcode: string;
	latitude: number;
	longitude: number;
}

// ——— Installer side ———

/** The application as the installer edits it. */
export interface ApplicationInput {
	businessName: string;
	contactName: string;
	phone: string;
	abn: string;
	/** Registered for GST: the installer's quotes carry GST only then. */
	gstRegistered: boolean;
	yearsInTrade: number;
	skills: string[];
	offersMobile: boolean;
	offersWorkshop: boolean;
	workshopAddress: string | null;
}

/** The installer's profile row, or null before the first save. */
export async function getInstallerProfile(installerId: string): Promise<InstallerProfile | null> {
	const [row] = await db
		.select()
		.from(installerProfile)
		.where(eq(installerProfile.userId, installerId));
	return row ?? null;
}

/** Whether the installer is vetted and not paused: who may quote and see open jobs' photos. */
export async function isQuotingInstaller(installerId: string): Promise<boolean> {
	const [row] = await db
		.select({ id: installerProfile.userId })
		.from(installerProfile)
		.where(
			and(
				eq(installerProfile.userId, installerId),
				eq(installerProfile.vettingStatus, 'approved'),
				isNull(installerProfile.pausedReason)
			)
		);
	return Boolean(row);
}

/** Stages in which the installer may change the application itself. */
const EDITABLE_STAGES: readonly VettingStage[] = ['draft', 'waiting_on_installer', 'approved'];

/**
 * Creates the profile on the first save, updates it afterwards. `place` is the geocoded base
 * suburb: required on the first save (the row needs a point), optional later (only when the
 * installer changed the suburb). Once approved, the business name and ABN are what the admin
 * checked and stay as they are.
 */
export async function saveApplication(
	installerId: string,
	input: ApplicationInput,
	place: BasePlace | null
): Promise<{ ok: true } | Refusal> {
	return db.transaction(async (tx) => {
		const [existing] = await tx
			.select({ status: installerProfile.vettingStatus, submittedAt: installerProfile.submittedAt })
			.from(installerProfile)
			.where(eq(installerProfile.userId, installerId))
			.for('update');
		const fields = {
			contactName: input.contactName,
			phone: input.phone,
			// Not locked on approval like the ABN: registration changes as a business grows.
			gstRegistered: input.gstRegistered,
			yearsInTrade: input.yearsInTrade,
			skills: input.skills,
			offersMobile: input.offersMobile,
			offersWorkshop: input.offersWorkshop,
			workshopAddress: input.offersWorkshop ? input.workshopAddress : null,
			...(place
				? {
						suburb: place.suburb,
						postcode: place.postcode,
						latitude: place.latitude,
						longitude: place.longitude
					}
				: {})
		};
		if (!existing) {
			if (!place) {
				return refuse(400, 'Say which suburb or postcode you work from.', {
					fields: { baseSuburb: 'Say which suburb or postcode you work from' }
				});
			}
			await tx.insert(installerProfile).values({
				userId: installerId,
				businessName: input.businessName,
				abn: input.abn,
				...fields,
				suburb: place.suburb,
				postcode: place.postcode,
				latitude: place.latitude,
				longitude: place.longitude
			});
			return { ok: true } as const;
		}
		const stage = stageOf({ vettingStatus: existing.status, submittedAt: existing.submittedAt });
		if (!EDITABLE_STAGES.includes(stage)) {
			return refuse(409, 'Your application is with an admin; it cannot be changed now.');
		}
		await tx
			.update(installerProfile)
			.set({
				...fields,
				...(stage === 'approved' ? {} : { businessName: input.businessName, abn: input.abn }),
				updatedAt: new Date()
			})
			.where(eq(installerProfile.userId, installerId));
		return { ok: true } as const;
	});
}

/** Insurance details as typed from the certificate. */
export interface InsuranceInput {
	insurer: string;
	policyNumber: string;
	coverCents: number;
	expiresOn: string;
}

/**
 * Saves the insurance details. For a vetted installer a change pauses quoting until an admin
 * approves the new certificate: typed details alone must never extend cover nobody has seen.
 */
export async function saveInsuranceDetails(
	installerId: string,
	input: InsuranceInput
): Promise<{ ok: true; paused: boolean } | Refusal> {
	return withMail(async (tx, mail) => {
		const row = await lockProfile(tx, installerId);
		if (!row) return refuse(409, 'Save your application details first.');
		const { profile } = row;
		const stage = stageOf(profile);
		if (stage === 'applied' || stage === 'rejected') {
			return refuse(409, 'Your application is with an admin; it cannot be changed just now.');
		}
		const changed =
			profile.insurer !== input.insurer ||
			profile.policyNumber !== input.policyNumber ||
			profile.coverCents !== input.coverCents ||
			profile.insuranceExpiresOn !== input.expiresOn;
		const pauseNow = changed && stage === 'approved' && profile.pausedReason === null;
		const pausedReason = 'Your new insurance details are waiting for an admin to check them.';
		await tx
			.update(installerProfile)
			.set({
				insurer: input.insurer,
				policyNumber: input.policyNumber,
				coverCents: input.coverCents,
				insuranceExpiresOn: input.expiresOn,
				...(pauseNow ? { pausedReason } : {}),
				updatedAt: new Date()
			})
			.where(eq(installerProfile.userId, installerId));
		if (changed && stage === 'approved') {
			await recordEvent(tx, {
				installerId,
				actorId: installerId,
				action: 'insurance-updated',
				fromStatus: profile.vettingStatus,
				toStatus: profile.vettingStatus,
				reason: `New expiry ${input.expiresOn}`
			});
		}
		if (pauseNow) {
			await mail.send(row.email, {
				template: 'insurance-paused',
				data: { ...mailData(row), reason: pausedReason }
			});
		}
		return { ok: true, paused: pauseNow };
	});
}

/** Service area as set on the map. */
export interface ServiceAreaInput {
	latitude: number;
	longitude: number;
	serviceRadiusKm: number;
	freeRadiusKm: number;
	travelFeeCentsPerKm: number;
	/** The suburb around the new point, when the geocoder knew one. */
	place: BasePlace | null;
}

/** Saves the base point, radius and travel fee; false when there is no profile yet. */
export async function saveServiceArea(
	installerId: string,
	input: ServiceAreaInput,
	now = new Date()
): Promise<{ ok: true } | Refusal> {
	return db.transaction(async (tx) => {
		const row = await lockProfile(tx, installerId);
		if (!row) return refuse(409, 'Fill in the application first.');
		const p = row.profile;
		const moved =
			p.latitude !== input.latitude ||
			p.longitude !== input.longitude ||
			p.serviceRadiusKm !== input.serviceRadiusKm;
		// Each move of a sent application's base or radius is a vetting event, and a few a day is
		// plenty for a real business: more would only serve to probe where jobs are.
		if (moved && p.submittedAt !== null) {
			const [recent] = await tx
				.select({ n: count() })
				.from(vettingEvent)
				.where(
					and(
						eq(vettingEvent.installerId, installerId),
						eq(vettingEvent.action, 'service-area-moved'),
						gt(vettingEvent.createdAt, new Date(now.getTime() - 86_400_000))
					)
				);
			if ((recent?.n ?? 0) >= SERVICE_AREA_MOVES_PER_DAY) {
				return refuse(
					429,
					`You can move your service area ${String(SERVICE_AREA_MOVES_PER_DAY)} times in 24 hours. Try again tomorrow, or ask the admin team.`
				);
			}
			await recordEvent(tx, {
				installerId,
				actorId: installerId,
				action: 'service-area-moved',
				fromStatus: p.vettingStatus,
				toStatus: p.vettingStatus,
				reason: `${input.place?.suburb ?? p.suburb}, ${String(input.serviceRadiusKm)} km`
			});
		}
		await saveServiceAreaRow(tx, installerId, input);
		return { ok: true as const };
	});
}

/** Service-area moves a sent application may make in 24 hours (Tapline's choice). */
export const SERVICE_AREA_MOVES_PER_DAY = 3;

async function saveServiceAreaRow(tx: Tx, installerId: string, input: ServiceAreaInput) {
	await tx
		.update(installerProfile)
		.set({
			latitude: input.latitude,
			longitude: input.longitude,
			serviceRadiusKm: input.serviceRadiusKm,
			freeRadiusKm: Math.min(input.freeRadiusKm, input.serviceRadiusKm),
			travelFeeCentsPerKm: input.travelFeeCentsPerKm,
			...(input.place ? { suburb: input.place.suburb, postcode: input.place.postcode } : {}),
			updatedAt: new Date()
		})
		.where(eq(installerProfile.userId, installerId));
}

/** Everything the installer's status page shows. */
export async function getApplicationStatus(installerId: string) {
	const profile = await getInstallerProfile(installerId);
	const [kinds, [hours], [lastMessage]] = await Promise.all([
		documentKinds(db, installerId),
		db
			.select({ n: count() })
			.from(installerHours)
			.where(eq(installerHours.installerId, installerId)),
		profile
			? db
					.select({
						action: vettingEvent.action,
						reason: vettingEvent.reason,
						at: vettingEvent.createdAt
					})
					.from(vettingEvent)
					.where(
						and(
							eq(vettingEvent.installerId, installerId),
							inArray(vettingEvent.action, ['request-info', 'reject', 'suspend'])
						)
					)
					.orderBy(desc(vettingEvent.createdAt))
					.limit(1)
			: []
	]);
	const missing = missingParts({
		hasProfile: profile !== null,
		abn: profile?.abn ?? null,
		phone: profile?.phone ?? null,
		skills: profile?.skills ?? [],
		insurer: profile?.insurer ?? null,
		insuranceExpiresOn: profile?.insuranceExpiresOn ?? null,
		coverCents: profile?.coverCents ?? null,
		documentKinds: kinds,
		hoursCount: hours?.n ?? 0
	});
	return {
		profile,
		stage: profile ? stageOf(profile) : ('draft' as const),
		missing,
		lastMessage: lastMessage ?? null
	};
}

/**
 * Sends the application (first time, or again after an admin asked for more). Refuses while
 * anything is missing or when the application is not the installer's to send.
 */
export async function submitApplication(installerId: string): Promise<VettingOutcome> {
	const status = await getApplicationStatus(installerId);
	if (!status.profile) return refuse(409, 'Fill in the application first.');
	if (status.missing.length > 0) {
		return refuse(400, `Still missing: ${status.missing.map((m) => m.what).join('; ')}.`);
	}
	return withMail(async (tx, mail) => {
		const row = await lockProfile(tx, installerId);
		if (!row) return refuse(409, 'Fill in the application first.');
		const unconfirmed = await unconfirmedEmail(tx, installerId);
		if (unconfirmed) return unconfirmed;
		const stage = stageOf(row.profile);
		const to = nextStatus(stage, 'submit');
		if (!to) return refuse(409, 'This application has already been sent.');
		await tx
			.update(installerProfile)
			.set({ vettingStatus: to, submittedAt: new Date(), updatedAt: new Date() })
			.where(eq(installerProfile.userId, installerId));
		await recordEvent(tx, {
			installerId,
			actorId: installerId,
			action: 'submit',
			fromStatus: stage === 'draft' ? null : stage,
			toStatus: to
		});
		await mail.send(row.email, {
			template: 'vetting-received',
			data: mailData(row)
		});
		return { ok: true };
	});
}

// ——— Public profile ———

/**
 * What anyone may see of an installer: never the base point, address, contact details or
 * documents other than gallery photos. Only approved installers have a public profile; the
 * installer themself and admins may preview it before then.
 */
export async function getPublicProfile(installerId: string, viewer: DocumentViewer | null) {
	const [row] = await db
		.select({
			id: installerProfile.userId,
			businessName: installerProfile.businessName,
			suburb: installerProfile.suburb,
			skills: installerProfile.skills,
			offersMobile: installerProfile.offersMobile,
			offersWorkshop: installerProfile.offersWorkshop,
			serviceRadiusKm: installerProfile.serviceRadiusKm,
			yearsInTrade: installerProfile.yearsInTrade,
			vettingStatus: installerProfile.vettingStatus,
			pausedReason: installerProfile.pausedReason
		})
		.from(installerProfile)
		.innerJoin(user, eq(user.id, installerProfile.userId))
		// A closed account has no public profile.
		.where(and(eq(installerProfile.userId, installerId), isNull(user.deletedAt)));
	if (!row) return null;
	const mayPreview = viewer?.role === 'admin' || viewer?.id === installerId;
	if (!isProfilePublic(row.vettingStatus) && !mayPreview) return null;
	const gallery = await listInstallerDocuments(installerId, ['gallery']);
	const { pausedReason, vettingStatus, ...shown } = row;
	return {
		...shown,
		vetted: vettingStatus === 'approved' && pausedReason === null,
		gallery: gallery.map((g) => ({ id: g.id, name: g.originalName }))
	};
}
