import { describe, expect, it } from 'vitest';
import { CONTACT_PATTERNS, MASK_PLACEHOLDER, maskContactDetails, type MaskedKind } from './masking';

// Number shapes follow the Australian numbering plan as commonly written (from memory): mobiles
// 04xx xxx xxx / +61 4xx xxx xxx, geographic numbers (0x) xxxx xxxx with area codes 02, 03, 07,
// 08, and 13 / 1300 / 1800 numbers. All numbers and addresses below are invented.
const HIDDEN = MASK_PLACEHOLDER;

describe('maskContactDetails masks contact details', () => {
	const cases: Array<[string, string, string, MaskedKind]> = [
		['e-mail', 'Email me: sam.fitter+quotes@example.com.au!', `Email me: ${HIDDEN}!`, 'email'],
		['e-mail with spaces around @', 'sam @ example.net please', `${HIDDEN} please`, 'email'],
		['spelt-out e-mail', 'write to sam at example dot com ok', `write to ${HIDDEN} ok`, 'email'],
		['bracketed e-mail', 'sam[at]example[dot]com.au', HIDDEN, 'email'],
		['bracketed e-mail, round', 'sam (at) example (dot) net', HIDDEN, 'email'],
		['@ with spelt-out dot', 'sam@example dot com', HIDDEN, 'email'],
		['https link', 'See https://example.com/my-work?x=1.', `See ${HIDDEN}.`, 'link'],
		['www link', 'See www.example.xyz, thanks', `See ${HIDDEN}, thanks`, 'link'],
		['bare .com.au domain', 'my site is example.com.au', `my site is ${HIDDEN}`, 'link'],
		['bare domain with path', 'look up fitter-sam.net/gallery.', `look up ${HIDDEN}.`, 'link'],
		['mobile with spaces', 'call 0412 345 678 today', `call ${HIDDEN} today`, 'phone'],
		['mobile unspaced', 'text 0412345678', `text ${HIDDEN}`, 'phone'],
		['mobile with dots', 'ring 0412.345.678.', `ring ${HIDDEN}.`, 'phone'],
		['mobile with dashes', 'ring 0412-345-678', `ring ${HIDDEN}`, 'phone'],
		['+61 mobile', 'ring +61 412 345 678', `ring ${HIDDEN}`, 'phone'],
		['+61 (0) mobile', 'ring +61 (0)412 345 678', `ring ${HIDDEN}`, 'phone'],
		['landline in brackets', 'shop (08) 8123 4567', `shop ${HIDDEN}`, 'phone'],
		['landline with dashes', 'shop 08-8123-4567', `shop ${HIDDEN}`, 'phone'],
		['+61 landline', 'shop +61 8 8123 4567', `shop ${HIDDEN}`, 'phone'],
		['local landline', 'shop 8123 4567', `shop ${HIDDEN}`, 'phone'],
		['1300 number', 'call 1300 123 456', `call ${HIDDEN}`, 'phone'],
		['1800 number', 'call 1800-123-456', `call ${HIDDEN}`, 'phone'],
		['13 number', 'call 13 12 34 anytime', `call ${HIDDEN} anytime`, 'phone'],
		['spaced-out digits', 'my number 0 4 1 2 3 4 5 6 7 8', `my number ${HIDDEN}`, 'phone'],
		['dotted 9-digit run', 'id 9.8.7.6.5.4.3.2.1 ok', `id ${HIDDEN} ok`, 'phone']
	];

	it.each(cases)('%s', (_name, input, expected, kind) => {
		const result = maskContactDetails(input);
		expect(result.text).toBe(expected);
		expect(result.masked).toEqual([kind]);
	});

	it('reports each kind once when a message mixes them', () => {
		const result = maskContactDetails(
			'Call 0412 345 678 or 8123 4567, mail sam@example.com, see example.net'
		);
		expect(result.text).toBe(`Call ${HIDDEN} or ${HIDDEN}, mail ${HIDDEN}, see ${HIDDEN}`);
		expect(result.masked).toEqual(['phone', 'email', 'link']);
	});
});

describe('maskContactDetails leaves ordinary job talk alone', () => {
	// Everyday numbers in a dash-camera job: prices, model years, ISO 8820 fuse ratings, times,
	// South Australian postcodes, battery voltages, dates (common trade practice).
	const untouched = [
		'The quote is $120 including GST.',
		'It is a 2019 hatch.',
		'Fits 2019-2021 models.',
		'I used a 7.5 A fuse in the tap.',
		'Use a 7.5A or 10A fuse.',
		'Can you come at 9:30?',
		'Can you come at 9.30 or 10.15?',
		'We are in 5067.',
		'The battery rests at 12.4 V.',
		'Booked for 12.03.2026 at 9:30.',
		'Cut-off at 12.2V, draw 0.25 A, rear cable 6 m, e.g. through the grommet.',
		'Meet at the car park, I am at work until 5.',
		'Total $1,250.50 for front + rear, 90 min.'
	];

	it.each(untouched)('%s', (input) => {
		expect(maskContactDetails(input)).toEqual({ text: input, masked: [] });
	});
});

describe('CONTACT_PATTERNS', () => {
	it('describes every pattern for the README', () => {
		expect(CONTACT_PATTERNS.length).toBeGreaterThanOrEqual(6);
		for (const pattern of CONTACT_PATTERNS) {
			expect(pattern.description.length).toBeGreaterThan(20);
			expect(pattern.regex.flags).toContain('g');
		}
	});

	it('handles long, awkward input (its speed is measured by npm run bench)', () => {
		const awkward = 'a.'.repeat(5000) + ' at ' + 'b dot '.repeat(5000) + '1 '.repeat(5000);
		const { text, masked } = maskContactDetails(awkward);
		expect(masked).toEqual(['phone']);
		expect(text.startsWith('a.a.a.')).toBe(true);
		expect(text.trimEnd().endsWith(MASK_PLACEHOLDER)).toBe(true);
	});
});
