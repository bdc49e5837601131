// See https://svelte.dev/docs/kit/types#app.d.ts
import type { SessionUser, SessionInfo } from '$lib/server/auth';

declare global {
	namespace App {
		interface Error {
			message: string;
			/** The request failed because the database was away: worth retrying (HTTP 503). */
			retry?: boolean;
		}
		interface Locals {
			user: SessionUser | null;
			session: SessionInfo | null;
			/** Set by handleError when the request failed because the database was away. */
			serviceUnavailable: boolean;
		}
	}
}

export {};
