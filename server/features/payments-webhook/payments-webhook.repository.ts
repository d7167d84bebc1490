import type { Db } from '../../lib/db';

/** Verified payment events, stored by the payment service's event id. */
export function paymentEventsRepository(db: Db) {
  return {
    exists: (id: string, trx: Db = db) => trx('payment_events').where({ id }).first('id').then(Boolean),
    insert: (trx: Db, row: { id: string; type: string; studio_id: number | null; invoice_id: number | null; session_id: string | null; outcome: string; reason: string | null; payload: string; received_at: string }) =>
      trx('payment_events').insert(row),
  };
}

export type PaymentEventsRepository = ReturnType<typeof paymentEventsRepository>;
