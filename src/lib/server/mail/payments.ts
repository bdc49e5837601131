/**
 * E-mails about money: a booking confirmed by payment (to both sides), a payment that came after
 * its hold lapsed, a cancellation and what it paid back, and a payout sent. Same house layout.
 */
import { renderBlock as render, type RenderedEmail } from './layout';

export type PaymentEmail =
	| {
			template: 'payment-confirmed-owner';
			data: {
				displayName: string;
				title: string;
				businessName: string;
				slot: string;
				total: string;
				note: string | null;
				url: string;
			};
	  }
	| {
			template: 'payment-confirmed-installer';
			data: {
				businessName: string;
				title: string;
				slot: string;
				ownerName: string;
				place: string;
				url: string;
			};
	  }
	| {
			template: 'payment-refunded-after-lapse';
			data: { displayName: string; title: string; amount: string; url: string };
	  }
	| {
			template: 'booking-cancelled';
			data: { greeting: string; title: string; slot: string; lines: string[]; url: string };
	  }
	| {
			template: 'payout-sent';
			data: { businessName: string; title: string; payout: string; fee: string; url: string };
	  };

const TEMPLATES = new Set<string>([
	'payment-confirmed-owner',
	'payment-confirmed-installer',
	'payment-refunded-after-lapse',
	'booking-cancelled',
	'payout-sent'
]);

/** Whether a message is one of these. */
export function isPaymentEmail(message: { template: string }): message is PaymentEmail {
	return TEMPLATES.has(message.template);
}

/** Renders one of the payment e-mails. */
export function renderPaymentEmail(message: PaymentEmail): RenderedEmail {
	switch (message.template) {
		case 'payment-confirmed-owner':
			return render(`Booked and paid: ${message.data.title}`, {
				heading: `Hi ${message.data.displayName}, your booking is confirmed`,
				paragraphs: [
					`We received ${message.data.total} for the ${message.data.title} with ${message.data.businessName}, ${message.data.slot}.`,
					...(message.data.note ? [message.data.note] : []),
					'The money is held by Tapline and paid to the installer only once the fit is done. The installer now has your name and the address of the fit.'
				],
				action: { label: 'See the receipt', url: message.data.url }
			});
		case 'payment-confirmed-installer':
			return render(`Confirmed: ${message.data.title}, ${message.data.slot}`, {
				heading: `${message.data.businessName}, the owner has paid`,
				paragraphs: [
					`The booking for the ${message.data.title} at ${message.data.slot} is confirmed; the payment is held by Tapline until the job is done.`,
					`The owner is ${message.data.ownerName}; the fit is at ${message.data.place}.`
				],
				action: { label: 'See the job', url: message.data.url }
			});
		case 'payment-refunded-after-lapse':
			return render(`Your payment of ${message.data.amount} is on its way back`, {
				heading: `Hi ${message.data.displayName}, we refunded your payment`,
				paragraphs: [
					`Your payment for the ${message.data.title} arrived after the 30-minute hold on the installer's time had run out, and by then the time was no longer free.`,
					`So we refunded all ${message.data.amount} at once; your bank usually shows it within 5 to 10 business days. Nothing is booked; you can choose a quote and time again.`
				],
				action: { label: 'See your booking', url: message.data.url }
			});
		case 'booking-cancelled':
			return render(`Cancelled: ${message.data.title}, ${message.data.slot}`, {
				heading: message.data.greeting,
				paragraphs: message.data.lines,
				action: { label: 'See the booking', url: message.data.url }
			});
		case 'payout-sent':
			return render(`Payout sent: ${message.data.payout} for the ${message.data.title}`, {
				heading: `${message.data.businessName}, your payout is on its way`,
				paragraphs: [
					`We sent ${message.data.payout} for the ${message.data.title}: the job total less Tapline's fee of ${message.data.fee} (GST included; the statement is your tax invoice for it).`
				],
				action: { label: 'See the payout statement', url: message.data.url }
			});
	}
}
