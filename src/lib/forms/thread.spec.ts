import { describe, expect, it } from 'vitest';
import { THREAD_MESSAGE_MAX_LENGTH, threadMessageSchema } from './thread';

describe('threadMessageSchema', () => {
	it('trims the message and takes one up to the limit', () => {
		expect(threadMessageSchema.parse({ body: '  Is the car garaged?  ' }).body).toBe(
			'Is the car garaged?'
		);
		const longest = 'a'.repeat(THREAD_MESSAGE_MAX_LENGTH);
		expect(threadMessageSchema.parse({ body: longest }).body).toHaveLength(2000);
	});

	it('refuses an empty message and one over the limit, saying why', () => {
		const empty = threadMessageSchema.safeParse({ body: '   ' });
		expect(empty.error?.issues[0]?.message).toBe('Write your message');
		const long = threadMessageSchema.safeParse({ body: 'a'.repeat(2001) });
		expect(long.error?.issues[0]?.message).toBe('Keep it to 2,000 characters or fewer');
	});
});
