// In-memory state of the local payment-service fake: checkout sessions, payment intents, charges, refunds,
// events and idempotent replies. Objects follow the payment API's wire shape (snake_case, amounts as the
// API's integers, lower-case currency, unix-second timestamps) for the fields the app reads.
import crypto from 'node:crypto';
import { chargeRule } from '../../../shared/money';
import type { Clock } from '../../lib/clock';

export type Metadata = Record<string, string>;

export type FakeSession = {
  id: string;
  object: 'checkout.session';
  amount_subtotal: number;
  amount_total: number;
  cancel_url: string | null;
  client_reference_id: string | null;
  created: number;
  currency: string;
  customer_details: { email: string | null } | null;
  customer_email: string | null;
  expires_at: number;
  livemode: false;
  metadata: Metadata;
  mode: 'payment';
  payment_intent: string | null;
  payment_method_types: string[];
  payment_status: 'paid' | 'unpaid';
  status: 'open' | 'complete' | 'expired';
  success_url: string;
  url: string | null;
};

type SessionPrivate = {
  lineItems: { name: string; unitAmount: number; quantity: number; currency: string }[];
  paymentIntentMetadata: Metadata;
};

export type FakePaymentIntent = {
  id: string;
  object: 'payment_intent';
  amount: number;
  amount_received: number;
  created: number;
  currency: string;
  latest_charge: string;
  livemode: false;
  metadata: Metadata;
  payment_method_types: string[];
  status: 'succeeded';
};

export type FakeCharge = {
  id: string;
  object: 'charge';
  amount: number;
  amount_captured: number;
  amount_refunded: number;
  captured: true;
  created: number;
  currency: string;
  livemode: false;
  metadata: Metadata;
  paid: true;
  payment_intent: string;
  payment_method_details: { type: 'card'; card: { last4: string } };
  refunded: boolean;
  status: 'succeeded';
};

export type FakeRefund = {
  id: string;
  object: 'refund';
  amount: number;
  charge: string;
  created: number;
  currency: string;
  metadata: Metadata;
  payment_intent: string;
  reason: string | null;
  status: 'succeeded';
};

export type FakeEvent = {
  id: string;
  object: 'event';
  api_version: string;
  created: number;
  data: { object: unknown };
  livemode: false;
  pending_webhooks: number;
  request: { id: string | null; idempotency_key: string | null };
  type: string;
};

/** An error in the payment API's shape: `{error: {type, message, code?, param?}}` with an HTTP status. */
export class FakeApiError extends Error {
  constructor(
    public status: number,
    public type: string,
    message: string,
    public code?: string,
    public param?: string,
  ) {
    super(message);
  }
  body() {
    return { error: { type: this.type, message: this.message, ...(this.code ? { code: this.code } : {}), ...(this.param ? { param: this.param } : {}) } };
  }
}

const invalid = (message: string, param?: string, code = 'parameter_invalid') => new FakeApiError(400, 'invalid_request_error', message, code, param);
const missing = (what: string, id: string, param = 'id') =>
  new FakeApiError(404, 'invalid_request_error', `No such ${what}: '${id}'`, 'resource_missing', param);

export function newId(prefix: string): string {
  return `${prefix}_${crypto.randomBytes(18).toString('base64url').replace(/[-_]/g, 'x')}`;
}

/** Largest amount the API takes: "The amount value supports up to eight digits" (stripe_currency_decimals.tsv header). */
export const MAX_API_AMOUNT = 99_999_999;

type Params = Record<string, unknown>;

function onlyKnown(params: Params, known: readonly string[]) {
  for (const k of Object.keys(params)) {
    if (!known.includes(k)) throw invalid(`Received unknown parameter: ${k} (the local fake implements only ${known.join(', ')})`, k, 'parameter_unknown');
  }
}

function str(params: Params, name: string, opts: { required?: boolean; max?: number } = {}): string | null {
  const v = params[name];
  if (v === undefined || v === '') {
    if (opts.required) throw invalid(`Missing required param: ${name}.`, name, 'parameter_missing');
    return null;
  }
  if (typeof v !== 'string') throw invalid(`Invalid string: ${name}`, name);
  if (opts.max && v.length > opts.max) throw invalid(`${name} must be at most ${opts.max} characters`, name);
  return v;
}

function int(v: unknown, name: string, min: number): number {
  if (typeof v !== 'string' || !/^-?\d+$/.test(v)) throw invalid(`Invalid integer: ${String(v)}`, name);
  const n = Number(v);
  if (!Number.isSafeInteger(n) || n < min) throw invalid(`${name} must be at least ${min}`, name);
  return n;
}

function metadata(v: unknown, name: string): Metadata {
  if (v === undefined || v === '') return {};
  if (typeof v !== 'object' || v === null || Array.isArray(v)) throw invalid(`Invalid hash: ${name}`, name);
  const out: Metadata = {};
  const entries = Object.entries(v as Record<string, unknown>);
  if (entries.length > 50) throw invalid(`${name} can have at most 50 keys`, name);
  for (const [k, val] of entries) {
    if (k.length > 40) throw invalid(`${name} keys can be at most 40 characters`, `${name}[${k}]`);
    if (typeof val !== 'string') throw invalid(`Invalid string: ${name}[${k}]`, `${name}[${k}]`);
    if (val.length > 500) throw invalid(`${name} values can be at most 500 characters`, `${name}[${k}]`);
    out[k] = val;
  }
  return out;
}

function url(params: Params, name: string, required: boolean): string | null {
  const v = str(params, name, { required, max: 5000 });
  if (v === null) return null;
  try {
    const u = new URL(v);
    if (u.protocol !== 'http:' && u.protocol !== 'https:') throw new Error('scheme');
  } catch {
    throw invalid(`Not a valid URL: ${name}`, name, 'url_invalid');
  }
  return v;
}

/** The payment API's amount rule for a lower-case currency (shared/money.ts `chargeRule`, from the reference TSV). */
function checkAmount(amount: number, currency: string, param: string) {
  let step: number;
  try {
    step = chargeRule(currency).step;
  } catch {
    throw invalid(`Invalid currency: ${currency}. The local fake knows the amount rules of ISO 4217 two-decimal currencies and those the payment service singles out.`, 'currency', 'currency_invalid');
  }
  if (amount > MAX_API_AMOUNT) throw invalid(`Amount must be no more than ${MAX_API_AMOUNT}`, param, 'amount_too_large');
  if (amount % step !== 0) {
    throw invalid(`Amounts in ${currency.toUpperCase()} must be a multiple of ${step} in the API's units (got ${amount})`, param, 'amount_invalid');
  }
}

const SESSION_PARAMS = ['mode', 'line_items', 'success_url', 'cancel_url', 'customer_email', 'metadata', 'payment_intent_data', 'client_reference_id', 'expires_at', 'expand'] as const;
const REFUND_PARAMS = ['payment_intent', 'charge', 'amount', 'reason', 'metadata', 'expand'] as const;
const REASONS = ['duplicate', 'fraudulent', 'requested_by_customer'];

export type Store = ReturnType<typeof createStore>;

export function createStore(opts: { clock: Clock; checkoutUrl: (id: string) => string; sessionTtlSeconds: number }) {
  const sessions = new Map<string, FakeSession & { _: SessionPrivate }>();
  const intents = new Map<string, FakePaymentIntent>();
  const charges = new Map<string, FakeCharge>();
  const refunds = new Map<string, FakeRefund>();
  const events: FakeEvent[] = [];
  const nowSeconds = () => Math.floor(opts.clock.now().getTime() / 1000);

  /** Sessions past expires_at become 'expired' when next read. */
  function touch(s: FakeSession & { _: SessionPrivate }) {
    if (s.status === 'open' && nowSeconds() >= s.expires_at) {
      s.status = 'expired';
      s.url = null;
    }
    return s;
  }

  function publicSession(s: FakeSession & { _: SessionPrivate }): FakeSession {
    const { _: _private, ...rest } = touch(s);
    return structuredClone(rest);
  }

  function getSession(id: string) {
    const s = sessions.get(id);
    if (!s) throw missing('checkout.session', id);
    return touch(s);
  }

  return {
    nowSeconds,

    createSession(params: Params): FakeSession {
      onlyKnown(params, SESSION_PARAMS);
      const mode = str(params, 'mode', { required: true });
      if (mode !== 'payment') throw invalid(`The local fake supports mode=payment only, not ${mode}`, 'mode');
      const successUrl = url(params, 'success_url', true) as string;
      const cancelUrl = url(params, 'cancel_url', false);
      const items = params.line_items;
      if (!Array.isArray(items) || items.length === 0) throw invalid('Missing required param: line_items.', 'line_items', 'parameter_missing');
      const lineItems = items.map((raw, i) => {
        const p = `line_items[${i}]`;
        if (typeof raw !== 'object' || raw === null) throw invalid(`Invalid hash: ${p}`, p);
        const item = raw as Params;
        if (item.price !== undefined) throw invalid('The local fake takes price_data only, not saved prices', `${p}[price]`);
        onlyKnown(item, ['quantity', 'price_data']);
        const quantity = int(item.quantity, `${p}[quantity]`, 1);
        const pd = item.price_data;
        if (typeof pd !== 'object' || pd === null) throw invalid(`Missing required param: ${p}[price_data].`, `${p}[price_data]`, 'parameter_missing');
        const priceData = pd as Params;
        onlyKnown(priceData, ['currency', 'unit_amount', 'product_data']);
        const cur = str(priceData, 'currency', { required: true }) as string;
        if (!/^[a-z]{3}$/.test(cur)) throw invalid(`Invalid currency: ${cur}`, `${p}[price_data][currency]`, 'currency_invalid');
        if (i > 0 && cur !== (items[0] as { price_data?: { currency?: unknown } }).price_data?.currency) {
          throw invalid('All line items must use the same currency', `${p}[price_data][currency]`);
        }
        const unitAmount = int(priceData.unit_amount, `${p}[price_data][unit_amount]`, 0);
        const product = priceData.product_data as Params | undefined;
        const name = product && typeof product === 'object' ? str(product, 'name', { required: true, max: 500 }) : null;
        if (!name) throw invalid(`Missing required param: ${p}[price_data][product_data][name].`, `${p}[price_data][product_data][name]`, 'parameter_missing');
        return { name, unitAmount, quantity, currency: cur };
      });
      const currency = lineItems[0].currency;
      const total = lineItems.reduce((sum, li) => sum + li.unitAmount * li.quantity, 0);
      if (total <= 0) throw invalid('The total of a payment checkout must be above zero', 'line_items', 'amount_too_small');
      checkAmount(total, currency, 'line_items');
      const pid = params.payment_intent_data;
      if (pid !== undefined && (typeof pid !== 'object' || pid === null)) throw invalid('Invalid hash: payment_intent_data', 'payment_intent_data');
      if (pid) onlyKnown(pid as Params, ['metadata', 'description']);
      const created = nowSeconds();
      const expiresAt = params.expires_at !== undefined ? int(params.expires_at, 'expires_at', created + 30 * 60) : created + opts.sessionTtlSeconds;
      const id = newId('cs_test');
      const email = str(params, 'customer_email', { max: 800 });
      const session: FakeSession & { _: SessionPrivate } = {
        id,
        object: 'checkout.session',
        amount_subtotal: total,
        amount_total: total,
        cancel_url: cancelUrl,
        client_reference_id: str(params, 'client_reference_id', { max: 200 }),
        created,
        currency,
        customer_details: null,
        customer_email: email,
        expires_at: expiresAt,
        livemode: false,
        metadata: metadata(params.metadata, 'metadata'),
        mode: 'payment',
        payment_intent: null,
        payment_method_types: ['card'],
        payment_status: 'unpaid',
        status: 'open',
        success_url: successUrl,
        url: opts.checkoutUrl(id),
        _: { lineItems, paymentIntentMetadata: metadata((pid as Params | undefined)?.metadata, 'payment_intent_data[metadata]') },
      };
      sessions.set(id, session);
      return publicSession(session);
    },

    retrieveSession(id: string, expand: string[] = []): FakeSession | (Omit<FakeSession, 'payment_intent'> & { payment_intent: FakePaymentIntent | null }) {
      const s = publicSession(getSession(id));
      if (expand.includes('payment_intent') && s.payment_intent) return { ...s, payment_intent: structuredClone(intents.get(s.payment_intent) ?? null) };
      return s;
    },

    /** What the checkout page shows: the public session plus its line items. */
    sessionForPage(id: string) {
      const s = sessions.get(id);
      if (!s) return null;
      touch(s);
      return { session: publicSession(s), lineItems: s._.lineItems };
    },

    /** A successful test payment: the session becomes complete/paid with a new payment intent and charge. */
    completeSession(id: string, last4: string) {
      const s = getSession(id);
      if (s.status !== 'open') throw invalid(`This checkout session is ${s.status}`, 'id', 'checkout_not_open');
      const created = nowSeconds();
      const pi: FakePaymentIntent = {
        id: newId('pi'),
        object: 'payment_intent',
        amount: s.amount_total,
        amount_received: s.amount_total,
        created,
        currency: s.currency,
        latest_charge: newId('ch'),
        livemode: false,
        metadata: { ...s._.paymentIntentMetadata },
        payment_method_types: ['card'],
        status: 'succeeded',
      };
      const charge: FakeCharge = {
        id: pi.latest_charge,
        object: 'charge',
        amount: pi.amount,
        amount_captured: pi.amount,
        amount_refunded: 0,
        captured: true,
        created,
        currency: pi.currency,
        livemode: false,
        metadata: { ...pi.metadata },
        paid: true,
        payment_intent: pi.id,
        payment_method_details: { type: 'card', card: { last4 } },
        refunded: false,
        status: 'succeeded',
      };
      intents.set(pi.id, pi);
      charges.set(charge.id, charge);
      s.status = 'complete';
      s.payment_status = 'paid';
      s.payment_intent = pi.id;
      s.customer_details = { email: s.customer_email };
      s.url = null;
      return publicSession(s);
    },

    retrievePaymentIntent(id: string): FakePaymentIntent {
      const pi = intents.get(id);
      if (!pi) throw missing('payment_intent', id);
      return structuredClone(pi);
    },

    createRefund(params: Params): { refund: FakeRefund; charge: FakeCharge } {
      onlyKnown(params, REFUND_PARAMS);
      const piId = str(params, 'payment_intent');
      const chId = str(params, 'charge');
      if (!piId && !chId) throw invalid('One of payment_intent or charge is required', 'payment_intent', 'parameter_missing');
      let charge: FakeCharge | undefined;
      if (piId) {
        const pi = intents.get(piId);
        if (!pi) throw missing('payment_intent', piId, 'payment_intent');
        charge = charges.get(pi.latest_charge);
        if (chId && chId !== charge?.id) throw invalid('The charge does not belong to that payment intent', 'charge');
      } else {
        charge = charges.get(chId as string);
        if (!charge) throw missing('charge', chId as string, 'charge');
      }
      if (!charge) throw invalid('That payment has no charge to refund', 'payment_intent');
      const left = charge.amount - charge.amount_refunded;
      if (left <= 0) throw invalid(`Charge ${charge.id} has already been refunded.`, 'charge', 'charge_already_refunded');
      const amount = params.amount === undefined ? left : int(params.amount, 'amount', 1);
      if (amount > left) {
        throw invalid(`Refund amount (${amount}) is greater than unrefunded amount on charge (${left})`, 'amount', 'amount_too_large');
      }
      checkAmount(amount, charge.currency, 'amount');
      const reason = str(params, 'reason');
      if (reason && !REASONS.includes(reason)) throw invalid(`Invalid reason: must be one of ${REASONS.join(', ')}`, 'reason');
      const refund: FakeRefund = {
        id: newId('re'),
        object: 'refund',
        amount,
        charge: charge.id,
        created: nowSeconds(),
        currency: charge.currency,
        metadata: metadata(params.metadata, 'metadata'),
        payment_intent: charge.payment_intent,
        reason,
        status: 'succeeded',
      };
      refunds.set(refund.id, refund);
      charge.amount_refunded += amount;
      charge.refunded = charge.amount_refunded === charge.amount;
      return { refund: structuredClone(refund), charge: structuredClone(charge) };
    },

    retrieveRefund(id: string): FakeRefund {
      const r = refunds.get(id);
      if (!r) throw missing('refund', id);
      return structuredClone(r);
    },

    addEvent(type: string, object: unknown, apiVersion: string, request: FakeEvent['request'] = { id: null, idempotency_key: null }): FakeEvent {
      const event: FakeEvent = {
        id: newId('evt'),
        object: 'event',
        api_version: apiVersion,
        created: nowSeconds(),
        data: { object: structuredClone(object) },
        livemode: false,
        pending_webhooks: 1,
        request,
        type,
      };
      events.push(event);
      return event;
    },

    events: () => events,
    event: (id: string) => events.find((e) => e.id === id) ?? null,
  };
}
