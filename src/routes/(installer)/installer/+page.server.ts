import { eq } from 'drizzle-orm';
import { db } from '$lib/server/db';
import { installerProfile } from '$lib/server/db/schema';
import { requireRole } from '$lib/server/guards';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async () => {
	const installer = requireRole('installer');
	const [profile] = await db
		.select({
			businessName: installerProfile.businessName,
			suburb: installerProfile.suburb,
			vettingStatus: installerProfile.vettingStatus,
			serviceRadiusKm: installerProfile.serviceRadiusKm
		})
		.from(installerProfile)
		.where(eq(installerProfile.userId, installer.id));
	return { displayName: installer.displayName, profile: profile ?? null };
};
