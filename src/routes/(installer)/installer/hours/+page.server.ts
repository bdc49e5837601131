import { fail } from '@sveltejs/kit';
import { message, setError, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { isCalendarDate } from '$lib/forms/fields';
import { blockedDateSchema, HOURS_FORM_ORDER, weeklyHoursSchema } from '$lib/forms/vetting';
import { readFormData } from '$lib/server/http/form-data';
import { requireRole } from '$lib/server/http/guards';
import {
	blockDate,
	getWeeklyHours,
	listBlockedDates,
	saveWeeklyHours,
	unblockDate
} from '$lib/server/work/diary';
import { getInstallerProfile } from '$lib/server/people/installers';
import { listUpcomingFits } from '$lib/server/work/installer-day';
import { refusalMessage } from '$lib/server/http/respond';
import { fitRow } from '$lib/work/day-rows';
import { validateWeeklyHours, type Weekday, type WeeklyHours } from '$lib/work/schedule';
import { localDate } from '$lib/people/vetting';
import type { Actions, PageServerLoad } from './$types';
import { readForm } from '$lib/server/http/read-form';

/** Booked fits the hours page lists before its link to all of them. */
const BOOKED_SHOWN = 10;

export const load: PageServerLoad = async () => {
	const installer = requireRole('installer');
	const now = new Date();
	const [p, hours, blocked, fits] = await Promise.all([
		getInstallerProfile(installer.id),
		getWeeklyHours(installer.id),
		listBlockedDates(installer.id),
		listUpcomingFits(installer.id, { limit: BOOKED_SHOWN }, now)
	]);
	const start = HOURS_FORM_ORDER.map((d) => hours.find((h) => h.weekday === d)?.start ?? '08:00');
	const end = HOURS_FORM_ORDER.map((d) => hours.find((h) => h.weekday === d)?.end ?? '17:00');
	const days = [...new Set(hours.map((h) => h.weekday))];
	const [hoursForm, blockForm] = await Promise.all([
		superValidate({ days, start, end }, zod4(weeklyHoursSchema), { errors: false }),
		superValidate(zod4(blockedDateSchema))
	]);
	const timeZone = p?.timeZone ?? 'Australia/Adelaide';
	return {
		hoursForm,
		blockForm,
		blocked,
		booked: { rows: fits.rows.map((f) => fitRow(f, fits.timeZone, now)), more: fits.more },
		hasProfile: p !== null,
		timeZone,
		today: localDate(new Date(), timeZone)
	};
};

export const actions = {
	saveHours: async ({ request }) => {
		const installer = requireRole('installer');
		const form = await readForm(request, zod4(weeklyHoursSchema));
		// readForm takes a file posted where a time belongs out of a refused form.
		if (!form.valid) return fail(400, { hoursForm: form });
		if (!(await getInstallerProfile(installer.id))) {
			return message(form, 'Save your application details first.', { status: 400 });
		}
		const row = (d: number) => HOURS_FORM_ORDER.indexOf(d as Weekday);
		const hours: WeeklyHours = [...new Set(form.data.days)].sort().map((d) => ({
			weekday: d as Weekday,
			start: form.data.start[row(d)] ?? '',
			end: form.data.end[row(d)] ?? ''
		}));
		const problems = validateWeeklyHours(hours);
		if (problems.length > 0) return setError(form, '', problems.join(' '));
		await saveWeeklyHours(installer.id, hours);
		return message(form, 'Working hours saved.');
	},
	block: async ({ request }) => {
		const installer = requireRole('installer');
		const form = await readForm(request, zod4(blockedDateSchema));
		if (!form.valid) return fail(400, { blockForm: form });
		const p = await getInstallerProfile(installer.id);
		if (!p) return message(form, 'Save your application details first.', { status: 400 });
		if (form.data.day < localDate(new Date(), p.timeZone)) {
			return setError(form, 'day', 'Choose today or a later date.');
		}
		const blocked = await blockDate(
			installer.id,
			form.data.day,
			form.data.note || null,
			p.timeZone
		);
		if (!blocked.ok) return refusalMessage(form, blocked);
		return message(form, 'Date blocked.');
	},
	unblock: async ({ request }) => {
		const installer = requireRole('installer');
		const day = String((await readFormData(request))?.get('day') ?? '');
		if (!isCalendarDate(day)) return fail(400, { unblockProblem: 'Unknown date.' });
		await unblockDate(installer.id, day);
		return { unblocked: day };
	}
} satisfies Actions;
