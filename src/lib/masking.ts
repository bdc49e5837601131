/**
 * Contact-detail masking for questions and answers exchanged before a booking. Until the owner
 * books, both sides talk through Tapline, so e-mail addresses, links and phone numbers are
 * replaced with a placeholder. The patterns lean towards masking: hiding a harmless number is a
 * small cost, a leaked mobile number takes the job off the platform.
 *
 * Time grows linearly with the message. Each pattern is tried once per position, on a window of
 * at most `maxLength` characters ahead (plus a few behind for look-behinds), so one try can never
 * read, or backtrack over, more than its window however long the message is; a match cut short by
 * the window is finished by a `continuation` that reads each further character once and never
 * backtracks. Total work is therefore at most the message length times the sum of the windows
 * ({@link maskingWorkBound}); {@link maskContactDetails} counts it, the tests check the count and
 * `npm run bench` times it. Messages longer than {@link MAX_MASKED_LENGTH} are refused.
 */

/** What was hidden, for telling the writer why their message changed. */
export type MaskedKind = 'phone' | 'email' | 'link';

/** One contact-detail pattern, applied in list order. */
export type ContactPattern = {
	kind: MaskedKind;
	/** Plain-language description for the README and the help page. */
	description: string;
	/** Sticky ('y'): tried at one position at a time, inside a window of `maxLength`. */
	regex: RegExp;
	/** The most characters one try may read ahead of its starting position. */
	maxLength: number;
	/**
	 * Sticky, without alternatives to backtrack into: extends a match that reached the end of its
	 * window (a run longer than any real contact detail). Absent: the match stands as cut.
	 */
	continuation?: RegExp;
	/** Extra check on a match that the regex alone cannot express; absent means always mask. */
	accept?: (match: string) => boolean;
};

/** Shown in place of anything masked. */
export const MASK_PLACEHOLDER = '[contact details hidden]';

/**
 * Longest message masked, in characters: Tapline's bound, five times the longest message a form
 * accepts (questions and answers 2,000, quote notes 1,000).
 */
export const MAX_MASKED_LENGTH = 10_000;

/** Characters behind the starting position each window keeps, for the patterns' look-behinds. */
export const MASKING_CONTEXT = 8;

// Top-level domains common in Australian messages; bare domains are only masked with one of
// these, so 'e.g.', '7.5A' and 'file.txt' stay as written.
const TOP_LEVEL_DOMAINS =
	'com|net|org|biz|info|io|co|me|app|dev|xyz|online|site|store|shop|tech|email|au|nz|uk';
// A DNS label is at most 63 characters (RFC 1035); a domain name at most 253.
const LABEL = '[a-z0-9](?:[a-z0-9-]{0,61}[a-z0-9])?';
// Spelt-out punctuation: ' at ', '(at)', '[at]', '{at}' and the same for dot; a real '@' may
// also be combined with a spelt-out dot. Spaces are bounded so no stretch of blanks is re-read.
const AT_WORD = String.raw`(?:\s{0,3}[[({]\s{0,3}at\s{0,3}[\])}]\s{0,3}|\s{1,3}at\s{1,3}|\s{0,3}@\s{0,3})`;
const DOT_WORD = String.raw`(?:\s{0,3}[[({]\s{0,3}dot\s{0,3}[\])}]\s{0,3}|\s{1,3}dot\s{1,3}|\.)`;
// Digits with up to three separators (space, dot, dash, brackets) between each: how phone
// numbers are written, and how people space them out to slip past a filter. '+' may lead.
const DIGIT_RUN = String.raw`(?<![\w$.])\+?\(?\d(?:[ \t.\-–()]{0,3}\d)*\)?(?!\w)`;
// The rest of a digit run longer than a window: read once, nothing to backtrack into.
const DIGIT_RUN_REST = /(?:[ \t.\-–()]{0,3}\d)*\)?/y;
// The rest of a link or path longer than a window; trailing punctuation is given back in code.
const URL_REST = /[^\s<>"']*/y;
const TRAILING_PUNCTUATION = '.,;:!?)';

/**
 * Patterns in the order they are applied. Each runs on the text left by the previous ones, so
 * an e-mail address is masked whole before its domain could be taken for a bare domain.
 * Window sizes: an address is at most 64 characters before the '@' and 253 after (RFC 5321,
 * RFC 1035); a phone number, however spaced, is well under 64.
 */
export const CONTACT_PATTERNS: readonly ContactPattern[] = [
	{
		kind: 'email',
		description: 'E-mail addresses, e.g. name@example.com (spaces around @ allowed).',
		regex: new RegExp(String.raw`[a-z0-9._%+-]{1,64}\s?@\s?${LABEL}(?:\.${LABEL})+`, 'iy'),
		maxLength: 330
	},
	{
		kind: 'email',
		description:
			"Spelt-out e-mail addresses, e.g. 'name at example dot com', 'name [at] example [dot] com'.",
		regex: new RegExp(
			String.raw`\b${LABEL}(?:${DOT_WORD}${LABEL}){0,8}${AT_WORD}${LABEL}(?:${DOT_WORD}${LABEL}){0,8}${DOT_WORD}(?:${TOP_LEVEL_DOMAINS})\b`,
			'iy'
		),
		maxLength: 330
	},
	{
		kind: 'link',
		description: "Web links starting with 'http://', 'https://' or 'www.'.",
		// Stops before trailing punctuation so the end of the sentence survives.
		regex: /\b(?:https?:\/\/|www\.)[^\s<>"']*[^\s<>"'.,;:!?)]/iy,
		maxLength: 512,
		continuation: URL_REST
	},
	{
		kind: 'link',
		description: `Bare domains ending in a common top-level domain, e.g. example.com.au (${TOP_LEVEL_DOMAINS.split('|').join(', ')}).`,
		regex: new RegExp(
			String.raw`(?<![\w@.-])${LABEL}(?:\.${LABEL})*\.(?:${TOP_LEVEL_DOMAINS})\b(?:\/[^\s]*[^\s.,;:!?)])?`,
			'iy'
		),
		maxLength: 512,
		continuation: URL_REST
	},
	{
		kind: 'phone',
		description:
			'Australian mobiles: 04xx xxx xxx, or +61 4xx xxx xxx (also +61 (0)4…), with spaces, dots, dashes or brackets.',
		regex: new RegExp(DIGIT_RUN, 'y'),
		maxLength: 64,
		continuation: DIGIT_RUN_REST,
		accept: (match) => /^(?:04\d{8}|614\d{8}|6104\d{8})$/.test(digitsOf(match))
	},
	{
		kind: 'phone',
		description:
			'Australian landlines: (0x) xxxx xxxx or +61 x xxxx xxxx for area codes 2, 3, 7 and 8, and local xxxx xxxx.',
		regex: new RegExp(DIGIT_RUN, 'y'),
		maxLength: 64,
		continuation: DIGIT_RUN_REST,
		accept: (match) =>
			/^(?:0[2378]\d{8}|61[2378]\d{8}|610[2378]\d{8}|\d{8})$/.test(digitsOf(match)) &&
			!isDateOrYearRange(match)
	},
	{
		kind: 'phone',
		description: 'Australian 13, 1300 and 1800 numbers: 13 xx xx, 1300 xxx xxx, 1800 xxx xxx.',
		regex: new RegExp(DIGIT_RUN, 'y'),
		maxLength: 64,
		continuation: DIGIT_RUN_REST,
		// A bare six-digit '13xxxx' could be a part number, so 13 numbers need their usual spacing.
		accept: (match) =>
			/^1[38]00\d{6}$/.test(digitsOf(match)) || /^13[ .-]?\d{2}[ .-]?\d{2}$/.test(match)
	},
	{
		kind: 'phone',
		description:
			'Any other run of 8 or more digits, however separated (e.g. 0 4 1 2 …), except dates and year ranges.',
		regex: new RegExp(DIGIT_RUN, 'y'),
		maxLength: 64,
		continuation: DIGIT_RUN_REST,
		accept: (match) => digitsOf(match).length >= 8 && !isDateOrYearRange(match)
	}
];

/** The result of masking, with the work it took. */
export type MaskResult = {
	text: string;
	/** Which kinds of detail were hidden, each kind once. */
	masked: MaskedKind[];
	/** Characters read by all tries and continuations: never above {@link maskingWorkBound}. */
	steps: number;
};

/**
 * The most characters masking may read for a message of `length` characters: every position
 * tried once by every pattern within its window, plus each character read once more by a
 * continuation. Linear in `length`.
 * @param length message length in characters
 * @param patterns the patterns applied
 */
export function maskingWorkBound(
	length: number,
	patterns: readonly ContactPattern[] = CONTACT_PATTERNS
): number {
	return patterns.reduce(
		(sum, pattern) => sum + length * (pattern.maxLength + MASKING_CONTEXT + 1),
		0
	);
}

/**
 * Replaces contact details in a message with {@link MASK_PLACEHOLDER}.
 * @param text the message as written, at most {@link MAX_MASKED_LENGTH} characters
 * @returns the masked text, which kinds of detail were hidden (each kind once) and the work done
 * @throws RangeError for a longer message: callers bound messages first
 */
export function maskContactDetails(text: string): MaskResult {
	if (text.length > MAX_MASKED_LENGTH) {
		throw new RangeError(
			`A message to mask is at most ${String(MAX_MASKED_LENGTH)} characters, got ${String(text.length)}`
		);
	}
	const masked = new Set<MaskedKind>();
	const work = { steps: 0 };
	let result = text;
	for (const pattern of CONTACT_PATTERNS) {
		result = applyPattern(result, pattern, work, () => masked.add(pattern.kind));
	}
	const order: MaskedKind[] = ['phone', 'email', 'link'];
	return { text: result, masked: order.filter((kind) => masked.has(kind)), steps: work.steps };
}

/** One pattern over the text, left to right, as a global replace would go, but windowed. */
function applyPattern(
	text: string,
	pattern: ContactPattern,
	work: { steps: number },
	onMask: () => void
): string {
	let out = '';
	let copied = 0;
	let i = 0;
	while (i < text.length) {
		const from = Math.max(0, i - MASKING_CONTEXT);
		const to = Math.min(text.length, i + pattern.maxLength);
		const window = text.slice(from, to);
		work.steps += to - from;
		pattern.regex.lastIndex = i - from;
		const found = pattern.regex.exec(window);
		if (!found || found[0].length === 0) {
			i++;
			continue;
		}
		let end = i + found[0].length;
		// Within reach of the window's end the match may have been cut (e.g. between a separator
		// and the next digit), so the continuation reads on; where it had really ended, the
		// continuation finds nothing more.
		if (to < text.length && to - end <= MASKING_CONTEXT && pattern.continuation) {
			end = continueMatch(text, end, pattern.continuation, work);
		}
		if (!pattern.accept || pattern.accept(text.slice(i, end))) {
			onMask();
			out += text.slice(copied, i) + MASK_PLACEHOLDER;
			copied = end;
		}
		i = end;
	}
	return copied === 0 ? text : out + text.slice(copied);
}

/** Where a match cut by its window really ends: its continuation, less trailing punctuation. */
function continueMatch(
	text: string,
	from: number,
	continuation: RegExp,
	work: { steps: number }
): number {
	continuation.lastIndex = from;
	let end = from + (continuation.exec(text)?.[0].length ?? 0);
	work.steps += end - from;
	if (continuation === URL_REST) {
		while (end > from && TRAILING_PUNCTUATION.includes(text.charAt(end - 1))) end--;
	}
	return end;
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
