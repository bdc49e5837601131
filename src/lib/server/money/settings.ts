/**
 * The market's settings: Tapline's fee (a percentage with a minimum), the late-cancellation fee
 * paid to the installer, the minimum public liability cover vetting asks for, the owner's
 * confirmation window after a fit report and the labour rate guide the scope sheet prices with.
 * Each starts from the environment (TAPLINE_FEE_PERCENT, TAPLINE_FEE_MINIMUM_CENTS,
 * TAPLINE_LATE_CANCEL_FEE_CENTS, MIN_PUBLIC_LIABILITY_CENTS, TAPLINE_CONFIRMATION_WINDOW_HOURS) or
 * Tapline's default, and an admin may override it in
 * `market_setting`. The payment and vetting maths read them here, inside their own transaction.
 * Every change is one transaction with its `admin_audit` row (before and after).
 */
import { inArray } from 'drizzle-orm';
import { DEFAULT_MIN_PUBLIC_LIABILITY_CENTS } from '$lib/people/vetting';
import { DEFAULT_CONFIRMATION_WINDOW_HOURS } from '$lib/work/lifecycle';
import { ADELAIDE_MARKET, type Market } from '$lib/scope/price';
import type { FeeSettings } from '$lib/money/fees';
import { env } from '$env/dynamic/private';
import { db, type Db, type Tx } from '../db';
import { adminAudit, marketSetting } from '../db/schema';
import { feeSettings, lateFeeCents } from './stripe';

export const MARKET_SETTING_KEYS = [
	'feePercentBasisPoints',
	'feeMinimumCents',
	'lateCancelFeeCents',
	'minPublicLiabilityCents',
	'confirmationWindowHours',
	'labourRateCentsPerHour'
] as const;
export type MarketSettingKey = (typeof MARKET_SETTING_KEYS)[number];
export type MarketSettings = Record<MarketSettingKey, number>;

/** The settings before any admin change: the environment's, else Tapline's defaults. */
export function defaultMarketSettings(): MarketSettings {
	const fee = feeSettings();
	const cover = Number(env.MIN_PUBLIC_LIABILITY_CENTS);
	return {
		feePercentBasisPoints: fee.percentBasisPoints,
		feeMinimumCents: fee.minimumCents,
		lateCancelFeeCents: lateFeeCents(),
		minPublicLiabilityCents:
			Number.isSafeInteger(cover) && cover > 0 ? cover : DEFAULT_MIN_PUBLIC_LIABILITY_CENTS,
		confirmationWindowHours: positiveInt(
			env.TAPLINE_CONFIRMATION_WINDOW_HOURS,
			DEFAULT_CONFIRMATION_WINDOW_HOURS
		),
		labourRateCentsPerHour: ADELAIDE_MARKET.labourRateCentsPerHour
	};
}

function positiveInt(raw: string | undefined, fallback: number): number {
	const n = Number(raw);
	return raw && Number.isSafeInteger(n) && n > 0 ? n : fallback;
}

/** The market the scope sheet prices with: the demo market at the labour rate in force. */
export function scopeMarketOf(s: MarketSettings): Market {
	return { ...ADELAIDE_MARKET, labourRateCentsPerHour: s.labourRateCentsPerHour };
}

/** The settings in force, read in the caller's transaction when given one. */
export async function getMarketSettings(q: Db | Tx = db): Promise<MarketSettings> {
	const rows = await q.select().from(marketSetting);
	const settings = defaultMarketSettings();
	for (const row of rows) {
		if ((MARKET_SETTING_KEYS as readonly string[]).includes(row.key)) {
			settings[row.key as MarketSettingKey] = row.value;
		}
	}
	return settings;
}

/** Tapline's fee as the release maths takes it. */
export const feeOf = (s: MarketSettings): FeeSettings => ({
	percentBasisPoints: s.feePercentBasisPoints,
	minimumCents: s.feeMinimumCents
});

/**
 * Writes the settings that changed and audits them, in one transaction (rows locked, so two
 * admins saving at once are applied in turn and both audited).
 * @returns the keys that changed (none: nothing written)
 */
export async function updateMarketSettings(
	adminId: string,
	next: MarketSettings,
	reason: string,
	now = new Date()
): Promise<{ ok: true; changed: MarketSettingKey[] }> {
	return db.transaction(async (tx) => {
		await tx
			.select()
			.from(marketSetting)
			.where(inArray(marketSetting.key, [...MARKET_SETTING_KEYS]))
			.for('update');
		const before = await getMarketSettings(tx);
		const changed = MARKET_SETTING_KEYS.filter((k) => before[k] !== next[k]);
		if (changed.length === 0) return { ok: true, changed };
		for (const key of changed) {
			await tx
				.insert(marketSetting)
				.values({ key, value: next[key], updatedBy: adminId, updatedAt: now })
				.onConflictDoUpdate({
					target: marketSetting.key,
					set: { value: next[key], updatedBy: adminId, updatedAt: now }
				});
		}
		await tx.insert(adminAudit).values({
			actorId: adminId,
			action: 'settings',
			targetUserId: null,
			before: Object.fromEntries(changed.map((k) => [k, before[k]])),
			after: Object.fromEntries(changed.map((k) => [k, next[k]])),
			reason,
			createdAt: now
		});
		return { ok: true, changed };
	});
}

/** The latest changes to the settings, newest first, with who made them. */
export async function listSettingChanges(limit = 20) {
	return db.query.adminAudit.findMany({
		where: (a, { eq }) => eq(a.action, 'settings'),
		orderBy: (a, { desc }) => [desc(a.createdAt)],
		limit
	});
}
