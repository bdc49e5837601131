/**
 * Contact-detail masking for questions and answers exchanged before a booking. Until the owner
 * books, both sides talk through Tapline, so e-mail addresses, links and phone numbers are
 * replaced with a placeholder. The patterns lean towards masking: hiding a harmless number is a
 * small cost, a leaked mobile number takes the job off the platform.
 */

/** What was hidden, for telling the writer why their message changed. */
export type MaskedKind = 'phone' | 'email' | 'link';

/** One contact-detail pattern, applied in list order. */
export type ContactPattern = {
	kind: MaskedKind;
	/** Plain-language description for the README and the help page. */
	description: string;
	/** Global, case-insensitive. */
	regex: RegExp;
	/** Extra check on a match that the regex alone cannot express; absent means always mask. */
	accept?: (match: string) => boolean;
};

/** Shown in place of anything masked. */
export const MASK_PLACEHOLDER = '[contact details hidden]';

// Top-level domains common in Australian messages; bare domains are only masked with one of
// these, so 'e.g.', '7.5A' and 'file.txt' stay as written.
const TOP_LEVEL_DOMAINS =
	'com|net|org|biz|info|io|co|me|app|dev|xyz|online|site|store|shop|tech|email|au|nz|uk';
const LABEL = '[a-z0-9](?:[a-z0-9-]{0,61}[a-z0-9])?';
// Spelt-out punctuation: ' at ', '(at)', '[at]', '{at}' and the same for dot; a real '@' may
// also be combined with a spelt-out dot.
const AT_WORD = String.raw`(?:\s*[[({]\s*at\s*[\])}]\s*|\s+at\s+|\s*@\s*)`;
const DOT_WORD = String.raw`(?:\s*[[({]\s*dot\s*[\])}]\s*|\s+dot\s+|\.)`;
// Digits with up to three separators (space, dot, dash, brackets) between each: how phone
// numbers are written, and how people space them out to slip past a filter. '+' may lead.
const DIGIT_RUN = String.raw`(?<![\w$.])\+?\(?\d(?:[ \t.\-–()]{0,3}\d)*\)?(?!\w)`;

/**
 * Patterns in the order they are applied. Each runs on the text left by the previous ones, so
 * an e-mail address is masked whole before its domain could be taken for a bare domain.
 */
export const CONTACT_PATTERNS: readonly ContactPattern[] = [
	{
		kind: 'email',
		description: 'E-mail addresses, e.g. name@example.com (spaces around @ allowed).',
		regex: new RegExp(String.raw`[a-z0-9._%+-]+\s?@\s?${LABEL}(?:\.${LABEL})+`, 'gi')
	},
	{
		kind: 'email',
		description:
			"Spelt-out e-mail addresses, e.g. 'name at example dot com', 'name [at] example [dot] com'.",
		regex: new RegExp(
			String.raw`\b${LABEL}(?:${DOT_WORD}${LABEL})*${AT_WORD}${LABEL}(?:${DOT_WORD}${LABEL})*${DOT_WORD}(?:${TOP_LEVEL_DOMAINS})\b`,
			'gi'
		)
	},
	{
		kind: 'link',
		description: "Web links starting with 'http://', 'https://' or 'www.'.",
		// Stops before trailing punctuation so the end of the sentence survives.
		regex: /\b(?:https?:\/\/|www\.)[^\s<>"']*[^\s<>"'.,;:!?)]/gi
	},
	{
		kind: 'link',
		description: `Bare domains ending in a common top-level domain, e.g. example.com.au (${TOP_LEVEL_DOMAINS.split('|').join(', ')}).`,
		regex: new RegExp(
			String.raw`(?<![\w@.-])${LABEL}(?:\.${LABEL})*\.(?:${TOP_LEVEL_DOMAINS})\b(?:\/[^\s]*[^\s.,;:!?)])?`,
			'gi'
		)
	},
	{
		kind: 'phone',
		description:
			'Australian mobiles: 04xx xxx xxx, or +61 4xx xxx xxx (also +61 (0)4…), with spaces, dots, dashes or brackets.',
		regex: new RegExp(DIGIT_RUN, 'g'),
		accept: (match) => /^(?:04\d{8}|614\d{8}|6104\d{8})$/.test(digitsOf(match))
	},
	{
		kind: 'phone',
		description:
			'Australian landlines: (0x) xxxx xxxx or +61 x xxxx xxxx for area codes 2, 3, 7 and 8, and local xxxx xxxx.',
		regex: new RegExp(DIGIT_RUN, 'g'),
		accept: (match) =>
			/^(?:0[2378]\d{8}|61[2378]\d{8}|610[2378]\d{8}|\d{8})$/.test(digitsOf(match)) &&
			!isDateOrYearRange(match)
	},
	{
		kind: 'phone',
		description: 'Australian 13, 1300 and 1800 numbers: 13 xx xx, 1300 xxx xxx, 1800 xxx xxx.',
		regex: new RegExp(DIGIT_RUN, 'g'),
		// A bare six-digit '13xxxx' could be a part number, so 13 numbers need their usual spacing.
		accept: (match) =>
			/^1[38]00\d{6}$/.test(digitsOf(match)) || /^13[ .-]?\d{2}[ .-]?\d{2}$/.test(match)
	},
	{
		kind: 'phone',
		description:
			'Any other run of 8 or more digits, however separated (e.g. 0 4 1 2 …), except dates and year ranges.',
		regex: new RegExp(DIGIT_RUN, 'g'),
		accept: (match) => digitsOf(match).length >= 8 && !isDateOrYearRange(match)
	}
];

/**
 * Replaces contact details in a message with {@link MASK_PLACEHOLDER}.
 * @param text the message as written
 * @returns the masked text and which kinds of detail were hidden (each kind once)
 */
export function maskContactDetails(text: string): { text: string; masked: MaskedKind[] } {
	const masked = new Set<MaskedKind>();
	let result = text;
	for (const pattern of CONTACT_PATTERNS) {
		result = result.replace(pattern.regex, (match: string) => {
			if (pattern.accept && !pattern.accept(match)) return match;
			masked.add(pattern.kind);
			return MASK_PLACEHOLDER;
		});
	}
	const order: MaskedKind[] = ['phone', 'email', 'link'];
	return { text: result, masked: order.filter((kind) => masked.has(kind)) };
}

function digitsOf(match: string): string {
	return match.replace(/\D/g, '');
}

function isDateOrYearRange(match: string): boolean {
	// 12.03.2026, 12-03-2026 and 2019-2021 are dates and model years, not phone numbers.
	return (
		/^\d{1,2}[.-]\d{1,2}[.-](?:19|20)\d{2}$/.test(match) ||
		/^(?:19|20)\d{2}\s?[-–]\s?(?:19|20)\d{2}$/.test(match)
	);
}
