/**
 * What a posted job stores besides its request: the one writer of a posted job's columns, used by
 * posting, the demo seed and the tests alike. Pure.
 */
import { computeScope, type JobRequestInput, type ScopeSheet } from '../scope';
import { parkingSummary } from '../scope/parking';
import type { Market } from '../scope/price';
import { requiredSkills } from './matching';

/** The name a job goes by before its car is known (and in e-mails about it). */
export const UNTITLED_JOB = 'Dash camera job';

/**
 * A job's title: year, make and model as the owner entered them, or {@link UNTITLED_JOB}.
 * @param car the request or draft (any of the three may be missing in a draft)
 */
export function jobTitle(car: { year?: unknown; make?: unknown; model?: unknown } | null): string {
	const parts = [car?.year, car?.make, car?.model]
		.filter((p): p is string | number => typeof p === 'string' || typeof p === 'number')
		.map((p) => String(p).trim())
		.filter(Boolean);
	return parts.length > 0 ? parts.join(' ') : UNTITLED_JOB;
}

/** A stored title, or {@link UNTITLED_JOB} when there is none yet. */
export const titleOrUntitled = (title: string | null | undefined) => title ?? UNTITLED_JOB;

/**
 * The job board's one line about a scope sheet: labour time, parts, rear cable run, parking budget.
 * @param scope the stored scope sheet
 */
export function scopeSummary(scope: ScopeSheet): string {
	const parts = scope.parts.reduce((n, p) => n + p.quantity, 0);
	const rear = scope.rearCable ? `, rear cable ${String(scope.rearCable.maxMetres)} m` : '';
	const parking = scope.parking ? `, ${parkingSummary(scope.parking)}` : '';
	return `${String(scope.labour.minMinutes)}–${String(scope.labour.maxMinutes)} min, ${String(parts)} parts${rear}${parking}`;
}

/**
 * The columns a job gets when it is posted: the validated request, its scope sheet, the title,
 * the board's filter columns (with the skills it needs and the scope summary, so the board reads
 * neither the request nor the scope) and the price guide.
 * @param request the whole, validated request
 * @param fitMinutes minutes of similar reported fits, for the labour calibration
 */
export function postedJobColumns(
	request: JobRequestInput,
	market?: Market,
	fitMinutes: readonly number[] = []
) {
	const scope = computeScope(request, market, fitMinutes);
	return {
		request,
		scope,
		title: jobTitle(request),
		bodyStyle: request.bodyStyle,
		cameras: request.cameras,
		power: request.power,
		requiredSkills: requiredSkills(request),
		scopeSummary: scopeSummary(scope),
		priceLowCents: scope.price.totalIncGst.min,
		priceHighCents: scope.price.totalIncGst.max
	};
}
