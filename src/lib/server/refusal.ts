/**
 * The one shape in which a domain module says no: an HTTP status a page should answer with, a
 * message a person understands, and optionally the fields at fault. Domain modules return it
 * (they never import `@sveltejs/kit`); `$lib/server/http/respond.ts` turns it into `error()` or a form
 * message.
 */

export type RefusalStatus = 400 | 401 | 403 | 404 | 409 | 429 | 502 | 503;

export interface Refusal {
	ok: false;
	status: RefusalStatus;
	message: string;
	/** Further problems, e.g. every slot that is wrong, after the first in `message`. */
	problems?: string[];
	/** Messages for named form fields. */
	fields?: Record<string, string>;
}

/** A refusal with its status and message. */
export const refuse = (
	status: RefusalStatus,
	message: string,
	more: { problems?: string[]; fields?: Record<string, string> } = {}
): Refusal => ({ ok: false, status, message, ...more });

/** Whether a domain result is a refusal. */
export const isRefusal = (value: unknown): value is Refusal =>
	typeof value === 'object' &&
	value !== null &&
	(value as { ok?: unknown }).ok === false &&
	typeof (value as { status?: unknown }).status === 'number';

/** Messages several modules give, written once. */
export const NOT_YOUR_JOB = 'There is no such job among yours.';
export const NO_SUCH_BOOKING = 'There is no such booking.';
