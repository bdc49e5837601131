import { json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';

/**
 * The bare JSON route `npm run bench` measures the job board API against: the same server, hooks
 * and session handling, and no work of its own, so the ratios show what the board itself costs.
 */
export const GET: RequestHandler = () => json({ ok: true });
