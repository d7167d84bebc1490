import { checkoutFromEvent, WebhookSignatureError, type Payments } from '../../lib/payments/index';
import { iso, type Clock } from '../../lib/clock';
import { isUniqueViolation, type Db } from '../../lib/db';
import { errors } from '../../lib/errors';
import type { InvoicesService } from '../invoices/invoices.service';
import type { PaymentEventsRepository } from './payments-webhook.repository';

/**
 * Events from the payment service. Only a verified event counts (signature over the raw body, checked by the
 * SDK); each is stored by its id in the transaction that acts on it, so a repeated delivery changes nothing.
 */
export function paymentsWebhookService(deps: { db: Db; repo: PaymentEventsRepository; payments: Payments; invoices: Pick<InvoicesService, 'settleCheckout' | 'kick'>; clock: Clock }) {
  const { db, repo, payments, invoices, clock } = deps;
  return {
    async receive(rawBody: unknown, signature: string | string[] | undefined) {
      let event;
      try {
        event = payments.verifyEvent(Buffer.isBuffer(rawBody) ? rawBody : Buffer.alloc(0), signature);
      } catch (err) {
        if (err instanceof WebhookSignatureError) throw errors.invalid('The payment event could not be verified.');
        throw err;
      }
      // The same event delivered twice at once (to two instances): the second insert of its id breaks the
      // key, its transaction is undone, and it answers as a duplicate.
      const outcome = await db.transaction(async (trx) => {
        if (await repo.exists(event.id, trx)) return 'duplicate';
        let result: { outcome: 'paid' | 'flagged' | 'ignored'; reason: string | null; studioId: number | null; invoiceId: number | null } = { outcome: 'ignored', reason: null, studioId: null, invoiceId: null };
        const info = event.type === 'checkout.session.completed' ? checkoutFromEvent(event) : null;
        if (info) result = await invoices.settleCheckout(trx, info);
        await repo.insert(trx, {
          id: event.id,
          type: event.type,
          studio_id: result.studioId,
          invoice_id: result.invoiceId,
          session_id: info?.id ?? null,
          outcome: result.outcome,
          reason: result.reason?.slice(0, 500) ?? null,
          payload: JSON.stringify(event),
          received_at: iso(clock.now()),
        });
        return result.outcome;
      }).catch(async (err: unknown) => {
        if (isUniqueViolation(err) && (await repo.exists(event.id))) return 'duplicate' as const;
        throw err;
      });
      invoices.kick();
      return { received: true, outcome };
    },
  };
}

export type PaymentsWebhookService = ReturnType<typeof paymentsWebhookService>;
