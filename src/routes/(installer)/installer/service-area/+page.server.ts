import { fail } from '@sveltejs/kit';
import { message, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { serviceAreaSchema } from '$lib/forms/vetting';
import { reversePlace } from '$lib/server/marketplace/geocoding';
import { requireRole } from '$lib/server/http/guards';
import { getInstallerProfile, saveServiceArea } from '$lib/server/people/installers';
import { refusalMessage } from '$lib/server/http/respond';
import type { Actions, PageServerLoad } from './$types';
import { readForm } from '$lib/server/http/read-form';

export const load: PageServerLoad = async () => {
	const installer = requireRole('installer');
	const p = await getInstallerProfile(installer.id);
	const initial = p
		? {
				latitude: p.latitude,
				longitude: p.longitude,
				serviceRadiusKm: p.serviceRadiusKm,
				freeRadiusKm: p.freeRadiusKm,
				travelFeeDollarsPerKm: p.travelFeeCentsPerKm / 100
			}
		: undefined;
	const form = await superValidate(initial, zod4(serviceAreaSchema), { errors: false });
	return {
		form,
		hasProfile: p !== null,
		suburb: p?.suburb ?? null,
		offersMobile: p?.offersMobile ?? true
	};
};

export const actions = {
	default: async ({ request }) => {
		const installer = requireRole('installer');
		const form = await readForm(request, zod4(serviceAreaSchema));
		if (!form.valid) return fail(400, { form });
		const current = await getInstallerProfile(installer.id);
		if (!current) return message(form, 'Save your application details first.', { status: 400 });
		const moved =
			current.latitude !== form.data.latitude || current.longitude !== form.data.longitude;
		// The geocoder being down only means the suburb stays as it was.
		const found = moved
			? await reversePlace(form.data.latitude, form.data.longitude).catch(() => null)
			: null;
		const place =
			found && /^\d{4}$/.test(found.postcode)
				? {
						suburb: found.suburb,
						postcode: found.postcode,
						latitude: form.data.latitude,
						longitude: form.data.longitude
					}
				: null;
		const saved = await saveServiceArea(installer.id, {
			latitude: form.data.latitude,
			longitude: form.data.longitude,
			serviceRadiusKm: form.data.serviceRadiusKm,
			freeRadiusKm: current.offersMobile ? form.data.freeRadiusKm : 0,
			travelFeeCentsPerKm: current.offersMobile
				? Math.round(form.data.travelFeeDollarsPerKm * 100)
				: 0,
			place
		});
		if (!saved.ok) return refusalMessage(form, saved);
		return message(form, `Saved. Your profile shows ${place?.suburb ?? current.suburb}.`);
	}
} satisfies Actions;
