/**
 * A payments fake that the real `stripe` SDK talks to (configured with host, port and protocol).
 * It follows Stripe's documented semantics for the subset Tapline uses: form-encoded requests,
 * `Idempotency-Key` replay, ids with Stripe's prefixes, Stripe's error shape and HTTP codes,
 * Express connected accounts with account links and a hosted onboarding page, Checkout Sessions
 * with a hosted card page that takes Stripe's published test card numbers, charges held on the
 * platform with a `transfer_group`, transfers, refunds, the balance, and webhook events signed as
 * Stripe signs them (`Stripe-Signature: t=…,v1=HMAC-SHA256(secret, "t.payload")`), retried with
 * back-off, re-sendable on demand. See README.md ("Payments") for the switches.
 */
import { createHmac, randomBytes } from 'node:crypto';
import { mkdirSync, readFileSync, renameSync, writeFileSync } from 'node:fs';
import type { IncomingMessage, ServerResponse } from 'node:http';
import { join } from 'node:path';
import qs from 'qs';
import { DEMO_CONNECTED_ACCOUNTS } from './data/stripe-demo-accounts';
import { escapeHtml, listenHttp, readBody, sendJson } from './http-util';

/** The API version the fake answers with when the client names none. */
const API_VERSION = '2026-10-28.endive';

type Obj = Record<string, unknown>;

interface Account extends Obj {
	id: string;
	object: 'account';
	type: 'express';
	email: string | null;
	country: string;
	default_currency: string;
	details_submitted: boolean;
	charges_enabled: boolean;
	payouts_enabled: boolean;
	capabilities: Record<string, 'active' | 'inactive' | 'pending'>;
	metadata: Record<string, string>;
	created: number;
}

interface Session extends Obj {
	id: string;
	object: 'checkout.session';
	amount_total: number;
	currency: string;
	status: 'open' | 'complete' | 'expired';
	payment_status: 'unpaid' | 'paid';
	payment_intent: string | null;
	success_url: string;
	cancel_url: string | null;
	url: string | null;
	metadata: Record<string, string>;
	client_reference_id: string | null;
	customer_email: string | null;
	expires_at: number;
	created: number;
	/** Not part of Stripe's object: what the session's PaymentIntent will carry. */
	_intent: { transfer_group: string | null; metadata: Record<string, string>; description: string };
	_name: string;
}

interface Charge extends Obj {
	id: string;
	amount: number;
	amount_captured: number;
	amount_refunded: number;
	refunded: boolean;
	paid: boolean;
	status: 'succeeded' | 'failed';
	payment_intent: string;
	transfer_group: string | null;
}

interface StoredResponse {
	fingerprint: string;
	status: number;
	body: unknown;
}

interface State {
	accounts: Record<string, Account>;
	accountLinks: Record<
		string,
		{ account: string; return_url: string; refresh_url: string; expires_at: number; used: boolean }
	>;
	sessions: Record<string, Session>;
	paymentIntents: Record<string, Obj & { id: string; latest_charge: string | null }>;
	charges: Record<string, Charge>;
	refunds: Record<string, Obj & { id: string; amount: number; charge: string }>;
	transfers: Record<string, Obj & { id: string; amount: number; destination: string }>;
	events: Record<string, Obj & { id: string; type: string; pending_webhooks: number }>;
	eventOrder: string[];
	idempotency: Record<string, StoredResponse>;
}

/** One attempt at delivering an event to the webhook endpoint. */
export interface WebhookDelivery {
	eventId: string;
	type: string;
	attempt: number;
	status: number | null;
	error: string | null;
	at: string;
}

export interface StripeFakeOptions {
	host: string;
	port: number;
	/** When set, the fake's objects are kept in `<dataDir>/stripe/state.json` and reloaded. */
	dataDir?: string;
	/** Where events are POSTed (the app's webhook route); none means events are only stored. */
	webhookUrl?: string;
	/** The endpoint's signing secret (`whsec_…`), shared with the app. */
	webhookSecret?: string;
	/** First retry delay after a failed delivery; doubles each time (Stripe: hours; here short). */
	retryBaseMs?: number;
	/** Deliveries per event before giving up (Stripe retries for up to three days). */
	maxAttempts?: number;
}

export interface StripeFake {
	url: string;
	port: number;
	close(): Promise<void>;
}

class StripeError extends Error {
	constructor(
		readonly status: number,
		readonly type: string,
		message: string,
		readonly extra: Obj = {}
	) {
		super(message);
	}
	toJSON() {
		return { error: { type: this.type, message: this.message, ...this.extra } };
	}
}

const now = () => Math.floor(Date.now() / 1000);
const ALPHABET = '0123456789ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz';
function newId(prefix: string, length = 24): string {
	const bytes = randomBytes(length);
	let out = '';
	for (const b of bytes) out += ALPHABET[b % ALPHABET.length];
	return `${prefix}${out}`;
}

function emptyState(): State {
	return {
		accounts: {},
		accountLinks: {},
		sessions: {},
		paymentIntents: {},
		charges: {},
		refunds: {},
		transfers: {},
		events: {},
		eventOrder: [],
		idempotency: {}
	};
}

function onboardedAccount(id: string, email: string, created: number): Account {
	return {
		id,
		object: 'account',
		type: 'express',
		email,
		country: 'AU',
		default_currency: 'aud',
		details_submitted: true,
		charges_enabled: true,
		payouts_enabled: true,
		capabilities: { transfers: 'active', card_payments: 'active' },
		metadata: {},
		created
	};
}

/** A positive whole number of cents from a form value, or a 400 naming the parameter. */
function amountParam(params: Obj, name: string, required: boolean): number | undefined {
	const raw = params[name];
	if (raw === undefined || raw === '') {
		if (required) throw missing(name);
		return undefined;
	}
	if (typeof raw !== 'string' || !/^\d+$/.test(raw) || Number(raw) < 1) {
		throw new StripeError(400, 'invalid_request_error', `Invalid integer: ${String(raw)}`, {
			param: name,
			code: 'parameter_invalid_integer'
		});
	}
	return Number(raw);
}

function stringParam(params: Obj, name: string, required: true): string;
function stringParam(params: Obj, name: string, required?: false): string | undefined;
function stringParam(params: Obj, name: string, required = false): string | undefined {
	const raw = params[name];
	if (raw === undefined || raw === '') {
		if (required) throw missing(name);
		return undefined;
	}
	if (typeof raw !== 'string') {
		throw new StripeError(400, 'invalid_request_error', `Invalid string: ${name}`, {
			param: name,
			code: 'parameter_invalid_string'
		});
	}
	return raw;
}

function metadataParam(params: Obj, name = 'metadata'): Record<string, string> {
	const raw = params[name];
	if (raw === undefined || raw === '') return {};
	if (typeof raw !== 'object' || raw === null || Array.isArray(raw)) {
		throw new StripeError(400, 'invalid_request_error', 'Invalid hash', { param: name });
	}
	return Object.fromEntries(Object.entries(raw as Obj).map(([k, v]) => [k, String(v)]));
}

function missing(param: string): StripeError {
	return new StripeError(400, 'invalid_request_error', `Missing required param: ${param}.`, {
		param,
		code: 'parameter_missing'
	});
}

function noSuch(kind: string, id: string, param = 'id'): StripeError {
	return new StripeError(404, 'invalid_request_error', `No such ${kind}: '${id}'`, {
		param,
		code: 'resource_missing'
	});
}

function list(url: string, data: unknown[]) {
	return { object: 'list', data, has_more: false, url };
}

/** The published test cards and what Stripe does with each (docs.stripe.com/testing). */
const TEST_CARDS: Record<
	string,
	{
		outcome: 'success' | 'decline' | 'authenticate';
		code?: string;
		message?: string;
		brand: string;
	}
> = {
	'4242424242424242': { outcome: 'success', brand: 'visa' },
	'4000000000000002': {
		outcome: 'decline',
		code: 'generic_decline',
		message: 'Your card was declined.',
		brand: 'visa'
	},
	'4000000000009995': {
		outcome: 'decline',
		code: 'insufficient_funds',
		message: 'Your card has insufficient funds.',
		brand: 'visa'
	},
	'4000002500003155': { outcome: 'authenticate', brand: 'visa' }
};

const AUTHENTICATION_FAILED =
	'We are unable to authenticate your payment method. Please choose a different payment method and try again.';

/** Luhn check digit test (ISO/IEC 7812-1). */
function luhnValid(digits: string): boolean {
	let sum = 0;
	for (let i = 0; i < digits.length; i++) {
		let d = Number(digits[digits.length - 1 - i]);
		if (i % 2 === 1) {
			d *= 2;
			if (d > 9) d -= 9;
		}
		sum += d;
	}
	return digits.length >= 12 && sum % 10 === 0;
}

/** Starts the payments fake. */
export async function startStripeFake(options: StripeFakeOptions): Promise<StripeFake> {
	const file = options.dataDir ? join(options.dataDir, 'stripe', 'state.json') : null;
	let state = emptyState();
	if (file) {
		try {
			state = { ...emptyState(), ...(JSON.parse(readFileSync(file, 'utf8')) as State) };
		} catch {
			// First start: nothing kept yet.
		}
	}
	for (const demo of DEMO_CONNECTED_ACCOUNTS) {
		state.accounts[demo.id] ??= onboardedAccount(demo.id, demo.email, now());
	}

	const save = (): void => {
		if (!file) return;
		mkdirSync(join(file, '..'), { recursive: true });
		writeFileSync(`${file}.tmp`, JSON.stringify(state));
		renameSync(`${file}.tmp`, file);
	};

	// Switches, set through /control (never kept on disk).
	// `skip` lets that many requests through before the failures start (fail the second of two).
	let failNext = { count: 0, status: 500, skip: 0 };
	let delayMs = 0;
	// The next `count` API writes (POSTs) do their work (and keep it for their idempotency key),
	// then hold the answer for `ms`: a provider slow to answer, not one that did nothing. Reads
	// stay quick, so a test can look at what the provider holds meanwhile.
	let slowNext = { count: 0, ms: 0 };
	let duplicateNext = 0;
	let webhookUrl = options.webhookUrl ?? null;
	let webhookSecret = options.webhookSecret ?? null;
	const retryBaseMs = options.retryBaseMs ?? 1000;
	const maxAttempts = options.maxAttempts ?? 8;
	const deliveries: WebhookDelivery[] = [];
	const timers = new Set<NodeJS.Timeout>();
	const inFlight = new Set<string>();
	let base = '';
	// Held answers, released at once when the fake closes.
	const holds = new Set<() => void>();
	const hold = (ms: number) =>
		new Promise<void>((resolve) => {
			const done = () => {
				clearTimeout(timer);
				holds.delete(done);
				resolve();
			};
			const timer = setTimeout(done, ms);
			holds.add(done);
		});

	// ---------------------------------------------------------------- events and webhooks

	function sign(payload: string, secret: string, timestamp = now()): string {
		const v1 = createHmac('sha256', secret).update(`${timestamp}.${payload}`).digest('hex');
		return `t=${timestamp},v1=${v1}`;
	}

	async function deliver(eventId: string, attempt: number): Promise<void> {
		const event = state.events[eventId];
		if (!event || !webhookUrl || !webhookSecret) return;
		const payload = JSON.stringify(event, null, 2);
		let status: number | null = null;
		let error: string | null = null;
		try {
			const res = await fetch(webhookUrl, {
				method: 'POST',
				headers: {
					'content-type': 'application/json; charset=utf-8',
					'user-agent': 'Stripe/1.0 (+https://stripe.com/docs/webhooks)',
					'stripe-signature': sign(payload, webhookSecret)
				},
				body: payload,
				signal: AbortSignal.timeout(10_000)
			});
			status = res.status;
			await res.arrayBuffer();
		} catch (err) {
			error = err instanceof Error ? err.message : String(err);
		}
		deliveries.push({
			eventId,
			type: event.type,
			attempt,
			status,
			error,
			at: new Date().toISOString()
		});
		const ok = status !== null && status >= 200 && status < 300;
		if (ok) {
			if (event.pending_webhooks > 0) {
				event.pending_webhooks = 0;
				save();
			}
			return;
		}
		if (attempt >= maxAttempts) return;
		const timer = setTimeout(
			() => {
				timers.delete(timer);
				void deliver(eventId, attempt + 1);
			},
			retryBaseMs * 2 ** (attempt - 1)
		);
		timers.add(timer);
	}

	/**
	 * Records an event and delivers it. Events caused by a hosted page await the first attempt, so
	 * the page redirects after the app has heard; events caused by an API request are sent after it
	 * (the caller may hold locks its own webhook handler needs).
	 */
	async function emit(
		type: string,
		object: Obj,
		requestInfo: { id: string | null; idempotency_key: string | null } | null = null
	): Promise<void> {
		const event = {
			id: newId('evt_1'),
			object: 'event',
			api_version: API_VERSION,
			created: now(),
			data: { object: structuredClone(stripPrivate(object)) },
			livemode: false,
			pending_webhooks: webhookUrl ? 1 : 0,
			request: requestInfo ?? { id: null, idempotency_key: null },
			type
		};
		state.events[event.id] = event;
		state.eventOrder.push(event.id);
		save();
		const twice = duplicateNext > 0;
		if (twice) duplicateNext--;
		const send = async () => {
			await deliver(event.id, 1);
			if (twice) await deliver(event.id, 1);
		};
		if (requestInfo) setImmediate(() => void send());
		else await send();
	}

	// Events whose delivery a restart interrupted go out again.
	for (const id of state.eventOrder) {
		if ((state.events[id]?.pending_webhooks ?? 0) > 0) {
			const timer = setTimeout(() => {
				timers.delete(timer);
				void deliver(id, 1);
			}, 0);
			timers.add(timer);
		}
	}

	// ---------------------------------------------------------------- API objects

	function stripPrivate<T extends Obj>(object: T): T {
		return Object.fromEntries(Object.entries(object).filter(([k]) => !k.startsWith('_'))) as T;
	}

	function platformBalance(): number {
		let cents = 0;
		for (const c of Object.values(state.charges)) if (c.paid) cents += c.amount_captured;
		for (const r of Object.values(state.refunds)) cents -= r.amount;
		for (const t of Object.values(state.transfers)) cents -= t.amount;
		return cents;
	}

	function accountBalance(accountId: string): number {
		let cents = 0;
		for (const t of Object.values(state.transfers))
			if (t.destination === accountId) cents += t.amount;
		return cents;
	}

	function createAccount(params: Obj): Account {
		const type = stringParam(params, 'type') ?? 'express';
		if (type !== 'express') {
			throw new StripeError(
				400,
				'invalid_request_error',
				'This fake creates Express accounts only.',
				{ param: 'type' }
			);
		}
		const account: Account = {
			id: newId('acct_1', 16),
			object: 'account',
			type: 'express',
			email: stringParam(params, 'email') ?? null,
			country: (stringParam(params, 'country') ?? 'AU').toUpperCase(),
			default_currency: 'aud',
			details_submitted: false,
			charges_enabled: false,
			payouts_enabled: false,
			capabilities: { transfers: 'inactive' },
			metadata: metadataParam(params),
			created: now()
		};
		state.accounts[account.id] = account;
		return account;
	}

	function createAccountLink(params: Obj) {
		const accountId = stringParam(params, 'account', true);
		if (!state.accounts[accountId]) throw noSuch('account', accountId, 'account');
		const type = stringParam(params, 'type', true);
		if (type !== 'account_onboarding') {
			throw new StripeError(
				400,
				'invalid_request_error',
				`Invalid type: must be account_onboarding`,
				{ param: 'type' }
			);
		}
		const returnUrl = stringParam(params, 'return_url', true);
		const refreshUrl = stringParam(params, 'refresh_url', true);
		const token = newId('', 32);
		const expires = now() + 300;
		state.accountLinks[token] = {
			account: accountId,
			return_url: returnUrl,
			refresh_url: refreshUrl,
			expires_at: expires,
			used: false
		};
		return {
			object: 'account_link',
			created: now(),
			expires_at: expires,
			url: `${base}/connect/onboarding/${token}`
		};
	}

	function createSession(params: Obj): Session {
		if (stringParam(params, 'mode', true) !== 'payment') {
			throw new StripeError(400, 'invalid_request_error', 'This fake supports mode=payment only.', {
				param: 'mode'
			});
		}
		const successUrl = stringParam(params, 'success_url', true);
		const items = params.line_items;
		if (!Array.isArray(items) || items.length === 0) throw missing('line_items');
		let amount = 0;
		let currency: string | null = null;
		let name = '';
		for (const [i, raw] of items.entries()) {
			const item = raw as Obj;
			const price = (item.price_data ?? {}) as Obj;
			const unit = amountParam(price, 'unit_amount', true)!;
			const quantity = amountParam(item, 'quantity', false) ?? 1;
			const itemCurrency = stringParam(price, 'currency', true).toLowerCase();
			if (currency && currency !== itemCurrency) {
				throw new StripeError(
					400,
					'invalid_request_error',
					'All line items must use the same currency.',
					{ param: `line_items[${i}][price_data][currency]` }
				);
			}
			currency = itemCurrency;
			amount += unit * quantity;
			const product = (price.product_data ?? {}) as Obj;
			name ||= String(product.name ?? 'Payment');
		}
		const intentData = (params.payment_intent_data ?? {}) as Obj;
		const created = now();
		const expiresAt = amountParam(params, 'expires_at', false) ?? created + 24 * 3600;
		const id = newId('cs_test_a1', 48);
		const session: Session = {
			id,
			object: 'checkout.session',
			amount_subtotal: amount,
			amount_total: amount,
			currency: currency ?? 'aud',
			status: 'open',
			payment_status: 'unpaid',
			payment_intent: null,
			mode: 'payment',
			success_url: successUrl,
			cancel_url: stringParam(params, 'cancel_url') ?? null,
			url: `${base}/checkout/pay/${id}`,
			metadata: metadataParam(params),
			client_reference_id: stringParam(params, 'client_reference_id') ?? null,
			customer_email: stringParam(params, 'customer_email') ?? null,
			expires_at: expiresAt,
			created,
			livemode: false,
			_intent: {
				transfer_group: stringParam(intentData, 'transfer_group') ?? null,
				metadata: metadataParam(intentData),
				description: stringParam(intentData, 'description') ?? name
			},
			_name: name
		};
		state.sessions[id] = session;
		return session;
	}

	function findSession(id: string): Session {
		const session = state.sessions[id];
		if (!session) throw noSuch('checkout.session', id);
		if (session.status === 'open' && session.expires_at <= now()) session.status = 'expired';
		return session;
	}

	function createRefund(params: Obj) {
		let chargeId = stringParam(params, 'charge');
		const intentId = stringParam(params, 'payment_intent');
		if (!chargeId && intentId) {
			const intent = state.paymentIntents[intentId];
			if (!intent) throw noSuch('payment_intent', intentId, 'payment_intent');
			chargeId = intent.latest_charge ?? undefined;
		}
		if (!chargeId) throw missing('charge');
		const charge = state.charges[chargeId];
		if (!charge) throw noSuch('charge', chargeId, 'charge');
		if (!charge.paid) {
			throw new StripeError(
				400,
				'invalid_request_error',
				`Charge ${charge.id} has not been captured, so it cannot be refunded.`,
				{ code: 'charge_not_refundable' }
			);
		}
		const left = charge.amount_captured - charge.amount_refunded;
		if (left === 0) {
			throw new StripeError(
				400,
				'invalid_request_error',
				`Charge ${charge.id} has already been refunded.`,
				{ code: 'charge_already_refunded' }
			);
		}
		const amount = amountParam(params, 'amount', false) ?? left;
		if (amount > left) {
			throw new StripeError(
				400,
				'invalid_request_error',
				`Refund amount ($${(amount / 100).toFixed(2)}) is greater than unrefunded amount on charge ($${(left / 100).toFixed(2)})`,
				{ param: 'amount', code: 'amount_too_large' }
			);
		}
		charge.amount_refunded += amount;
		charge.refunded = charge.amount_refunded === charge.amount_captured;
		const refund = {
			id: newId('re_3'),
			object: 'refund',
			amount,
			charge: charge.id,
			payment_intent: charge.payment_intent,
			currency: String(charge.currency),
			reason: stringParam(params, 'reason') ?? null,
			status: 'succeeded',
			metadata: metadataParam(params),
			created: now(),
			balance_transaction: newId('txn_3')
		};
		state.refunds[refund.id] = refund;
		return { refund, charge };
	}

	function createTransfer(params: Obj) {
		const amount = amountParam(params, 'amount', true)!;
		const currency = stringParam(params, 'currency', true).toLowerCase();
		const destination = stringParam(params, 'destination', true);
		const account = state.accounts[destination];
		if (!account) throw noSuch('destination', destination, 'destination');
		if (account.capabilities.transfers !== 'active') {
			throw new StripeError(
				400,
				'invalid_request_error',
				'Your destination account needs to have at least one of the following capabilities enabled: transfers, crypto_transfers, legacy_payments',
				{ param: 'destination', code: 'insufficient_capabilities_for_transfer' }
			);
		}
		if (amount > platformBalance()) {
			throw new StripeError(
				400,
				'invalid_request_error',
				'You have insufficient available funds in your Stripe account. Try adding funds directly to your available balance by creating Charges using the 4000000000000077 test card.',
				{ code: 'balance_insufficient' }
			);
		}
		const transfer = {
			id: newId('tr_1'),
			object: 'transfer',
			amount,
			amount_reversed: 0,
			currency,
			destination,
			destination_payment: newId('py_1'),
			transfer_group: stringParam(params, 'transfer_group') ?? null,
			source_transaction: stringParam(params, 'source_transaction') ?? null,
			description: stringParam(params, 'description') ?? null,
			metadata: metadataParam(params),
			reversed: false,
			created: now(),
			balance_transaction: newId('txn_1')
		};
		state.transfers[transfer.id] = transfer;
		return transfer;
	}

	/** One card attempt on a session: a charge (paid or failed) on the session's PaymentIntent. */
	async function attemptCharge(
		session: Session,
		card: string,
		outcome: { paid: true } | { paid: false; code: string; declineCode?: string; message: string }
	): Promise<void> {
		let intent = session.payment_intent ? state.paymentIntents[session.payment_intent] : undefined;
		if (!intent) {
			intent = {
				id: newId('pi_3'),
				object: 'payment_intent',
				amount: session.amount_total,
				amount_received: 0,
				currency: session.currency,
				status: 'requires_payment_method',
				transfer_group: session._intent.transfer_group,
				metadata: session._intent.metadata,
				description: session._intent.description,
				latest_charge: null,
				last_payment_error: null,
				created: now(),
				livemode: false
			};
			state.paymentIntents[intent.id] = intent;
			session.payment_intent = intent.id;
		}
		const charge: Charge = {
			id: newId('ch_3'),
			object: 'charge',
			amount: session.amount_total,
			amount_captured: outcome.paid ? session.amount_total : 0,
			amount_refunded: 0,
			currency: session.currency,
			paid: outcome.paid,
			captured: outcome.paid,
			refunded: false,
			status: outcome.paid ? 'succeeded' : 'failed',
			payment_intent: intent.id,
			transfer_group: session._intent.transfer_group,
			metadata: session._intent.metadata,
			failure_code: outcome.paid ? null : outcome.code,
			failure_message: outcome.paid ? null : outcome.message,
			outcome: outcome.paid
				? {
						type: 'authorized',
						network_status: 'approved_by_network',
						seller_message: 'Payment complete.'
					}
				: {
						type: 'issuer_declined',
						network_status: 'declined_by_network',
						reason: outcome.declineCode ?? outcome.code,
						seller_message: 'The bank did not return any further details with this decline.'
					},
			payment_method_details: {
				type: 'card',
				card: { brand: TEST_CARDS[card]?.brand ?? 'visa', last4: card.slice(-4), country: 'AU' }
			},
			balance_transaction: outcome.paid ? newId('txn_3') : null,
			created: now(),
			livemode: false
		};
		state.charges[charge.id] = charge;
		intent.latest_charge = charge.id;
		if (outcome.paid) {
			intent.status = 'succeeded';
			intent.amount_received = charge.amount;
			intent.last_payment_error = null;
			session.status = 'complete';
			session.payment_status = 'paid';
			save();
			await emit('charge.succeeded', charge);
			await emit('payment_intent.succeeded', intent);
			await emit('checkout.session.completed', session);
		} else {
			intent.status = 'requires_payment_method';
			intent.last_payment_error = {
				type: 'card_error',
				code: outcome.code,
				decline_code: outcome.declineCode ?? null,
				message: outcome.message,
				charge: charge.id
			};
			save();
			await emit('charge.failed', charge);
			await emit('payment_intent.payment_failed', intent);
		}
	}

	// ---------------------------------------------------------------- API routing

	async function api(
		method: string,
		path: string,
		params: Obj,
		requestInfo: { id: string; idempotency_key: string | null },
		stripeAccount: string | null
	): Promise<unknown> {
		const parts = path.split('/').filter(Boolean); // ['v1', ...]
		const [, resource, id, action] = parts;
		const listUrl = `/${parts.join('/')}`;
		if (method === 'POST' && resource === 'accounts' && !id) {
			const account = createAccount(params);
			return account;
		}
		if (method === 'GET' && resource === 'accounts' && id) {
			const account = state.accounts[id];
			if (!account) throw noSuch('account', id);
			return account;
		}
		if (method === 'POST' && resource === 'account_links' && !id) return createAccountLink(params);
		if (resource === 'checkout' && id === 'sessions') {
			const sessionId = action;
			const sub = parts[4];
			if (method === 'POST' && !sessionId) return createSession(params);
			if (method === 'GET' && sessionId) return stripPrivate(findSession(sessionId));
			if (method === 'POST' && sessionId && sub === 'expire') {
				const session = findSession(sessionId);
				if (session.status !== 'open') {
					throw new StripeError(
						400,
						'invalid_request_error',
						`Only Checkout Sessions with a status in ["open"] can be expired. This Checkout Session has a status of "${session.status}".`
					);
				}
				session.status = 'expired';
				session.url = null;
				await emit('checkout.session.expired', session, requestInfo);
				return stripPrivate(session);
			}
		}
		if (method === 'GET' && resource === 'payment_intents' && id) {
			const intent = state.paymentIntents[id];
			if (!intent) throw noSuch('payment_intent', id);
			return intent;
		}
		if (method === 'GET' && resource === 'charges' && id) {
			const charge = state.charges[id];
			if (!charge) throw noSuch('charge', id);
			return charge;
		}
		if (resource === 'refunds') {
			if (method === 'POST' && !id) {
				const { refund, charge } = createRefund(params);
				await emit('refund.created', refund, requestInfo);
				await emit('charge.refunded', charge, requestInfo);
				return refund;
			}
			if (method === 'GET' && id) {
				const refund = state.refunds[id];
				if (!refund) throw noSuch('refund', id);
				return refund;
			}
			if (method === 'GET') {
				const charge = stringParam(params, 'charge');
				return list(
					listUrl,
					Object.values(state.refunds).filter((r) => !charge || r.charge === charge)
				);
			}
		}
		if (resource === 'transfers') {
			if (method === 'POST' && !id) {
				const transfer = createTransfer(params);
				await emit('transfer.created', transfer, requestInfo);
				return transfer;
			}
			if (method === 'GET' && id) {
				const transfer = state.transfers[id];
				if (!transfer) throw noSuch('transfer', id);
				return transfer;
			}
			if (method === 'GET') {
				const group = stringParam(params, 'transfer_group');
				const destination = stringParam(params, 'destination');
				return list(
					listUrl,
					Object.values(state.transfers).filter(
						(t) =>
							(!group || t.transfer_group === group) &&
							(!destination || t.destination === destination)
					)
				);
			}
		}
		if (method === 'GET' && resource === 'balance') {
			const amount = stripeAccount ? accountBalance(stripeAccount) : platformBalance();
			return {
				object: 'balance',
				available: [{ amount, currency: 'aud', source_types: { card: amount } }],
				pending: [{ amount: 0, currency: 'aud', source_types: { card: 0 } }],
				livemode: false
			};
		}
		if (resource === 'events') {
			if (method === 'GET' && id) {
				const event = state.events[id];
				if (!event) throw noSuch('event', id);
				return event;
			}
			if (method === 'GET') {
				const type = stringParam(params, 'type');
				return list(
					listUrl,
					state.eventOrder
						.map((e) => state.events[e]!)
						.filter((e) => !type || e.type === type)
						.reverse()
				);
			}
		}
		throw new StripeError(
			404,
			'invalid_request_error',
			`Unrecognized request URL (${method}: ${path}). Please see https://stripe.com/docs or we can help at https://support.stripe.com/.`
		);
	}

	async function handleApi(req: IncomingMessage, res: ServerResponse, url: URL): Promise<void> {
		const requestId = newId('req_', 14);
		const headers: Record<string, string> = {
			'request-id': requestId,
			'stripe-version': String(req.headers['stripe-version'] ?? API_VERSION)
		};
		const answer = (status: number, body: unknown, extra: Record<string, string> = {}) => {
			const text = JSON.stringify(body);
			res.writeHead(status, {
				'content-type': 'application/json',
				'content-length': Buffer.byteLength(text),
				...headers,
				...extra
			});
			res.end(text);
		};
		if (delayMs > 0) await new Promise((r) => setTimeout(r, delayMs));
		const auth = String(req.headers.authorization ?? '');
		const key = /^Bearer (sk_test_\w+)$/.exec(auth)?.[1];
		if (!key) {
			answer(
				401,
				new StripeError(
					401,
					'invalid_request_error',
					"You did not provide an API key. You need to provide your API key in the Authorization header, using Bearer auth (e.g. 'Authorization: Bearer YOUR_SECRET_KEY')."
				).toJSON()
			);
			return;
		}
		if (failNext.count > 0 && failNext.skip > 0) {
			failNext.skip--;
		} else if (failNext.count > 0) {
			failNext.count--;
			answer(
				failNext.status,
				new StripeError(
					failNext.status,
					'api_error',
					'An unknown error occurred (the payments fake was told to fail this request).'
				).toJSON(),
				{ 'stripe-should-retry': 'false' }
			);
			return;
		}
		const method = req.method ?? 'GET';
		const holdAnswerMs = method === 'POST' && slowNext.count > 0 ? slowNext.ms : 0;
		if (holdAnswerMs > 0) slowNext.count--;
		const raw =
			method === 'GET' ? url.search.slice(1) : (await readBody(req, 1024 * 1024)).toString('utf8');
		const params = qs.parse(raw, { depth: 10, arrayLimit: 100 }) as Obj;
		const idempotencyKey =
			method === 'POST' ? ((req.headers['idempotency-key'] as string | undefined) ?? null) : null;
		const stripeAccount = (req.headers['stripe-account'] as string | undefined) ?? null;
		const fingerprint = `${method} ${url.pathname} ${JSON.stringify(params)}`;
		const scopedKey = idempotencyKey ? `${key}:${idempotencyKey}` : null;
		if (idempotencyKey) headers['idempotency-key'] = idempotencyKey;
		if (scopedKey) {
			const stored = state.idempotency[scopedKey];
			if (stored) {
				if (stored.fingerprint !== fingerprint) {
					answer(
						400,
						new StripeError(
							400,
							'idempotency_error',
							`Keys for idempotent requests can only be used with the same parameters they were first used with. Try using a key other than '${idempotencyKey}' if you meant to execute a different request.`
						).toJSON()
					);
					return;
				}
				answer(stored.status, stored.body, { 'idempotent-replayed': 'true' });
				return;
			}
			if (inFlight.has(scopedKey)) {
				answer(
					409,
					new StripeError(
						409,
						'idempotency_error',
						'There is currently another in-progress request using this Idempotent Key (that probably means you submitted twice, and the other request is still going through): ' +
							idempotencyKey +
							'. Please try again later.'
					).toJSON()
				);
				return;
			}
			inFlight.add(scopedKey);
		}
		try {
			let status = 200;
			let body: unknown;
			try {
				body = await api(
					method,
					url.pathname,
					params,
					{ id: requestId, idempotency_key: idempotencyKey },
					stripeAccount
				);
			} catch (err) {
				if (!(err instanceof StripeError)) throw err;
				status = err.status;
				body = err.toJSON();
			}
			// Stripe keeps the result of a request that began executing, errors included.
			if (scopedKey) state.idempotency[scopedKey] = { fingerprint, status, body };
			if (method === 'POST') save();
			if (holdAnswerMs > 0) await hold(holdAnswerMs);
			answer(status, body);
		} finally {
			if (scopedKey) inFlight.delete(scopedKey);
		}
	}

	// ---------------------------------------------------------------- hosted pages

	function page(title: string, body: string): string {
		return `<!doctype html><html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1"><title>${escapeHtml(title)}</title>
<style>body{font-family:system-ui,sans-serif;max-width:28rem;margin:2rem auto;padding:0 1rem;color:#1a1a1a}label{display:block;margin-top:.8rem;font-weight:600}input{display:block;width:100%;padding:.5rem;font-size:1rem;box-sizing:border-box}button{margin-top:1rem;padding:.6rem 1rem;font-size:1rem}.problem{background:#fde8e8;color:#8a1010;padding:.6rem;border-radius:4px}.note{color:#555;font-size:.9rem}</style></head>
<body><p class="note">Test mode: payments fake. No real money moves.</p>${body}</body></html>`;
	}

	function sendHtml(res: ServerResponse, status: number, html: string): void {
		res.writeHead(status, {
			'content-type': 'text/html; charset=utf-8',
			'content-length': Buffer.byteLength(html),
			'cache-control': 'no-store'
		});
		res.end(html);
	}

	function redirectTo(res: ServerResponse, location: string): void {
		res.writeHead(303, { location, 'content-length': 0 });
		res.end();
	}

	function cardForm(session: Session, problem: string | null): string {
		const amount = `$${(session.amount_total / 100).toFixed(2)} ${session.currency.toUpperCase()}`;
		return page(
			`Pay ${amount}`,
			`<h1>Pay ${escapeHtml(amount)}</h1><p>${escapeHtml(session._name)}</p>
${problem ? `<p class="problem" role="alert" data-testid="card-problem">${escapeHtml(problem)}</p>` : ''}
<form method="post" action="/checkout/pay/${session.id}">
<label for="card">Card number</label><input id="card" name="card" inputmode="numeric" autocomplete="cc-number" required>
<label for="expiry">Expiry (MM / YY)</label><input id="expiry" name="expiry" placeholder="12 / 34" required>
<label for="cvc">CVC</label><input id="cvc" name="cvc" inputmode="numeric" required>
<label for="name">Name on card</label><input id="name" name="name">
<button type="submit">Pay ${escapeHtml(amount)}</button></form>
${session.cancel_url ? `<p><a href="${escapeHtml(session.cancel_url)}">Cancel and go back</a></p>` : ''}
<p class="note">Test cards: 4242 4242 4242 4242 succeeds; 4000 0000 0000 0002 is declined; 4000 0000 0000 9995 has insufficient funds; 4000 0025 0000 3155 asks for authentication.</p>`
		);
	}

	function expiryProblem(expiry: string): string | null {
		const m = /^\s*(\d{1,2})\s*\/\s*(\d{2}|\d{4})\s*$/.exec(expiry);
		if (!m) return "Your card's expiration date is incomplete.";
		const month = Number(m[1]);
		const year = m[2]!.length === 2 ? 2000 + Number(m[2]) : Number(m[2]);
		if (month < 1 || month > 12) return "Your card's expiration month is invalid.";
		const d = new Date();
		if (year < d.getUTCFullYear() || (year === d.getUTCFullYear() && month < d.getUTCMonth() + 1)) {
			return "Your card's expiration year is in the past.";
		}
		return null;
	}

	async function handleHosted(
		req: IncomingMessage,
		res: ServerResponse,
		url: URL
	): Promise<boolean> {
		const onboarding = /^\/connect\/onboarding\/(\w+)$/.exec(url.pathname);
		if (onboarding) {
			const link = state.accountLinks[onboarding[1]!];
			if (!link) {
				sendHtml(res, 404, page('Link not found', '<h1>This link is not valid</h1>'));
				return true;
			}
			if (link.used || link.expires_at <= now()) {
				// Account links are single-use and short-lived; Stripe sends the person to refresh_url.
				redirectTo(res, link.refresh_url);
				return true;
			}
			const account = state.accounts[link.account]!;
			if (req.method === 'POST') {
				const form = new URLSearchParams((await readBody(req, 64 * 1024)).toString('utf8'));
				const bsb = (form.get('bsb') ?? '').replace(/\D/g, '');
				const number = (form.get('account_number') ?? '').replace(/\D/g, '');
				const name = (form.get('business_name') ?? '').trim();
				if (bsb.length !== 6 || number.length < 5 || number.length > 9 || !name) {
					sendHtml(
						res,
						400,
						onboardingForm(
							onboarding[1]!,
							account,
							'Enter the business name, a 6-digit BSB and an account number of 5 to 9 digits.'
						)
					);
					return true;
				}
				link.used = true;
				Object.assign(account, {
					details_submitted: true,
					charges_enabled: true,
					payouts_enabled: true,
					capabilities: { ...account.capabilities, transfers: 'active' },
					business_profile: { name },
					external_accounts: {
						object: 'list',
						data: [
							{
								object: 'bank_account',
								last4: number.slice(-4),
								routing_number: bsb,
								currency: 'aud',
								country: 'AU'
							}
						]
					}
				});
				save();
				await emit('account.updated', account);
				redirectTo(res, link.return_url);
				return true;
			}
			sendHtml(res, 200, onboardingForm(onboarding[1]!, account, null));
			return true;
		}
		const pay = /^\/checkout\/pay\/(\w+?)(\/authenticate)?$/.exec(url.pathname);
		if (pay) {
			const session = state.sessions[pay[1]!];
			if (!session) {
				sendHtml(res, 404, page('Not found', '<h1>This payment page does not exist</h1>'));
				return true;
			}
			findSession(session.id);
			const successUrl = session.success_url.replace('{CHECKOUT_SESSION_ID}', session.id);
			if (session.status === 'complete') {
				sendHtml(
					res,
					200,
					page(
						'Paid',
						`<h1>This payment is complete</h1><p><a href="${escapeHtml(successUrl)}">Continue</a></p>`
					)
				);
				return true;
			}
			if (session.status === 'expired') {
				sendHtml(
					res,
					410,
					page(
						'Expired',
						`<h1>This payment page has expired</h1>${session.cancel_url ? `<p><a href="${escapeHtml(session.cancel_url)}">Go back</a></p>` : ''}`
					)
				);
				return true;
			}
			if (pay[2]) {
				// The issuer's authentication step (3D Secure) for 4000002500003155.
				if (req.method === 'POST') {
					const form = new URLSearchParams((await readBody(req, 64 * 1024)).toString('utf8'));
					if (form.get('result') === 'complete') {
						await attemptCharge(session, '4000002500003155', { paid: true });
						redirectTo(res, successUrl);
					} else {
						await attemptCharge(session, '4000002500003155', {
							paid: false,
							code: 'payment_intent_authentication_failure',
							message: AUTHENTICATION_FAILED
						});
						sendHtml(res, 402, cardForm(session, AUTHENTICATION_FAILED));
					}
					return true;
				}
				sendHtml(
					res,
					200,
					page(
						'Authenticate',
						`<h1>Authenticate this payment</h1><p>Your bank asks you to confirm this payment (test mode).</p>
<form method="post"><button name="result" value="complete">Complete authentication</button> <button name="result" value="fail">Fail authentication</button></form>`
					)
				);
				return true;
			}
			if (req.method === 'POST') {
				const form = new URLSearchParams((await readBody(req, 64 * 1024)).toString('utf8'));
				const card = (form.get('card') ?? '').replace(/[\s-]/g, '');
				const problem =
					!/^\d+$/.test(card) || !luhnValid(card)
						? 'Your card number is incorrect.'
						: (expiryProblem(form.get('expiry') ?? '') ??
							(/^\d{3,4}$/.test((form.get('cvc') ?? '').trim())
								? null
								: "Your card's security code is incomplete."));
				if (problem) {
					sendHtml(res, 400, cardForm(session, problem));
					return true;
				}
				const known = TEST_CARDS[card];
				if (known?.outcome === 'authenticate') {
					redirectTo(res, `/checkout/pay/${session.id}/authenticate`);
					return true;
				}
				if (known?.outcome === 'success') {
					await attemptCharge(session, card, { paid: true });
					redirectTo(res, successUrl);
					return true;
				}
				const decline = known ?? {
					code: 'card_declined',
					message:
						'Your card was declined. Your request was in test mode, but used a non test card. For a list of valid test cards, visit: https://stripe.com/docs/testing.'
				};
				await attemptCharge(session, card, {
					paid: false,
					code: 'card_declined',
					declineCode: decline.code,
					message: decline.message!
				});
				sendHtml(res, 402, cardForm(session, decline.message!));
				return true;
			}
			sendHtml(res, 200, cardForm(session, null));
			return true;
		}
		return false;
	}

	function onboardingForm(token: string, account: Account, problem: string | null): string {
		return page(
			'Set up payouts',
			`<h1>Set up payouts</h1><p>Account ${escapeHtml(account.id)}${account.email ? ` for ${escapeHtml(account.email)}` : ''}.</p>
${problem ? `<p class="problem" role="alert">${escapeHtml(problem)}</p>` : ''}
<form method="post" action="/connect/onboarding/${token}">
<label for="business_name">Business name</label><input id="business_name" name="business_name" required>
<label for="bsb">BSB</label><input id="bsb" name="bsb" inputmode="numeric" placeholder="000-000" required>
<label for="account_number">Account number</label><input id="account_number" name="account_number" inputmode="numeric" required>
<button type="submit">Agree and submit</button></form>
<p class="note">Test mode: BSB 000-000 and account number 000123456 work.</p>`
		);
	}

	// ---------------------------------------------------------------- control API (tests)

	async function handleControl(
		req: IncomingMessage,
		res: ServerResponse,
		url: URL
	): Promise<boolean> {
		if (!url.pathname.startsWith('/control/')) return false;
		const body =
			req.method === 'POST'
				? (JSON.parse((await readBody(req, 64 * 1024)).toString('utf8') || '{}') as Obj)
				: {};
		const path = url.pathname.slice('/control'.length);
		if (path === '/fail-next' && req.method === 'POST') {
			failNext = {
				count: Number(body.count ?? 1),
				status: Number(body.status ?? 500),
				skip: Number(body.skip ?? 0)
			};
			sendJson(res, 200, failNext);
		} else if (path === '/slow' && req.method === 'POST') {
			delayMs = Number(body.ms ?? 0);
			sendJson(res, 200, { ms: delayMs });
		} else if (path === '/slow-next' && req.method === 'POST') {
			slowNext = { count: Number(body.count ?? 1), ms: Number(body.ms ?? 0) };
			sendJson(res, 200, slowNext);
		} else if (path === '/duplicate-next' && req.method === 'POST') {
			duplicateNext = Number(body.count ?? 1);
			sendJson(res, 200, { count: duplicateNext });
		} else if (path === '/webhook' && req.method === 'POST') {
			webhookUrl = typeof body.url === 'string' ? body.url : null;
			webhookSecret = typeof body.secret === 'string' ? body.secret : webhookSecret;
			sendJson(res, 200, { url: webhookUrl });
		} else if (path === '/deliveries' && req.method === 'GET') {
			sendJson(res, 200, deliveries);
		} else if (/^\/events\/\w+\/resend$/.test(path) && req.method === 'POST') {
			const id = path.split('/')[2]!;
			if (!state.events[id]) {
				sendJson(res, 404, { error: `No such event: ${id}` });
			} else {
				await deliver(id, 1);
				sendJson(res, 200, deliveries.filter((d) => d.eventId === id).at(-1));
			}
		} else if (/^\/checkout\/sessions\/\w+\/pay$/.test(path) && req.method === 'POST') {
			// Pays a session as its hosted page would, for tests that do not drive a browser.
			const session = state.sessions[path.split('/')[3]!];
			const card = String(body.card ?? '4242424242424242');
			const known = TEST_CARDS[card];
			if (!session || session.status !== 'open') {
				sendJson(res, 409, { error: 'No open session' });
				return true;
			}
			if (known?.outcome === 'decline') {
				await attemptCharge(session, card, {
					paid: false,
					code: 'card_declined',
					declineCode: known.code,
					message: known.message!
				});
			} else if (known?.outcome === 'authenticate' && body.authenticate !== true) {
				await attemptCharge(session, card, {
					paid: false,
					code: 'payment_intent_authentication_failure',
					message: AUTHENTICATION_FAILED
				});
			} else {
				await attemptCharge(session, card, { paid: true });
			}
			sendJson(res, 200, stripPrivate(session));
		} else {
			sendJson(res, 404, { error: 'No such control' });
		}
		return true;
	}

	const server = await listenHttp(
		async (req, res) => {
			const url = new URL(req.url ?? '/', 'http://fake');
			if (url.pathname.startsWith('/v1/')) return handleApi(req, res, url);
			if (await handleControl(req, res, url)) return;
			if (await handleHosted(req, res, url)) return;
			if (url.pathname === '/') {
				sendHtml(
					res,
					200,
					page(
						'Payments fake',
						`<h1>Payments fake</h1><p>${Object.keys(state.accounts).length} connected accounts, ${Object.keys(state.sessions).length} checkout sessions, ${state.eventOrder.length} events. Platform balance $${(platformBalance() / 100).toFixed(2)}.</p>`
					)
				);
				return;
			}
			sendJson(
				res,
				404,
				new StripeError(
					404,
					'invalid_request_error',
					`Unrecognized request URL (${req.method}: ${url.pathname}).`
				).toJSON()
			);
		},
		options.host,
		options.port
	);
	base = server.url;
	return {
		url: server.url,
		port: server.port,
		close: async () => {
			for (const timer of timers) clearTimeout(timer);
			timers.clear();
			for (const done of [...holds]) done();
			await server.close();
		}
	};
}
