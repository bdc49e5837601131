import { fail } from '@sveltejs/kit';
import { message, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { marketSettingsSchema } from '$lib/forms/admin';
import { requireRole } from '$lib/server/http/guards';
import {
	getMarketSettings,
	listSettingChanges,
	updateMarketSettings,
	type MarketSettings
} from '$lib/server/money/settings';
import type { Actions, PageServerLoad } from './$types';
import { readForm } from '$lib/server/http/read-form';

/** The settings as the form shows them (percent and dollars). */
const asForm = (s: MarketSettings) => ({
	feePercent: s.feePercentBasisPoints / 100,
	feeMinimumDollars: s.feeMinimumCents / 100,
	lateCancelFeeDollars: s.lateCancelFeeCents / 100,
	minCoverDollars: Math.round(s.minPublicLiabilityCents / 100),
	confirmationWindowHours: s.confirmationWindowHours,
	labourRateDollars: s.labourRateCentsPerHour / 100,
	reason: ''
});

export const load: PageServerLoad = async () => {
	requireRole('admin');
	const settings = await getMarketSettings();
	const form = await superValidate(asForm(settings), zod4(marketSettingsSchema), { errors: false });
	return { form, changes: await listSettingChanges() };
};

export const actions = {
	default: async ({ request }) => {
		const admin = requireRole('admin');
		const form = await readForm(request, zod4(marketSettingsSchema));
		if (!form.valid) return fail(400, { form });
		const d = form.data;
		const result = await updateMarketSettings(
			admin.id,
			{
				feePercentBasisPoints: Math.round(d.feePercent * 100),
				feeMinimumCents: Math.round(d.feeMinimumDollars * 100),
				lateCancelFeeCents: Math.round(d.lateCancelFeeDollars * 100),
				minPublicLiabilityCents: d.minCoverDollars * 100,
				confirmationWindowHours: d.confirmationWindowHours,
				labourRateCentsPerHour: Math.round(d.labourRateDollars * 100)
			},
			d.reason
		);
		form.data.reason = '';
		return message(
			form,
			result.changed.length === 0
				? 'Nothing changed.'
				: `Saved: ${String(result.changed.length)} setting${result.changed.length === 1 ? '' : 's'} changed. New bookings, releases, fit reports, scope sheets and vetting use them from now on.`
		);
	}
} satisfies Actions;
