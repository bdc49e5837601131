/**
 * A process of its own for the kill drill (drills-kill.test.ts): makes one money-moving call,
 * as the app would, against the test database and the payments fake named in the environment,
 * and prints its outcome. The test kills it while the provider's answer is held back.
 * Run as `node --import tsx <this> release|refund <booking id> [cents]` with TSX_TSCONFIG_PATH
 * naming the tsconfig.json beside it (one process, so a SIGKILL reaches the process that calls).
 */
import { pool } from '$lib/server/db';
import { refundHeldFunds, releaseHeldFunds } from '$lib/server/money/payments';

const [what, bookingId, cents] = process.argv.slice(2);
if (!bookingId || (what !== 'release' && what !== 'refund')) {
	throw new Error('usage: money-call.ts release|refund <booking id> [cents]');
}
console.log(`calling ${what}`);
const outcome =
	what === 'release'
		? await releaseHeldFunds(bookingId)
		: await refundHeldFunds(bookingId, Number(cents));
console.log(`outcome ${JSON.stringify(outcome)}`);
await pool.end();
