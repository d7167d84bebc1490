// A local stand-in for the payment service, started only when no real STRIPE_SECRET_KEY is configured.
// It speaks the wire format the official SDK uses (form-encoded requests, JSON replies, Bearer key,
// Idempotency-Key), for the calls server/lib/payments makes:
//   POST /v1/checkout/sessions · GET /v1/checkout/sessions/:id · GET /v1/payment_intents/:id
//   POST /v1/refunds · GET /v1/refunds/:id
// and serves its own checkout page at GET/POST /pay/:sessionId (our look, no scripts).
// Test hooks: GET /__fake/events, GET /__fake/events/:id, POST /__fake/events/:id/redeliver.
// State lives in memory and is gone when the process stops.
import crypto from 'node:crypto';
import type { AddressInfo } from 'node:net';
import type { Server } from 'node:http';
import express, { type Request, type Response } from 'express';
import Stripe from 'stripe';
import type { Clock } from '../lib/clock';
import { systemClock } from '../lib/clock';
import { createDeliverer, type DeliveryAttempt } from './payments/deliver';
import { checkCard, checkoutPage, closedPage, CHECKOUT_CSS, notFoundPage } from './payments/page';
import { createStore, FakeApiError, newId, type FakeEvent } from './payments/store';

export type PaymentsFakeOptions = {
  /** default 127.0.0.1 */
  host?: string;
  /** default 0: the system picks a free port */
  port?: number;
  /** the key the SDK must send; default a fresh random `sk_test_…` (read it back from the result) */
  secretKey?: string;
  /** signs webhooks; default a fresh random `whsec_…` (read it back from the result) */
  webhookSecret?: string;
  /** where events are POSTed, e.g. `${publicUrl}/api/webhooks/payments`; may be set later with setWebhookUrl */
  webhookUrl?: string;
  /** the address browsers use for the checkout page; default http://<host>:<port> */
  publicUrl?: string;
  /** timestamps of objects, events and signatures; default the system clock */
  clock?: Clock;
  /** waits before delivery retries 2, 3, …; default [250, 1000, 4000] ms */
  retryDelaysMs?: number[];
  /** per delivery attempt; default 5000 ms */
  deliveryTimeoutMs?: number;
  /** checkout session lifetime; default 24 h */
  sessionTtlSeconds?: number;
  /** optional logger (pino-like) for failed deliveries */
  log?: { warn: (obj: object, msg?: string) => void };
};

export type PaymentsFakeEventView = FakeEvent & { deliveries: DeliveryAttempt[] };

export type PaymentsFake = {
  host: string;
  port: number;
  /** http://host:port — the API base the SDK talks to */
  url: string;
  secretKey: string;
  webhookSecret: string;
  setWebhookUrl(url: string | null): void;
  webhookUrl(): string | null;
  /** every event so far, oldest first, with its delivery attempts */
  events(): PaymentsFakeEventView[];
  redeliver(eventId: string): Promise<DeliveryAttempt>;
  /** resolves when no webhook delivery is running or waiting to retry */
  idle(): Promise<void>;
  close(): Promise<void>;
};

const API_VERSION: string = Stripe.API_VERSION;

function sendApiError(res: Response, err: unknown) {
  const e =
    err instanceof FakeApiError ? err : new FakeApiError(500, 'api_error', err instanceof Error ? err.message : 'The local payment fake failed');
  res.status(e.status).json(e.body());
}

/** Canonical JSON of parsed parameters, for "same key, same parameters" checks. */
function canonical(v: unknown): string {
  if (Array.isArray(v)) return `[${v.map(canonical).join(',')}]`;
  if (v && typeof v === 'object') {
    return `{${Object.keys(v)
      .sort()
      .map((k) => `${JSON.stringify(k)}:${canonical((v as Record<string, unknown>)[k])}`)
      .join(',')}}`;
  }
  return JSON.stringify(v);
}

function timingSafeEqualText(a: string, b: string): boolean {
  const ab = Buffer.from(a);
  const bb = Buffer.from(b);
  return ab.length === bb.length && crypto.timingSafeEqual(ab, bb);
}

function expandList(q: unknown): string[] {
  const e = (q as { expand?: unknown } | undefined)?.expand;
  if (Array.isArray(e)) return e.filter((x): x is string => typeof x === 'string');
  if (e && typeof e === 'object') return Object.values(e).filter((x): x is string => typeof x === 'string');
  return typeof e === 'string' ? [e] : [];
}

export async function startPaymentsFake(opts: PaymentsFakeOptions = {}): Promise<PaymentsFake> {
  const host = opts.host ?? '127.0.0.1';
  const clock = opts.clock ?? systemClock;
  const secretKey = opts.secretKey ?? `sk_test_fake_${crypto.randomBytes(18).toString('hex')}`;
  const webhookSecret = opts.webhookSecret ?? `whsec_fake_${crypto.randomBytes(24).toString('hex')}`;
  if (/^(sk|rk)_live_/.test(secretKey)) throw new Error('The local payment fake never takes a live key');
  let webhookUrl: string | null = opts.webhookUrl ?? null;
  let baseUrl = opts.publicUrl?.replace(/\/$/, '') ?? '';

  const store = createStore({
    clock,
    checkoutUrl: (id) => `${baseUrl}/pay/${id}`,
    sessionTtlSeconds: opts.sessionTtlSeconds ?? 24 * 60 * 60,
  });
  const deliverer = createDeliverer({
    getUrl: () => webhookUrl,
    secret: webhookSecret,
    now: () => clock.now(),
    retryDelaysMs: opts.retryDelaysMs ?? [250, 1000, 4000],
    timeoutMs: opts.deliveryTimeoutMs ?? 5000,
    onError: (msg) => opts.log?.warn({ webhookUrl }, msg),
  });

  // Idempotent replies: key → the request's identity and its (successful) answer.
  const idempotent = new Map<string, { fingerprint: string; status: number; body: unknown }>();

  const app = express();
  app.disable('x-powered-by');
  app.set('query parser', 'extended');
  const form = express.urlencoded({ extended: true, limit: '200kb', parameterLimit: 2000 });

  app.use((_req, res, next) => {
    res.setHeader('request-id', newId('req'));
    res.setHeader('x-content-type-options', 'nosniff');
    next();
  });

  // ---- API (/v1) ------------------------------------------------------------------------------
  const api = express.Router();
  api.use((req, res, next) => {
    const auth = req.get('authorization') ?? '';
    const key = auth.startsWith('Bearer ') ? auth.slice(7) : '';
    if (!key) {
      res.status(401).json({ error: { type: 'invalid_request_error', message: 'You did not provide an API key.' } });
      return;
    }
    if (!timingSafeEqualText(key, secretKey)) {
      res.status(401).json({ error: { type: 'invalid_request_error', message: `Invalid API Key provided: ${key.slice(0, 8)}…${key.slice(-4)}` } });
      return;
    }
    next();
  });
  api.use(form);

  /** POST handler with Idempotency-Key: the same key and parameters give back the first answer. */
  function idempotentPost(path: string, handler: (params: Record<string, unknown>, key: string | null, requestId: string) => unknown) {
    api.post(path, (req: Request, res: Response) => {
      const params = (req.body ?? {}) as Record<string, unknown>;
      const key = req.get('idempotency-key') ?? null;
      const fingerprint = `${req.method} ${req.path} ${canonical(params)}`;
      if (key) {
        const prior = idempotent.get(key);
        if (prior) {
          if (prior.fingerprint !== fingerprint) {
            sendApiError(
              res,
              new FakeApiError(
                400,
                'idempotency_error',
                `Keys for idempotent requests can only be used with the same parameters they were first used with. Try using a key other than '${key}' if you meant to execute a different request.`,
              ),
            );
            return;
          }
          res.setHeader('idempotent-replayed', 'true');
          res.setHeader('idempotency-key', key);
          res.status(prior.status).json(prior.body);
          return;
        }
      }
      try {
        const body = handler(params, key, String(res.getHeader('request-id')));
        if (key) {
          idempotent.set(key, { fingerprint, status: 200, body });
          res.setHeader('idempotency-key', key);
        }
        res.status(200).json(body);
      } catch (err) {
        sendApiError(res, err);
      }
    });
  }

  idempotentPost('/checkout/sessions', (params) => store.createSession(params));

  idempotentPost('/refunds', (params, key, requestId) => {
    const { refund, charge } = store.createRefund(params);
    const request = { id: requestId, idempotency_key: key };
    const events = [store.addEvent('charge.refunded', charge, API_VERSION, request), store.addEvent('refund.created', refund, API_VERSION, request)];
    // After the reply, like the real service: the API answer never waits for the webhook.
    setImmediate(() => {
      void (async () => {
        for (const e of events) await deliverer.deliver(e);
      })();
    });
    return refund;
  });

  const get = (path: string, handler: (req: Request) => unknown) =>
    api.get(path, (req, res) => {
      try {
        res.json(handler(req));
      } catch (err) {
        sendApiError(res, err);
      }
    });
  get('/checkout/sessions/:id', (req) => store.retrieveSession(String(req.params.id), expandList(req.query)));
  get('/payment_intents/:id', (req) => store.retrievePaymentIntent(String(req.params.id)));
  get('/refunds/:id', (req) => store.retrieveRefund(String(req.params.id)));

  api.use((req, res) => {
    sendApiError(res, new FakeApiError(404, 'invalid_request_error', `Unrecognized request URL (${req.method}: ${req.originalUrl}). The local fake does not implement it.`));
  });
  app.use('/v1', api);

  // ---- Checkout page (/pay) -------------------------------------------------------------------
  app.get('/pay/assets/checkout.css', (_req, res) => {
    res.type('text/css').setHeader('cache-control', 'public, max-age=300');
    res.send(CHECKOUT_CSS);
  });

  function pageHeaders(res: Response, session?: { success_url: string; cancel_url: string | null }) {
    const targets = new Set<string>(["'self'"]);
    // Browsers check form-action against where the form POST redirects (the success URL) too.
    for (const u of [session?.success_url, session?.cancel_url]) {
      if (!u) continue;
      try {
        targets.add(new URL(u.replaceAll('{CHECKOUT_SESSION_ID}', 'x')).origin);
      } catch {
        /* validated at creation */
      }
    }
    res.setHeader(
      'content-security-policy',
      `default-src 'none'; style-src 'self'; img-src 'self'; form-action ${[...targets].join(' ')}; base-uri 'none'; frame-ancestors 'none'`,
    );
    res.setHeader('referrer-policy', 'no-referrer');
    res.setHeader('cache-control', 'no-store');
    res.type('html');
  }

  app.get('/pay/:id', (req, res) => {
    const found = store.sessionForPage(String(req.params.id));
    if (!found) {
      pageHeaders(res);
      res.status(404).send(notFoundPage());
      return;
    }
    pageHeaders(res, found.session);
    if (found.session.status !== 'open') {
      res.send(closedPage(found.session));
      return;
    }
    res.send(checkoutPage(found.session, found.lineItems));
  });

  app.post('/pay/:id', form, async (req, res) => {
    const id = String(req.params.id);
    const found = store.sessionForPage(id);
    if (!found) {
      pageHeaders(res);
      res.status(404).send(notFoundPage());
      return;
    }
    const { session, lineItems } = found;
    pageHeaders(res, session);
    const successTarget = session.success_url.replaceAll('{CHECKOUT_SESSION_ID}', session.id);
    if (session.status !== 'open') {
      // A second press of Pay after success lands where the first did.
      if (session.payment_status === 'paid') res.redirect(303, successTarget);
      else res.status(410).send(closedPage(session));
      return;
    }
    const body = (req.body ?? {}) as Record<string, unknown>;
    const check = checkCard(body, clock.now());
    const expiry = typeof body.expiry === 'string' ? body.expiry.slice(0, 7) : '';
    if (!check.ok) {
      res.status(422).send(checkoutPage(session, lineItems, { fieldErrors: check.fieldErrors, values: { expiry } }));
      return;
    }
    if (check.outcome === 'declined') {
      res.status(402).send(checkoutPage(session, lineItems, { declined: true, values: { expiry } }));
      return;
    }
    const paid = store.completeSession(id, check.last4);
    const event = store.addEvent('checkout.session.completed', paid, API_VERSION);
    // Wait for the first delivery attempt so the app usually knows before the payer lands back; retries go on behind.
    await deliverer.deliver(event);
    res.redirect(303, successTarget);
  });

  // ---- Test hooks (/__fake) -------------------------------------------------------------------
  const view = (e: FakeEvent): PaymentsFakeEventView => ({ ...structuredClone(e), deliveries: deliverer.attemptsOf(e.id) });
  app.get('/__fake/events', (_req, res) => {
    res.json({ data: store.events().map(view) });
  });
  app.get('/__fake/events/:id', (req, res) => {
    const e = store.event(String(req.params.id));
    if (!e) sendApiError(res, new FakeApiError(404, 'invalid_request_error', `No such event: '${String(req.params.id)}'`, 'resource_missing'));
    else res.json(view(e));
  });
  app.post('/__fake/events/:id/redeliver', async (req, res) => {
    const e = store.event(String(req.params.id));
    if (!e) {
      sendApiError(res, new FakeApiError(404, 'invalid_request_error', `No such event: '${String(req.params.id)}'`, 'resource_missing'));
      return;
    }
    res.json(await deliverer.redeliver(e));
  });

  app.use((_req, res) => {
    res.status(404).type('text').send('Not found');
  });

  const server: Server = await new Promise((resolve, reject) => {
    const s = app.listen(opts.port ?? 0, host, (err?: Error) => (err ? reject(err) : resolve(s)));
    s.once('error', reject);
  });
  const port = (server.address() as AddressInfo).port;
  const url = `http://${host}:${port}`;
  if (!baseUrl) baseUrl = url;

  return {
    host,
    port,
    url,
    secretKey,
    webhookSecret,
    setWebhookUrl(u) {
      webhookUrl = u;
    },
    webhookUrl: () => webhookUrl,
    events: () => store.events().map(view),
    async redeliver(eventId) {
      const e = store.event(eventId);
      if (!e) throw new Error(`No such event: ${eventId}`);
      return deliverer.redeliver(e);
    },
    idle: () => deliverer.idle(),
    async close() {
      deliverer.close();
      await new Promise<void>((resolve) => {
        server.close(() => resolve());
        server.closeAllConnections();
      });
    },
  };
}
