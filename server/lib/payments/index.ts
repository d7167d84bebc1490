// The app's one door to the payment service, through the official `stripe` SDK.
// With `fake` set the SDK talks plain HTTP to the local fake (server/fakes/payments-fake.ts);
// without it, the same calls go to the real service with the configured secret key.
//
// Amounts: callers speak our minor units (ISO 4217 digits, shared/money.ts); this module converts to the
// integer the payment API expects with `chargeAmount` (zero-decimal, three-decimal "multiple of 10",
// ISK/UGX "two-decimal ending in 00": ../shared/reference/stripe_currency_decimals.tsv) and back with
// `fromChargeAmount`. Currencies go to the API in lower case and come back from this module in upper case.
import Stripe from 'stripe';
import { chargeAmount, chargeRule, fromChargeAmount } from '../../../shared/money';
import type { Clock } from '../clock';
import { systemClock } from '../clock';

export type PaymentEvent = Stripe.Event;

/** A call the payment service refused or could not answer (card errors, bad parameters, network). */
export class PaymentsError extends Error {
  constructor(
    message: string,
    /** the service's error type, e.g. invalid_request_error, card_error, idempotency_error, api_connection_error */
    public type: string,
    public code?: string,
    public statusCode?: number,
    options?: { cause?: unknown },
  ) {
    super(message, options);
    this.name = 'PaymentsError';
  }
}

/** The webhook body or its signature header did not verify: answer 400 and change nothing. */
export class WebhookSignatureError extends Error {
  constructor(message: string, options?: { cause?: unknown }) {
    super(message, options);
    this.name = 'WebhookSignatureError';
  }
}

export type PaymentsOptions = {
  /** STRIPE_SECRET_KEY, or the fake's `secretKey` */
  secretKey: string;
  /** STRIPE_WEBHOOK_SECRET (the endpoint's signing secret, `whsec_…`), or the fake's `webhookSecret` */
  webhookSecret: string;
  /** Point the SDK at the local fake over plain HTTP instead of the real service. */
  fake?: { host: string; port: number };
  /** Used for the webhook timestamp tolerance check; defaults to the system clock. */
  clock?: Clock;
  /** How old (seconds) a signed event may be; the SDK's default is 300. 0 turns the check off. */
  toleranceSeconds?: number;
  /** Network retries for the real service (the fake always gets 0). Every write carries an idempotency key. */
  maxNetworkRetries?: number;
  /** Request timeout in ms (SDK default 80 000). */
  timeoutMs?: number;
};

export type CreateCheckoutInput = {
  invoiceId: string | number;
  studioId: string | number;
  /** what to charge, in our minor units (ISO 4217 digits) */
  amountMinor: number;
  /** ISO 4217 code, any case */
  currency: string;
  /** the one line the payer sees, e.g. "Deposit for commission C-0042" */
  description: string;
  customerEmail?: string;
  /** may contain {CHECKOUT_SESSION_ID}, which the service replaces */
  successUrl: string;
  cancelUrl: string;
  /** the same key always gives back the same checkout (use one per invoice attempt, e.g. `checkout-${invoiceId}-${n}`) */
  idempotencyKey: string;
};

export type CheckoutCreated = {
  id: string;
  /** where to send the payer */
  url: string;
  /** the integer sent to the payment API (its own units) */
  amountCharged: number;
  /** what will be charged, back in our minor units: differs from the input only where the service rounds (KWD 5124 → 5120) */
  amountMinor: number;
  /** upper case */
  currency: string;
};

export type CheckoutInfo = {
  id: string;
  /** open, complete or expired */
  status: string | null;
  /** paid, unpaid or no_payment_required */
  paymentStatus: string;
  paid: boolean;
  /** amount_total converted back to our minor units (null if the service gave none) */
  amountMinor: number | null;
  /** upper case, or null */
  currency: string | null;
  paymentIntentId: string | null;
  invoiceId: string | null;
  studioId: string | null;
  url: string | null;
};

export type RefundInput = {
  paymentIntentId: string;
  /** in our minor units; omitted = refund everything still refundable */
  amountMinor?: number;
  /** the charge's currency; looked up from the payment intent when omitted and an amount is given */
  currency?: string;
  reason?: 'duplicate' | 'fraudulent' | 'requested_by_customer';
  /** e.g. { invoiceId, creditNoteId } — copied onto the refund and its events */
  metadata?: Record<string, string>;
  idempotencyKey: string;
};

export type RefundResult = {
  id: string;
  /** succeeded, pending, failed, canceled or requires_action */
  status: string | null;
  amountMinor: number;
  currency: string;
  paymentIntentId: string | null;
};

export type Payments = {
  /** 'fake' when the SDK points at the local fake */
  mode: 'fake' | 'live';
  createCheckout(input: CreateCheckoutInput): Promise<CheckoutCreated>;
  retrieveCheckout(id: string): Promise<CheckoutInfo>;
  refund(input: RefundInput): Promise<RefundResult>;
  /** Verifies the `Stripe-Signature` header over the exact raw body; throws WebhookSignatureError. */
  verifyEvent(rawBody: Buffer, signatureHeader: string | string[] | undefined): PaymentEvent;
  /** The SDK client, for calls this module does not wrap yet. */
  stripe: Stripe;
};

const LIVE_KEY = /^(sk|rk)_live_/;

function wrapError(err: unknown): never {
  if (err instanceof Stripe.errors.StripeError) {
    // rawType is the service's own error type (idempotency_error, card_error, …); connection errors have none.
    throw new PaymentsError(err.message, err.rawType ?? err.type, err.code, err.statusCode, { cause: err });
  }
  throw err;
}

function requireText(value: unknown, name: string, max = 5000): string {
  if (typeof value !== 'string' || value.trim() === '') throw new Error(`${name} is required`);
  if (value.length > max) throw new Error(`${name} is longer than ${max} characters`);
  return value;
}

function requireMinor(value: unknown, name: string): number {
  if (typeof value !== 'number' || !Number.isSafeInteger(value) || value <= 0) {
    throw new Error(`${name} must be a positive whole number of minor units, got ${String(value)}`);
  }
  return value;
}

/** Reads a checkout session (from the API or from an event) into our terms. */
export function checkoutInfo(session: Stripe.Checkout.Session): CheckoutInfo {
  const currency = session.currency ? session.currency.toUpperCase() : null;
  const pi = session.payment_intent;
  return {
    id: session.id,
    status: session.status ?? null,
    paymentStatus: session.payment_status,
    paid: session.payment_status === 'paid',
    amountMinor: currency && session.amount_total != null ? fromChargeAmount(session.amount_total, currency) : null,
    currency,
    paymentIntentId: typeof pi === 'string' ? pi : (pi?.id ?? null),
    invoiceId: session.metadata?.invoiceId ?? null,
    studioId: session.metadata?.studioId ?? null,
    url: session.url ?? null,
  };
}

/** For `checkout.session.completed` (and other checkout.session.*) events: the session in our terms, else null. */
export function checkoutFromEvent(event: PaymentEvent): CheckoutInfo | null {
  if (!event.type.startsWith('checkout.session.')) return null;
  return checkoutInfo(event.data.object as Stripe.Checkout.Session);
}

export function createPayments(opts: PaymentsOptions): Payments {
  const secretKey = requireText(opts.secretKey, 'The payment service secret key (STRIPE_SECRET_KEY)', 500);
  const webhookSecret = requireText(opts.webhookSecret, 'The webhook signing secret (STRIPE_WEBHOOK_SECRET)', 500);
  const clock = opts.clock ?? systemClock;
  if (opts.fake && LIVE_KEY.test(secretKey)) {
    throw new Error('Refusing to send a live payment key to the local fake: unset STRIPE_SECRET_KEY or remove the fake');
  }
  const stripe = opts.fake
    ? new Stripe(secretKey, {
        host: opts.fake.host,
        port: opts.fake.port,
        protocol: 'http',
        maxNetworkRetries: 0,
        telemetry: false,
        ...(opts.timeoutMs ? { timeout: opts.timeoutMs } : {}),
      })
    : new Stripe(secretKey, {
        maxNetworkRetries: opts.maxNetworkRetries ?? 2,
        telemetry: false,
        appInfo: { name: 'Sablework' },
        ...(opts.timeoutMs ? { timeout: opts.timeoutMs } : {}),
      });

  async function currencyOfPaymentIntent(id: string): Promise<string> {
    const pi = await stripe.paymentIntents.retrieve(id).catch(wrapError);
    return pi.currency;
  }

  return {
    mode: opts.fake ? 'fake' : 'live',
    stripe,

    async createCheckout(input) {
      const currency = requireText(input.currency, 'currency', 3).toUpperCase();
      chargeRule(currency); // throws for a code the service's amount rule is unknown for
      const amountMinor = requireMinor(input.amountMinor, 'amountMinor');
      const amountCharged = chargeAmount(amountMinor, currency);
      if (amountCharged <= 0) throw new Error(`${amountMinor} minor units of ${currency} round to nothing the payment service can charge`);
      const description = requireText(input.description, 'description', 500);
      const metadata = { invoiceId: String(input.invoiceId), studioId: String(input.studioId) };
      const params: Stripe.Checkout.SessionCreateParams = {
        mode: 'payment',
        line_items: [
          {
            quantity: 1,
            price_data: { currency: currency.toLowerCase(), unit_amount: amountCharged, product_data: { name: description } },
          },
        ],
        metadata,
        payment_intent_data: { metadata },
        client_reference_id: metadata.invoiceId,
        success_url: requireText(input.successUrl, 'successUrl'),
        cancel_url: requireText(input.cancelUrl, 'cancelUrl'),
        ...(input.customerEmail ? { customer_email: input.customerEmail } : {}),
      };
      const session = await stripe.checkout.sessions
        .create(params, { idempotencyKey: requireText(input.idempotencyKey, 'idempotencyKey', 255) })
        .catch(wrapError);
      if (!session.url) throw new PaymentsError('The payment service returned a checkout without a URL', 'api_error');
      const returned = (session.currency ?? '').toUpperCase();
      if (session.amount_total !== amountCharged || returned !== currency) {
        throw new PaymentsError(
          `The checkout came back as ${session.amount_total} ${returned}, not ${amountCharged} ${currency}`,
          'api_error',
        );
      }
      return { id: session.id, url: session.url, amountCharged, amountMinor: fromChargeAmount(amountCharged, currency), currency };
    },

    async retrieveCheckout(id) {
      const session = await stripe.checkout.sessions.retrieve(requireText(id, 'checkout id', 255)).catch(wrapError);
      return checkoutInfo(session);
    },

    async refund(input) {
      const paymentIntentId = requireText(input.paymentIntentId, 'paymentIntentId', 255);
      const idempotencyKey = requireText(input.idempotencyKey, 'idempotencyKey', 255);
      const params: Stripe.RefundCreateParams = { payment_intent: paymentIntentId };
      if (input.amountMinor !== undefined) {
        const amountMinor = requireMinor(input.amountMinor, 'amountMinor');
        const currency = (input.currency ?? (await currencyOfPaymentIntent(paymentIntentId))).toUpperCase();
        const apiAmount = chargeAmount(amountMinor, currency);
        // A refund must be exact: rounding it (as a charge may be) would refund a different sum than the credit note says.
        if (fromChargeAmount(apiAmount, currency) !== amountMinor) {
          const step = chargeRule(currency).minorStep;
          throw new Error(`A ${currency} refund must be a multiple of ${step} minor units for the payment service; ${amountMinor} is not`);
        }
        params.amount = apiAmount;
      }
      if (input.reason) params.reason = input.reason;
      if (input.metadata) params.metadata = input.metadata;
      const refund = await stripe.refunds.create(params, { idempotencyKey }).catch(wrapError);
      const currency = refund.currency.toUpperCase();
      const pi = refund.payment_intent;
      return {
        id: refund.id,
        status: refund.status,
        amountMinor: fromChargeAmount(refund.amount, currency),
        currency,
        paymentIntentId: typeof pi === 'string' ? pi : (pi?.id ?? null),
      };
    },

    verifyEvent(rawBody, signatureHeader) {
      if (!Buffer.isBuffer(rawBody)) throw new WebhookSignatureError('The webhook body must be the raw bytes as received');
      if (Array.isArray(signatureHeader) || !signatureHeader) throw new WebhookSignatureError('The webhook has no single Stripe-Signature header');
      try {
        return stripe.webhooks.constructEvent(rawBody, signatureHeader, webhookSecret, opts.toleranceSeconds, undefined, clock.now().getTime());
      } catch (err) {
        throw new WebhookSignatureError(err instanceof Error ? err.message : 'The webhook signature did not verify', { cause: err });
      }
    },
  };
}
