import { describe, expect, it } from 'vitest';
import { isServiceUnavailable } from './unavailable';

const withCode = (code: string, message = 'x') => Object.assign(new Error(message), { code });

describe('isServiceUnavailable', () => {
	// SQLSTATEs from the PostgreSQL manual, Appendix A; messages as node-postgres words them.
	it.each([
		['refused connection', withCode('ECONNREFUSED')],
		['reset connection', withCode('ECONNRESET')],
		[
			'admin shutdown (57P01)',
			withCode('57P01', 'terminating connection due to administrator command')
		],
		['starting up (57P03)', withCode('57P03', 'the database system is starting up')],
		['connection exception class 08', withCode('08006')],
		['dropped connection', new Error('Connection terminated unexpectedly')],
		['pool timeout', new Error('timeout exceeded when trying to connect')],
		['broken client', new Error('Client has encountered a connection error and is not queryable')],
		[
			'wrapped by Drizzle',
			new Error('Failed query: select 1', { cause: withCode('ECONNREFUSED') })
		],
		['AggregateError', new AggregateError([withCode('ECONNREFUSED')], 'connect failed')]
	])('%s', (_what, err) => {
		expect(isServiceUnavailable(err)).toBe(true);
	});

	it.each([
		['unique violation', withCode('23505')],
		['NUL in text', withCode('22021')],
		['a bug', new TypeError('x is undefined')],
		['not an error', 'ECONNREFUSED'],
		['nothing', undefined]
	])('not for %s', (_what, err) => {
		expect(isServiceUnavailable(err)).toBe(false);
	});
});
