/**
 * GST on installers' quotes. Only a business registered for GST charges it and may show it on
 * an invoice; a sole trader under the registration turnover threshold need not register and
 * charges none (published: Australian Taxation Office, "Registering for GST" and "Tax
 * invoices"). Quotes from unregistered installers therefore carry no GST line and say why; the
 * fee invoice of the payments work relies on the same flag.
 */
import { formatAud, gstFromInclusive } from './money';

/** What a quote says instead of a GST line when the installer is not registered. */
export const NO_GST_NOTE = 'No GST: this installer is not registered for GST';

/** The installer's own wording of the same fact, on their quote form and quote. */
export const NO_GST_NOTE_FOR_INSTALLER =
	'No GST: you told us you are not registered for GST, so your quote shows none';

/**
 * The GST in a quote's total: one eleventh of the GST-inclusive total (rounded half up to the
 * cent) when the installer is registered for GST, otherwise none.
 * @param totalCents what the owner pays, in cents
 * @param gstRegistered whether the installer is registered for GST
 */
export function quoteGstCents(totalCents: number, gstRegistered: boolean): number {
	return gstRegistered ? gstFromInclusive(totalCents) : 0;
}

/**
 * How a quote's total speaks of GST: 'incl. $36.36 GST' for a registered installer, the
 * {@link NO_GST_NOTE} otherwise.
 * @param quote whether its installer was registered when quoting, and the GST it carries
 */
export function quoteGstNote(quote: { gstRegistered: boolean; gstCents: number }): string {
	return quote.gstRegistered ? `incl. ${formatAud(quote.gstCents)} GST` : NO_GST_NOTE;
}

/**
 * Label for an amount the installer types into the quote form: '($, incl. GST)' when they are
 * registered, '($)' when they are not.
 * @param what e.g. 'Labour'
 * @param gstRegistered whether the installer is registered for GST
 */
export function quoteAmountLabel(what: string, gstRegistered: boolean): string {
	return gstRegistered ? `${what} ($, incl. GST)` : `${what} ($)`;
}
