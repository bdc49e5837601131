import { eq } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { db } from '$lib/server/db';
import { installerHours, installerProfile, user, vettingEvent } from '$lib/server/db/schema';
import { canQuote, localDate } from '$lib/people/vetting';
import { seedDemo } from '../../seed';
import { startDemoWorld } from './demo-world';

let stop: () => Promise<void>;
beforeAll(async () => {
	stop = await startDemoWorld();
});
afterAll(() => stop());

/**
 * The ABN check written out again, independently of $lib/people/abn (Australian Business Register,
 * "ABN format": subtract 1 from the first digit, weight by 10, 1, 3, 5 … 19, sum divisible by 89).
 */
function passesAbnCheck(abn: string) {
	const weights = [10, 1, 3, 5, 7, 9, 11, 13, 15, 17, 19];
	const digits = abn.split('').map(Number);
	if (digits.length !== 11 || digits.some(Number.isNaN)) return false;
	digits[0] = (digits[0] ?? 0) - 1;
	return digits.reduce((sum, d, i) => sum + d * (weights[i] ?? 0), 0) % 89 === 0;
}

describe('demo installers', () => {
	it('have valid ABNs, skills, hours, current insurance and a trail matching their standing', async () => {
		expect(await seedDemo(process.env.DATABASE_URL as string)).toBe(true);
		expect(passesAbnCheck('51824753556')).toBe(true); // the often-quoted example (from memory)
		expect(passesAbnCheck('51824753557')).toBe(false);
		const today = localDate(new Date(), 'Australia/Adelaide');
		const rows = await db
			.select({ profile: installerProfile, email: user.email })
			.from(installerProfile)
			.innerJoin(user, eq(user.id, installerProfile.userId));
		expect(rows).toHaveLength(12);
		expect(new Set(rows.map((r) => r.profile.abn)).size).toBe(12);
		for (const { profile } of rows) {
			expect(passesAbnCheck(profile.abn ?? ''), profile.businessName).toBe(true);
			expect(profile.skills.length).toBeGreaterThan(0);
			expect((profile.insuranceExpiresOn ?? '') > today).toBe(true);
			expect(profile.coverCents).toBeGreaterThanOrEqual(10_000_000_00);
			expect(profile.submittedAt).toBeInstanceOf(Date);
			const hours = await db
				.select()
				.from(installerHours)
				.where(eq(installerHours.installerId, profile.userId));
			expect(hours.length).toBeGreaterThanOrEqual(5);
			const trail = await db
				.select({ action: vettingEvent.action, to: vettingEvent.toStatus })
				.from(vettingEvent)
				.where(eq(vettingEvent.installerId, profile.userId))
				.orderBy(vettingEvent.createdAt);
			expect(trail[0]?.action).toBe('submit');
			expect(trail.at(-1)?.to).toBe(profile.vettingStatus);
		}
		const demo = rows.find((r) => r.email === 'demo.installer@tapline.test');
		expect(demo?.profile.vettingStatus).toBe('approved');
		expect(demo && canQuote(demo.profile)).toBe(true);
	});
});
