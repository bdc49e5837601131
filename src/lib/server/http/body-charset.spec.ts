import { describe, expect, it } from 'vitest';
import { hasUnreadableCharset } from './body-charset';

// The form encodings and their charset parameter: WHATWG HTML Living Standard, "Form submission"
// (application/x-www-form-urlencoded, multipart/form-data, text/plain) and RFC 7578 §4.6
// (multipart/form-data: UTF-8 is the default and the only charset browsers send).
describe('hasUnreadableCharset', () => {
	it.each([
		['application/x-www-form-urlencoded; charset=utf-16', true],
		['application/x-www-form-urlencoded;charset=UTF-16LE', true],
		['multipart/form-data; boundary=x; charset=iso-8859-1', true],
		['text/plain; charset="shift_jis"', true],
		['APPLICATION/X-WWW-FORM-URLENCODED; CHARSET=UTF-16', true]
	])('refuses %s', (type, expected) => {
		expect(hasUnreadableCharset(type)).toBe(expected);
	});

	it.each([
		[null],
		['application/x-www-form-urlencoded'],
		['application/x-www-form-urlencoded; charset=UTF-8'],
		['application/x-www-form-urlencoded; charset="utf-8"'],
		['multipart/form-data; boundary=----x'],
		['text/plain;charset=us-ascii'],
		// Not a form: the route reads (or refuses) it itself.
		['application/json; charset=utf-16'],
		['application/octet-stream']
	])('lets %s through', (type) => {
		expect(hasUnreadableCharset(type)).toBe(false);
	});
});
