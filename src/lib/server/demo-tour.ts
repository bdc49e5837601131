import { and, eq, or } from 'drizzle-orm';
import { DEMO_TOUR, DEMO_TOUR_PASSWORD, type DemoTourAccount } from '$lib/demo-tour.js';
import { db } from './db';
import { user } from './db/schema';

/**
 * The demo's first steps (src/lib/demo-tour.js) while every demo account exists with its role;
 * null once the demo is gone (or was never loaded), so a real deployment shows no such list.
 */
export async function demoTourIfLoaded(): Promise<{
	password: string;
	accounts: readonly DemoTourAccount[];
} | null> {
	const found = await db
		.select({ email: user.email })
		.from(user)
		.where(or(...DEMO_TOUR.map((a) => and(eq(user.email, a.email), eq(user.role, a.role)))));
	return found.length === DEMO_TOUR.length
		? { password: DEMO_TOUR_PASSWORD, accounts: DEMO_TOUR }
		: null;
}
