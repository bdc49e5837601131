// The demo's first steps: per demo account, three things worth opening. One list for the start
// command's closing lines (scripts/start.mjs, plain Node) and the landing page, hence plain
// JavaScript. The accounts are the seed's (seed/scenario.ts); the pages are stable paths, each
// showing what the demo seed (seed/story.ts) put there.

/** The password of every demo account (seed/scenario.ts, DEMO_PASSWORD). */
export const DEMO_TOUR_PASSWORD = 'tapline-demo-2026';

/**
 * @typedef {{ label: string, path: string }} DemoTourStop
 * @typedef {{ role: 'owner' | 'installer' | 'admin', email: string, stops: DemoTourStop[] }} DemoTourAccount
 */

/** @type {readonly DemoTourAccount[]} */
export const DEMO_TOUR = [
	{
		role: 'owner',
		email: 'demo.owner@tapline.test',
		stops: [
			{
				label: 'My jobs: three quotes and a message thread, and a booking at every stage',
				path: '/owner'
			},
			{
				label: 'Payments: receipts, with a late-cancellation fee and its refund',
				path: '/owner/payments'
			},
			{ label: 'Post a job and watch its scope sheet fill in', path: '/owner/jobs/new' }
		]
	},
	{
		role: 'installer',
		email: 'demo.installer@tapline.test',
		stops: [
			{ label: 'My day: a fit report due, coming fits, quotes waiting', path: '/installer' },
			{ label: "Calendar: this week's and next week's fits", path: '/installer/calendar' },
			{
				label: 'Payouts: released and pending, a late-cancellation fee, statements',
				path: '/installer/payouts'
			}
		]
	},
	{
		role: 'admin',
		email: 'demo.admin@tapline.test',
		stops: [
			{ label: 'Overview: three months of bookings and money', path: '/admin' },
			{ label: 'Disputes: a problem raised with a photo, to settle', path: '/admin/disputes' },
			{
				label: 'Payments: the ledger reconciled with the payments fake',
				path: '/admin/payments'
			}
		]
	}
];
