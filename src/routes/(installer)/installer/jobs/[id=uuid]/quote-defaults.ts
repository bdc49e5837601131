/**
 * What the quote form starts with: the installer's live quote when revising, otherwise the scope
 * sheet's guide prices (GST added) and free times from the installer's diary, preferring the
 * owner's preferred dates.
 */
import { addGst } from '$lib/money/money';
import { candidateSlots, repeatedTimeChoiceOf } from '$lib/work/schedule';
import { formatInZone } from '$lib/time';
import type { InstallerContext, getJobForInstaller } from '$lib/server/marketplace/matching';
import { loadDiary } from '$lib/server/work/diary';
import type { QuoteForm } from './quote-form';

type FoundJob = NonNullable<Awaited<ReturnType<typeof getJobForInstaller>>>;

const QUOTE_VALID_DAYS = 14;

export async function quoteFormDefaults(
	found: FoundJob,
	ctx: InstallerContext
): Promise<QuoteForm> {
	const now = new Date();
	const zone = ctx.timeZone;
	const local = (d: Date, pattern: string) => formatInZone(d, zone, pattern);
	const q = found.myQuote;
	if (q) {
		const parts = q.lines.filter((l) => l.kind === 'part');
		const camera = q.lines.find((l) => l.kind === 'camera');
		const slots = q.slots.map((s) => new Date(s.start));
		return {
			labourDollars: q.labourCents / 100,
			partDollars: parts.map((l) => l.unitCents / 100),
			cameraSupplied: q.cameraSupplied,
			cameraDollars: (camera?.unitCents ?? 0) / 100,
			warrantyMonths: q.warrantyMonths,
			durationMinutes: q.slots[0]
				? Math.round((Date.parse(q.slots[0].end) - Date.parse(q.slots[0].start)) / 60_000)
				: 120,
			slotDate: [0, 1, 2].map((i) => (slots[i] ? local(slots[i], 'yyyy-MM-dd') : '')),
			slotTime: [0, 1, 2].map((i) => (slots[i] ? local(slots[i], 'HH:mm') : '')),
			slotRepeat: [0, 1, 2].map((i) => (slots[i] ? repeatedTimeChoiceOf(slots[i], zone) : '')),
			message: q.message ?? '',
			expiresOn: q.expiresAt
				? local(new Date(q.expiresAt.getTime() - 1), 'yyyy-MM-dd')
				: local(new Date(now.getTime() + QUOTE_VALID_DAYS * 86_400_000), 'yyyy-MM-dd')
		};
	}
	const scope = found.scope;
	const price = scope?.price;
	const labourEx = price ? Math.round((price.labourExGst.min + price.labourExGst.max) / 2) : 0;
	const duration = scope ? Math.max(60, Math.ceil(scope.labour.maxMinutes / 30) * 30) : 120;
	const diary = await loadDiary(ctx.id, now);
	const preferred = new Set(found.preferredWindows.map((w) => w.date));
	const free = candidateSlots({
		hours: diary.hours,
		blocked: diary.blocked,
		bookings: diary.bookings,
		timeZone: zone,
		from: new Date(now.getTime() + 86_400_000),
		days: 21,
		durationMinutes: duration,
		stepMinutes: 60
	});
	const byDay = new Map<string, Date>();
	for (const slot of free) {
		const day = local(slot.start, 'yyyy-MM-dd');
		if (!byDay.has(day)) byDay.set(day, slot.start);
	}
	const days = [...byDay.entries()].sort(
		([a], [b]) => Number(preferred.has(b)) - Number(preferred.has(a)) || a.localeCompare(b)
	);
	const picks = days.slice(0, 3).map(([, start]) => start);
	return {
		labourDollars: addGst(labourEx) / 100,
		partDollars: (price?.parts ?? [])
			.filter((p) => p.code !== 'camera')
			.map((p) => addGst(p.unitCents) / 100),
		cameraSupplied: found.request?.cameraSupply === 'installer',
		cameraDollars: (price?.cameraIncGst ?? 0) / 100,
		warrantyMonths: 12,
		durationMinutes: duration,
		slotDate: [0, 1, 2].map((i) => (picks[i] ? local(picks[i], 'yyyy-MM-dd') : '')),
		slotTime: [0, 1, 2].map((i) => (picks[i] ? local(picks[i], 'HH:mm') : '')),
		slotRepeat: [0, 1, 2].map((i) => (picks[i] ? repeatedTimeChoiceOf(picks[i], zone) : '')),
		message: '',
		expiresOn: local(new Date(now.getTime() + QUOTE_VALID_DAYS * 86_400_000), 'yyyy-MM-dd')
	};
}
