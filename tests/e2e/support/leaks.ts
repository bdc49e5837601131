/**
 * What must never reach a person in an answer: a stack trace, the app's file paths, SQL text or
 * the database driver's words. Used by the suites that send every route odd or unwelcome requests.
 */
export const STACK = [
	/^\s+at .+(:\d+:\d+\)?|\(native\))$/m,
	/node_modules/,
	/\b\w*Error: [^\n]*\/(src|build|app)\//,
	/\/(src|build)\/[\w/.-]+\.(ts|js):\d+/
];
export const SQL = [
	/SELECT [\s\S]{0,200} FROM /,
	/INSERT INTO/,
	/UPDATE "?\w+"? SET/,
	/syntax error at or near/,
	/violates (foreign key|unique|check|not-null) constraint/,
	/relation "/,
	/invalid input syntax for/,
	/drizzle/i,
	/DrizzleQueryError|PostgresError|error: column/
];
export const LEAKS = [...STACK, ...SQL];
