import { fail } from '@sveltejs/kit';
import { setError, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { chosenWindows, placeStepSchema } from '$lib/forms/job';
import { GeocoderUnavailable, reversePlace, searchPlaces } from '$lib/server/marketplace/geocoding';
import { checkPreferredDates, saveJobStep } from '$lib/server/marketplace/jobs';
import { finishStep, loadEditableJob } from '../editable-job';
import type { Actions, PageServerLoad } from './$types';
import { readForm } from '$lib/server/http/read-form';

export const load: PageServerLoad = async ({ params }) => {
	const { job } = await loadEditableJob(params.id);
	return {
		form: await superValidate(job.draft, zod4(placeStepSchema), { errors: false }),
		timeZone: job.timeZone
	};
};

export const actions = {
	default: async ({ request, params }) => {
		const { owner, job } = await loadEditableJob(params.id);
		const form = await readForm(request, zod4(placeStepSchema));
		if (!form.valid) return fail(400, { form });
		const d = form.data;

		const windows = chosenWindows(d);
		const dateProblem = checkPreferredDates(windows, job.timeZone);
		if (dateProblem) return setError(form, 'date1', dateProblem);

		let place;
		try {
			place =
				d.latitude !== undefined && d.longitude !== undefined
					? await reversePlace(d.latitude, d.longitude)
					: ((await searchPlaces(d.place, 1))[0] ?? null);
		} catch (err) {
			if (!(err instanceof GeocoderUnavailable)) throw err;
			return setError(
				form,
				'place',
				'We cannot look places up right now. Please try again in a minute.',
				{ status: 503 }
			);
		}
		if (!place) {
			return setError(
				form,
				'place',
				'We could not find that suburb or postcode. Try the suburb name, e.g. Norwood, or a 4-digit postcode.'
			);
		}
		const lat = d.latitude ?? place.lat;
		const lng = d.longitude ?? place.lng;

		const result = await saveJobStep(
			params.id,
			owner.id,
			'place',
			{ ...d, place: place.suburb, latitude: lat, longitude: lng },
			{
				locationMode: d.locationMode,
				suburb: place.suburb,
				postcode: place.postcode || null,
				latitude: lat,
				longitude: lng,
				addressLine: d.locationMode === 'mobile' ? (d.addressLine ?? null) : null,
				preferredWindows: windows
			}
		);
		return finishStep(result, form, params.id, 'place');
	}
} satisfies Actions;
