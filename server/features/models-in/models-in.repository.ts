import type { ModelSupplier } from '../../../shared/schemas/shipments';
import type { Db } from '../../lib/db';

export type ModelsInRow = {
  id: number;
  studio_id: number;
  commission_id: number;
  supplier: ModelSupplier;
  retailer: string | null;
  expected_on: string | null;
  received_on: string | null;
  carrier: string | null;
  tracking: string | null;
  note: string | null;
  notice_sent_at: string | null;
  updated_at: string;
};
export type FigureCheckRow = { figure_id: number; name: string; quantity: number; received: number | null; damaged: number | boolean | null; note: string | null };
export type CommissionRef = { id: number; title: string; status: string; client_id: number; client_name: string; client_email: string | null; account_email: string | null; studio_name: string };

/** What arrived of a commission's models; every query takes the studio id first. */
export function modelsInRepository(db: Db) {
  return {
    commission: (studioId: number, commissionId: number, trx: Db = db) =>
      trx('commissions as c')
        .join('clients as cl', 'cl.id', 'c.client_id')
        .join('studios as s', 's.id', 'c.studio_id')
        .leftJoin('users as u', 'u.id', 'cl.user_id')
        .where({ 'c.studio_id': studioId, 'c.id': commissionId })
        .first('c.id', 'c.title', 'c.status', 'c.client_id', 'cl.name as client_name', 'cl.email as client_email', 'u.email as account_email', 's.name as studio_name') as Promise<
        CommissionRef | undefined
      >,
    get: (studioId: number, commissionId: number, trx: Db = db) => trx('models_in').where({ studio_id: studioId, commission_id: commissionId }).first() as Promise<ModelsInRow | undefined>,
    /** Every figure of the commission with its check, if one was recorded. */
    figures: (studioId: number, commissionId: number, trx: Db = db) =>
      trx('figures as f')
        .leftJoin('models_in_figures as m', function () {
          this.on('m.figure_id', '=', 'f.id').andOn('m.commission_id', '=', 'f.commission_id');
        })
        .where({ 'f.studio_id': studioId, 'f.commission_id': commissionId })
        .orderBy([{ column: 'f.position' }, { column: 'f.id' }])
        .select('f.id as figure_id', 'f.name', 'f.quantity', 'm.received', 'm.damaged', 'm.note') as Promise<FigureCheckRow[]>,
    async save(trx: Db, studioId: number, commissionId: number, row: Omit<ModelsInRow, 'id' | 'studio_id' | 'commission_id' | 'notice_sent_at'> & { updated_by: number }, checks: { figure_id: number; received: number; damaged: boolean; note: string | null }[]) {
      await trx('models_in')
        .insert({ studio_id: studioId, commission_id: commissionId, created_at: row.updated_at, ...row })
        .onConflict('commission_id')
        .merge(['supplier', 'retailer', 'expected_on', 'received_on', 'carrier', 'tracking', 'note', 'updated_by', 'updated_at']);
      for (const c of checks) {
        await trx('models_in_figures')
          .insert({ studio_id: studioId, commission_id: commissionId, ...c })
          .onConflict(['commission_id', 'figure_id'])
          .merge(['received', 'damaged', 'note']);
      }
    },
    markNoticeSent: (trx: Db, studioId: number, commissionId: number, at: string) => trx('models_in').where({ studio_id: studioId, commission_id: commissionId }).update({ notice_sent_at: at }),
  };
}

export type ModelsInRepository = ReturnType<typeof modelsInRepository>;
