/** The form for proposing a new time for a paid booking (checked further by $lib/work/reschedule). */
import { z } from 'zod';
import { isCalendarDate, textField } from './fields';

const TIME = /^([01]\d|2[0-3]):[0-5]\d$/;

export const proposeTimeSchema = z.object({
	date: textField().refine(isCalendarDate, { error: 'Give the date as a calendar date.' }),
	start: textField().regex(TIME, { error: 'Give the start as a time, e.g. 09:00.' }),
	end: textField().regex(TIME, { error: 'Give the end as a time, e.g. 11:00.' }),
	repeated: z.enum(['', 'earlier', 'later']).default(''),
	note: textField().trim().max(300, { error: 'Keep the note under 300 characters.' }).default('')
});
