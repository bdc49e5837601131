import type { ParamMatcher } from '@sveltejs/kit';

// Any RFC 9562 UUID in its canonical text form (the database's uuid columns take nothing else).
const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/** Route segments named `[id=uuid]` match only UUIDs, so anything else is a 404 before any load. */
export const match = ((param: string): param is string => UUID.test(param)) satisfies ParamMatcher;
