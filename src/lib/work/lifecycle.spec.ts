import { describe, expect, it } from 'vitest';
import {
	FINAL_STAGES,
	FIT_MOVES,
	FIT_STAGES,
	confirmationDeadline,
	nextStage,
	type FitActor,
	type FitMove
} from './lifecycle';

// The rules are the lifecycle issue's (Tapline's own): a fit report opens a confirmation window;
// the owner confirms or raises a problem inside it; the schedule confirms after it; an admin
// settles a dispute or sends the installer back. The table below is written out by hand, not
// derived from FIT_MOVES, so a change to either shows here.
const LEGAL: [FitMove, string, string, FitActor][] = [
	['file-report', 'to_fit', 'reported', 'installer'],
	['confirm', 'reported', 'accepted', 'owner'],
	['window-closes', 'reported', 'accepted', 'schedule'],
	['raise-problem', 'reported', 'disputed', 'owner'],
	['settle', 'disputed', 'settled', 'admin'],
	['return-visit', 'disputed', 'to_fit', 'admin']
];
const ACTORS: FitActor[] = ['owner', 'installer', 'schedule', 'admin'];
const reportedAt = new Date('2026-12-01T00:00:00Z');
const deadline = confirmationDeadline(reportedAt, 72);
const inside = new Date(deadline.getTime() - 1);
const after = deadline;

const nowFor = (move: FitMove) => (FIT_MOVES[move].window === 'closed' ? after : inside);

describe('nextStage', () => {
	it('allows every legal move, to the stage the table says', () => {
		for (const [move, from, to, actor] of LEGAL) {
			const check = nextStage(from as never, move, actor, nowFor(move), deadline);
			expect(check, `${move} from ${from}`).toEqual({ ok: true, to });
		}
	});

	it('refuses every other stage, actor and move combination', () => {
		let refused = 0;
		for (const stage of FIT_STAGES) {
			for (const move of Object.keys(FIT_MOVES) as FitMove[]) {
				for (const actor of ACTORS) {
					const legal = LEGAL.some(([m, f, , a]) => m === move && f === stage && a === actor);
					const check = nextStage(stage, move, actor, nowFor(move), deadline);
					expect(check.ok, `${move} by ${actor} from ${stage}`).toBe(legal);
					if (!check.ok) {
						refused++;
						expect(check.message.length).toBeGreaterThan(10);
					}
				}
			}
		}
		// 5 stages × 6 moves × 4 actors = 120 cases, 6 legal.
		expect(refused).toBe(114);
	});

	it('leaves the final stages by no move', () => {
		for (const stage of FINAL_STAGES) {
			for (const [move, , , actor] of LEGAL) {
				expect(nextStage(stage, move, actor, nowFor(move), deadline).ok).toBe(false);
			}
		}
	});

	it('lets the owner confirm or raise a problem only before the deadline', () => {
		for (const move of ['confirm', 'raise-problem'] as const) {
			expect(nextStage('reported', move, 'owner', inside, deadline).ok).toBe(true);
			const late = nextStage('reported', move, 'owner', after, deadline);
			expect(late).toEqual({
				ok: false,
				message: 'The time to confirm or raise a problem has passed.'
			});
		}
	});

	it('lets the schedule confirm only from the deadline on', () => {
		expect(nextStage('reported', 'window-closes', 'schedule', inside, deadline).ok).toBe(false);
		expect(nextStage('reported', 'window-closes', 'schedule', after, deadline).ok).toBe(true);
	});

	it('refuses window moves on a booking without a deadline', () => {
		expect(nextStage('reported', 'confirm', 'owner', inside, null).ok).toBe(false);
	});
});

describe('confirmationDeadline', () => {
	it('adds 72 exact hours (lifecycle issue default)', () => {
		expect(confirmationDeadline(reportedAt, 72).toISOString()).toBe('2026-12-04T00:00:00.000Z');
	});

	it('keeps exact hours across the April 2027 end of daylight saving in Adelaide', () => {
		// Australia/Adelaide leaves ACDT (+10:30) for ACST (+9:30) at 03:00 local on Sunday
		// 4 April 2027 (IANA tz database; first Sunday in April, South Australian rule). A report
		// at 10:00 ACDT on Saturday 3 April (23:30 UTC on 2 April) closes 72 h later: 23:30 UTC on
		// 5 April, which is 09:00 ACST on Tuesday 6 April local, one clock hour "earlier".
		const at = new Date('2027-04-02T23:30:00Z');
		expect(confirmationDeadline(at, 72).toISOString()).toBe('2027-04-05T23:30:00.000Z');
	});

	it('refuses a window that is not a positive whole number of hours', () => {
		expect(() => confirmationDeadline(reportedAt, 0)).toThrow(RangeError);
		expect(() => confirmationDeadline(reportedAt, 1.5)).toThrow(RangeError);
	});
});
