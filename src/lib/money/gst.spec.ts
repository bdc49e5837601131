import { describe, expect, it } from 'vitest';
import { NO_GST_NOTE, quoteAmountLabel, quoteGstCents, quoteGstNote } from './gst';

describe('quoteGstCents', () => {
	it('is 1/11 of the total for a registered installer and nothing otherwise', () => {
		// Source: Australian Taxation Office — GST in a GST-inclusive price is 1/11; only a
		// business registered for GST charges it ("Registering for GST").
		// 27 180 / 11 = 2 470.9 -> 2 471 (half up).
		expect(quoteGstCents(27_180, true)).toBe(2_471);
		expect(quoteGstCents(27_180, false)).toBe(0);
		expect(() => quoteGstCents(10.5, true)).toThrow(RangeError);
	});
});

describe('quoteGstNote and quoteAmountLabel', () => {
	it('shows a GST line only where the installer is registered, and says so otherwise', () => {
		// Source: Australian Taxation Office, "Tax invoices" — GST is shown by registered
		// businesses; an unregistered one shows none.
		expect(quoteGstNote({ gstRegistered: true, gstCents: 3_636 })).toBe('incl. $36.36 GST');
		expect(quoteGstNote({ gstRegistered: false, gstCents: 0 })).toBe(NO_GST_NOTE);
		expect(NO_GST_NOTE).toBe('No GST: this installer is not registered for GST');
		expect(quoteAmountLabel('Labour', true)).toBe('Labour ($, incl. GST)');
		expect(quoteAmountLabel('Labour', false)).toBe('Labour ($)');
	});
});
