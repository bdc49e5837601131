/**
 * The work of a paid booking, as a state machine (Tapline's rules, from the lifecycle issue).
 * One table says which move is legal from which stage and who may make it; the server modules ask
 * {@link nextStage} before they write, inside the booking's row lock. Pure and tested.
 *
 * | move            | from              | to        | who                          |
 * | --------------- | ----------------- | --------- | ---------------------------- |
 * | file-report     | to_fit            | reported  | the booking's installer      |
 * | confirm         | reported          | accepted  | the booking's owner, in time |
 * | window-closes   | reported          | accepted  | the schedule, after the window |
 * | raise-problem   | reported          | disputed  | the booking's owner, in time |
 * | settle          | disputed          | settled   | an admin not party to it     |
 * | return-visit    | disputed          | to_fit    | an admin not party to it     |
 *
 * Accepted and settled are final. A return visit sends the work back to be fitted again on a new
 * date; its fit report starts a new confirmation window (the settled dispute stays closed).
 */

export const FIT_STAGES = ['to_fit', 'reported', 'accepted', 'disputed', 'settled'] as const;
export type FitStageName = (typeof FIT_STAGES)[number];

export type FitMove =
	'file-report' | 'confirm' | 'window-closes' | 'raise-problem' | 'settle' | 'return-visit';

export type FitActor = 'owner' | 'installer' | 'schedule' | 'admin';

/** Tapline's default confirmation window: 72 hours after the fit report (the lifecycle issue). */
export const DEFAULT_CONFIRMATION_WINDOW_HOURS = 72;
/** The shortest and longest window an admin may set (Tapline's choice). */
export const MIN_CONFIRMATION_WINDOW_HOURS = 24;
export const MAX_CONFIRMATION_WINDOW_HOURS = 336;

interface MoveRule {
	from: FitStageName;
	to: FitStageName;
	by: FitActor;
	/** Whether the move must happen before the confirmation deadline (true) or after it (false). */
	window?: 'open' | 'closed';
}

export const FIT_MOVES: Record<FitMove, MoveRule> = {
	'file-report': { from: 'to_fit', to: 'reported', by: 'installer' },
	confirm: { from: 'reported', to: 'accepted', by: 'owner', window: 'open' },
	'window-closes': { from: 'reported', to: 'accepted', by: 'schedule', window: 'closed' },
	'raise-problem': { from: 'reported', to: 'disputed', by: 'owner', window: 'open' },
	settle: { from: 'disputed', to: 'settled', by: 'admin' },
	'return-visit': { from: 'disputed', to: 'to_fit', by: 'admin' }
};

/** Stages no move leaves. */
export const FINAL_STAGES: readonly FitStageName[] = ['accepted', 'settled'];

const STAGE_WORDS: Record<FitStageName, string> = {
	to_fit: 'waiting to be fitted',
	reported: 'fitted and waiting for the owner to confirm',
	accepted: 'confirmed',
	disputed: 'under review after a problem was raised',
	settled: 'settled by Tapline'
};

export type MoveCheck = { ok: true; to: FitStageName } | { ok: false; message: string };

/**
 * Whether `move` by `actor` is legal now from `stage`.
 * @param confirmBy the confirmation deadline (needed by the moves that depend on it)
 */
export function nextStage(
	stage: FitStageName,
	move: FitMove,
	actor: FitActor,
	now: Date,
	confirmBy: Date | null = null
): MoveCheck {
	const rule = FIT_MOVES[move];
	if (rule.by !== actor) {
		return { ok: false, message: `Only ${actorWords(rule.by)} can do that.` };
	}
	if (stage !== rule.from) {
		return {
			ok: false,
			message: `This booking is ${STAGE_WORDS[stage]}, so that cannot be done now.`
		};
	}
	if (rule.window) {
		if (!confirmBy) return { ok: false, message: 'This booking has no confirmation window.' };
		const open = now.getTime() < confirmBy.getTime();
		if (rule.window === 'open' && !open) {
			return { ok: false, message: 'The time to confirm or raise a problem has passed.' };
		}
		if (rule.window === 'closed' && open) {
			return { ok: false, message: 'The owner still has time to confirm or raise a problem.' };
		}
	}
	return { ok: true, to: rule.to };
}

function actorWords(actor: FitActor): string {
	switch (actor) {
		case 'owner':
			return "the booking's owner";
		case 'installer':
			return "the booking's installer";
		case 'schedule':
			return 'the confirmation schedule';
		case 'admin':
			return 'an admin';
	}
}

/** The stage in words for either side, e.g. "waiting to be fitted". */
export const stageWords = (stage: FitStageName): string => STAGE_WORDS[stage];

/**
 * The deadline for the owner's answer: the report time plus the window, in exact hours (a
 * daylight-saving change in between does not shorten or lengthen it).
 */
export function confirmationDeadline(reportedAt: Date, windowHours: number): Date {
	if (!Number.isInteger(windowHours) || windowHours < 1) {
		throw new RangeError(`windowHours must be a positive whole number, got ${windowHours}`);
	}
	return new Date(reportedAt.getTime() + windowHours * 3_600_000);
}
