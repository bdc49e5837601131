import { describe, expect, it } from 'vitest';
import {
	CONTACT_PATTERNS,
	MASK_PLACEHOLDER,
	MAX_MASKED_LENGTH,
	maskContactDetails,
	maskingWorkBound,
	type MaskedKind
} from './masking';

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
		expect(maskContactDetails(input)).toMatchObject({ text: input, masked: [] });
	});
});

describe('CONTACT_PATTERNS', () => {
	it('describes every pattern for the README and tries it one position at a time', () => {
		expect(CONTACT_PATTERNS.length).toBeGreaterThanOrEqual(6);
		for (const pattern of CONTACT_PATTERNS) {
			expect(pattern.description.length).toBeGreaterThan(20);
			expect(pattern.regex.sticky).toBe(true);
			expect(pattern.regex.global).toBe(false);
			expect(pattern.maxLength).toBeGreaterThan(0);
			if (pattern.continuation) expect(pattern.continuation.sticky).toBe(true);
		}
	});
});

describe('maskContactDetails over long runs (longer than one window)', () => {
	// Source for the window sizes: RFC 5321 (at most 64 characters before the '@') and RFC 1035
	// (labels of at most 63 characters). The numbers are invented.
	it('masks a spaced-out number at the end of a digit run longer than its window', () => {
		const padded = '1 '.repeat(200) + '0 4 1 2 3 4 5 6 7 8';
		expect(maskContactDetails(padded)).toMatchObject({ text: HIDDEN, masked: ['phone'] });
		const solid = '9'.repeat(300) + '0412345678 ok';
		expect(maskContactDetails(solid).text).toBe(`${HIDDEN} ok`);
	});

	it('masks a whole link longer than its window and keeps the full stop after it', () => {
		const link = `https://example.com/${'a'.repeat(900)}`;
		expect(maskContactDetails(`See ${link}.`).text).toBe(`See ${HIDDEN}.`);
	});

	it('masks an address whose text before the @ runs past the 64 characters a mailbox may have', () => {
		const result = maskContactDetails(`${'x'.repeat(100)}sam@example.com`);
		expect(result.masked).toEqual(['email']);
		expect(result.text.endsWith(HIDDEN)).toBe(true);
		expect(result.text).not.toContain('sam@');
	});
});

describe('maskContactDetails work grows linearly', () => {
	// Awkward inputs that made the earlier patterns re-read the rest of the message from every
	// position (quadratic): long dotted words with no '@', spelt-out dots with no 'at', digit
	// runs, brackets and blanks. Linearity is checked by counting the characters read.
	const awkward: Record<string, (n: number) => string> = {
		'dotted word, no @': (n) => 'a.'.repeat(n / 2),
		'spelt-out dots, no at': (n) => 'b dot '.repeat(n / 6),
		'digit run': (n) => '1 '.repeat(n / 2),
		'brackets in a digit run': (n) => '1 ('.repeat(n / 3),
		letters: (n) => 'a'.repeat(n),
		mixed: (n) =>
			('a.'.repeat(n / 8) + ' at ' + 'b dot '.repeat(n / 24) + '1 '.repeat(n / 8)).slice(0, n)
	};

	it.each(Object.entries(awkward))('%s', (_name, make) => {
		const steps = [2000, 4000, 8000].map((n) => {
			const text = make(n);
			const result = maskContactDetails(text);
			expect(result.steps).toBeLessThanOrEqual(maskingWorkBound(text.length));
			return { length: text.length, steps: result.steps };
		});
		// Linear: each added character costs the same, so the cost of going from 4,000 to 8,000
		// characters per added character matches that of going from 2,000 to 4,000 (within 5 %).
		// A quadratic matcher would double it.
		const [small, medium, large] = steps as [
			(typeof steps)[0],
			(typeof steps)[0],
			(typeof steps)[0]
		];
		const marginalLow = (medium.steps - small.steps) / (medium.length - small.length);
		const marginalHigh = (large.steps - medium.steps) / (large.length - medium.length);
		expect(marginalHigh).toBeLessThanOrEqual(marginalLow * 1.05);
		expect(marginalHigh).toBeGreaterThan(0);
	});

	it('has a bound proportional to the length', () => {
		expect(maskingWorkBound(2000)).toBe(2 * maskingWorkBound(1000));
		expect(maskingWorkBound(0)).toBe(0);
	});

	it('refuses a message longer than the limit instead of taking longer', () => {
		expect(() => maskContactDetails('1'.repeat(MAX_MASKED_LENGTH + 1))).toThrow(RangeError);
		expect(maskContactDetails('a'.repeat(MAX_MASKED_LENGTH)).masked).toEqual([]);
	});
});
