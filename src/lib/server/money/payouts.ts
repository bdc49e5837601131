/**
 * Installers' payouts set-up: a connected account (Express) at the payment provider, onboarded on
 * the provider's own hosted pages. Quoting needs `payouts_enabled`, which the provider's
 * `account.updated` event (and the installer's "check again") copies from the account.
 */
import { eq } from 'drizzle-orm';
import { db } from '../db';
import { installerProfile, user } from '../db/schema';
import { appUrl } from '../mail/app-url';
import { refuse, type Refusal } from '../refusal';
import { isProviderOutage, stripe } from './stripe';

/** Where an installer's payouts stand, for their page. */
export async function getPayoutSetup(installerId: string) {
	const [row] = await db
		.select({
			payoutAccountId: installerProfile.payoutAccountId,
			payoutsEnabled: installerProfile.payoutsEnabled
		})
		.from(installerProfile)
		.where(eq(installerProfile.userId, installerId));
	return row ?? null;
}

const PROVIDER_DOWN =
	'Our payment provider is not answering just now; try again in a minute. Nothing has changed.';

/**
 * Starts (or resumes) onboarding: makes the installer's connected account on first use, then a
 * single-use onboarding link on the provider's pages.
 * @returns the address to send the installer to
 */
export async function startPayoutOnboarding(
	installerId: string
): Promise<{ ok: true; url: string } | Refusal> {
	try {
		return await db.transaction(async (tx) => {
			const [profile] = await tx
				.select({
					payoutAccountId: installerProfile.payoutAccountId,
					email: user.email,
					businessName: installerProfile.businessName
				})
				.from(installerProfile)
				.innerJoin(user, eq(user.id, installerProfile.userId))
				.where(eq(installerProfile.userId, installerId))
				.for('update', { of: installerProfile });
			if (!profile)
				return refuse(409, 'Save your business details first; payouts go to that business.');
			let accountId = profile.payoutAccountId;
			if (!accountId) {
				const account = await stripe().accounts.create(
					{
						type: 'express',
						country: 'AU',
						email: profile.email,
						capabilities: { transfers: { requested: true } },
						business_profile: { name: profile.businessName },
						metadata: { installer_id: installerId }
					},
					{ idempotencyKey: `payout-account-${installerId}` }
				);
				accountId = account.id;
				await tx
					.update(installerProfile)
					.set({ payoutAccountId: accountId })
					.where(eq(installerProfile.userId, installerId));
			}
			const link = await stripe().accountLinks.create({
				account: accountId,
				type: 'account_onboarding',
				return_url: appUrl('/installer/payouts?returned=1'),
				refresh_url: appUrl('/installer/payouts?expired=1')
			});
			return { ok: true as const, url: link.url };
		});
	} catch (err) {
		if (isProviderOutage(err)) return refuse(503, PROVIDER_DOWN);
		throw err;
	}
}

/** Asks the provider for the account as it is now and copies whether payouts are enabled. */
export async function refreshPayoutStatus(
	installerId: string
): Promise<{ ok: true; payoutsEnabled: boolean } | Refusal> {
	const setup = await getPayoutSetup(installerId);
	if (!setup?.payoutAccountId) return refuse(409, 'Set up payouts first.');
	try {
		const account = await stripe().accounts.retrieve(setup.payoutAccountId);
		const payoutsEnabled = account.payouts_enabled === true;
		await db
			.update(installerProfile)
			.set({ payoutsEnabled })
			.where(eq(installerProfile.userId, installerId));
		return { ok: true, payoutsEnabled };
	} catch (err) {
		if (isProviderOutage(err)) return refuse(503, PROVIDER_DOWN);
		throw err;
	}
}
