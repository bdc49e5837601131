/**
 * Connected accounts the payments fake holds from its first start, already onboarded (details
 * submitted, payouts enabled). The demo seed gives its vetted installers these ids, so the demo
 * obeys the product's rule that only installers with payouts enabled quote, and a release of held
 * funds in the demo reaches an account the fake knows. Invented ids, for the demo only.
 */
export const DEMO_CONNECTED_ACCOUNTS: readonly { id: string; email: string }[] = Array.from(
	{ length: 16 },
	(_, i) => ({
		id: `acct_1TaplineDemo${String(i + 1).padStart(2, '0')}`,
		email: `demo-payouts-${i + 1}@tapline.test`
	})
);
