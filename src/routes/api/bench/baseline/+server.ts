import { error, json } from '@sveltejs/kit';
import { env } from '$env/dynamic/private';
import type { RequestHandler } from './$types';

/**
 * The bare JSON route `npm run bench` measures the job board API against: the same server, hooks
 * and session handling, and no work of its own, so the ratios show what the board itself costs.
 * Served only when the benchmark starts the app (it sets TAPLINE_BENCH=on); elsewhere it is a 404.
 */
export const GET: RequestHandler = () => {
	if (env.TAPLINE_BENCH !== 'on') error(404, 'Not found');
	return json({ ok: true });
};
