import { fail, redirect } from '@sveltejs/kit';
import { setError, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { applicationSchema } from '$lib/forms/vetting';
import { GeocoderUnavailable, searchPlaces } from '$lib/server/marketplace/geocoding';
import { requireRole } from '$lib/server/http/guards';
import {
	getInstallerProfile,
	saveApplication,
	type BasePlace
} from '$lib/server/people/installers';
import { INSTALLER_SKILLS, stageOf, type InstallerSkill } from '$lib/people/vetting';
import { refusalMessage } from '$lib/server/http/respond';
import type { Actions, PageServerLoad } from './$types';
import { readForm } from '$lib/server/http/read-form';

const workModeOf = (p: {
	offersMobile: boolean;
	offersWorkshop: boolean;
}): 'mobile' | 'workshop' | 'both' =>
	p.offersMobile && p.offersWorkshop ? 'both' : p.offersWorkshop ? 'workshop' : 'mobile';

export const load: PageServerLoad = async () => {
	const installer = requireRole('installer');
	const p = await getInstallerProfile(installer.id);
	const initial = p
		? {
				businessName: p.businessName,
				contactName: p.contactName ?? '',
				phone: p.phone ?? '',
				abn: p.abn ?? '',
				gstRegistered: p.gstRegistered ? ('yes' as const) : ('no' as const),
				yearsInTrade: p.yearsInTrade ?? 0,
				skills: p.skills.filter((s): s is InstallerSkill =>
					INSTALLER_SKILLS.includes(s as InstallerSkill)
				),
				workMode: workModeOf(p),
				workshopAddress: p.workshopAddress ?? '',
				baseSuburb: p.suburb
			}
		: { contactName: installer.displayName };
	const form = await superValidate(initial, zod4(applicationSchema), { errors: false });
	const stage = p ? stageOf(p) : 'draft';
	return { form, stage };
};

export const actions = {
	default: async ({ request }) => {
		const installer = requireRole('installer');
		const form = await readForm(request, zod4(applicationSchema));
		if (!form.valid) return fail(400, { form });
		const current = await getInstallerProfile(installer.id);
		// Geocode only when the suburb is new, so a pin moved on the service-area map stays put.
		let place: BasePlace | null = null;
		if (!current || current.suburb.toLowerCase() !== form.data.baseSuburb.toLowerCase()) {
			let found;
			try {
				[found] = await searchPlaces(form.data.baseSuburb, 1);
			} catch (err) {
				if (!(err instanceof GeocoderUnavailable)) throw err;
				return setError(
					form,
					'baseSuburb',
					'We could not look the suburb up just now. Try again.',
					{
						status: 503
					}
				);
			}
			if (!found || !/^\d{4}$/.test(found.postcode)) {
				return setError(form, 'baseSuburb', 'We do not know that suburb or postcode.');
			}
			place = {
				suburb: found.suburb,
				postcode: found.postcode,
				latitude: found.lat,
				longitude: found.lng
			};
		}
		const { workMode, gstRegistered, ...rest } = form.data;
		const result = await saveApplication(
			installer.id,
			{
				...rest,
				gstRegistered: gstRegistered === 'yes',
				offersMobile: workMode !== 'workshop',
				offersWorkshop: workMode !== 'mobile',
				workshopAddress: rest.workshopAddress || null
			},
			place
		);
		if (!result.ok) return refusalMessage(form, result);
		redirect(303, '/installer/documents');
	}
} satisfies Actions;
