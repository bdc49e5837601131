/**
 * In-app notices: what happened to someone's bookings and payments, shown on their home page.
 * Written in the transaction of the change they report (payments.ts); read here.
 */
import { desc, eq } from 'drizzle-orm';
import { db } from './db';
import { notice } from './db/schema';

/** Someone's latest notices, newest first. */
export async function listNotices(userId: string, limit = 5) {
	return db
		.select({ id: notice.id, text: notice.text, link: notice.link, createdAt: notice.createdAt })
		.from(notice)
		.where(eq(notice.userId, userId))
		.orderBy(desc(notice.createdAt))
		.limit(limit);
}
