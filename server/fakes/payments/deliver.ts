// Signed webhook delivery for the local fake, in the payment service's documented scheme:
// header `Stripe-Signature: t=<unix seconds>,v1=<hex HMAC-SHA256(secret, "<t>.<raw body>")>`.
// Signed here with node:crypto (not with the SDK), so the SDK's `constructEvent` on the receiving side is
// an independent check that the two agree.
import crypto from 'node:crypto';
import type { FakeEvent } from './store';

export function signatureHeader(payload: string, secret: string, timestampSeconds: number): string {
  const v1 = crypto.createHmac('sha256', secret).update(`${timestampSeconds}.${payload}`, 'utf8').digest('hex');
  return `t=${timestampSeconds},v1=${v1}`;
}

export type DeliveryAttempt = {
  /** ISO time of the attempt (fake's clock) */
  at: string;
  /** 1-based attempt number within one delivery run */
  attempt: number;
  /** HTTP status from the endpoint, or null when it could not be reached */
  status: number | null;
  ok: boolean;
  error?: string;
  /** 'redeliver' when asked for through /__fake/events/:id/redeliver */
  trigger: 'initial' | 'retry' | 'redeliver';
};

export type Deliverer = ReturnType<typeof createDeliverer>;

export function createDeliverer(opts: {
  getUrl: () => string | null;
  secret: string;
  now: () => Date;
  retryDelaysMs: number[];
  timeoutMs: number;
  onError?: (message: string) => void;
}) {
  const attempts = new Map<string, DeliveryAttempt[]>();
  const timers = new Set<NodeJS.Timeout>();
  const inflight = new Set<Promise<unknown>>();
  let closed = false;

  async function attempt(event: FakeEvent, n: number, trigger: DeliveryAttempt['trigger']): Promise<DeliveryAttempt> {
    const url = opts.getUrl();
    const at = opts.now();
    const record: DeliveryAttempt = { at: at.toISOString(), attempt: n, status: null, ok: false, trigger };
    if (!url) {
      record.error = 'no webhook URL is configured';
    } else {
      const payload = JSON.stringify(event, null, 2);
      try {
        const res = await fetch(url, {
          method: 'POST',
          headers: {
            'content-type': 'application/json; charset=utf-8',
            'stripe-signature': signatureHeader(payload, opts.secret, Math.floor(at.getTime() / 1000)),
            'user-agent': 'Sablework-payments-fake/1',
          },
          body: payload,
          redirect: 'manual',
          signal: AbortSignal.timeout(opts.timeoutMs),
        });
        record.status = res.status;
        record.ok = res.status >= 200 && res.status < 300;
        await res.arrayBuffer().catch(() => undefined);
        if (!record.ok) record.error = `endpoint answered ${res.status}`;
      } catch (err) {
        record.error = err instanceof Error ? `${err.name}: ${err.message}` : String(err);
      }
    }
    const list = attempts.get(event.id) ?? [];
    list.push(record);
    attempts.set(event.id, list);
    if (!record.ok) opts.onError?.(`webhook ${event.type} ${event.id} attempt ${n} failed: ${record.error}`);
    return record;
  }

  function track<T>(p: Promise<T>): Promise<T> {
    inflight.add(p);
    p.finally(() => inflight.delete(p)).catch(() => undefined);
    return p;
  }

  function scheduleRetry(event: FakeEvent, n: number) {
    const delay = opts.retryDelaysMs[n - 2];
    if (delay === undefined || closed) return;
    const timer = setTimeout(() => {
      timers.delete(timer);
      track(
        attempt(event, n, 'retry').then((r) => {
          if (!r.ok) scheduleRetry(event, n + 1);
        }),
      );
    }, delay);
    timers.add(timer);
  }

  return {
    /** First attempt now (awaitable); on failure, retries after each of retryDelaysMs. */
    deliver(event: FakeEvent): Promise<DeliveryAttempt> {
      return track(
        attempt(event, 1, 'initial').then((r) => {
          if (!r.ok) scheduleRetry(event, 2);
          return r;
        }),
      );
    },
    /** One more delivery of the same event (same id and body, fresh signature), no retries. */
    redeliver(event: FakeEvent): Promise<DeliveryAttempt> {
      const n = (attempts.get(event.id)?.length ?? 0) + 1;
      return track(attempt(event, n, 'redeliver'));
    },
    attemptsOf: (id: string) => attempts.get(id) ?? [],
    /** Resolves when no delivery is running or waiting to retry. */
    async idle(): Promise<void> {
      while (inflight.size > 0 || timers.size > 0) {
        if (inflight.size > 0) await Promise.allSettled([...inflight]);
        else await new Promise((r) => setTimeout(r, 10));
      }
    },
    close() {
      closed = true;
      for (const t of timers) clearTimeout(t);
      timers.clear();
    },
  };
}
