import type { Db } from '../../lib/db';

export type Recipient = { id: number; email: string; name: string };

/**
 * Who hears about what happens on a commission. Only people who still belong to the studio in the
 * right role and who have not switched e-mail notices off.
 */
export function noticesRepository(db: Db) {
  const people = (trx: Db) => trx('users as u').where('u.email_notices', true).distinct('u.id', 'u.email', 'u.name');
  return {
    commission: (studioId: number, commissionId: number, trx: Db = db) =>
      trx('commissions as c')
        .join('studios as s', 's.id', 'c.studio_id')
        .where({ 'c.studio_id': studioId, 'c.id': commissionId })
        .first('c.id', 'c.title', 's.name as studio_name') as Promise<{ id: number; title: string; studio_name: string } | undefined>,
    /** The commission's client, when their record is linked to an account that is a client of the studio. */
    clientSide: (studioId: number, commissionId: number, trx: Db = db): Promise<Recipient[]> =>
      people(trx)
        .join('clients as cl', 'cl.user_id', 'u.id')
        .join('commissions as c', 'c.client_id', 'cl.id')
        .join('memberships as m', function () {
          this.on('m.user_id', '=', 'u.id').andOn('m.studio_id', '=', 'c.studio_id');
        })
        .where({ 'c.studio_id': studioId, 'c.id': commissionId, 'm.role': 'client' }),
    /** The studio's owners and the painters assigned to the commission's figures. */
    studioSide: (studioId: number, commissionId: number, trx: Db = db): Promise<Recipient[]> =>
      people(trx)
        .join('memberships as m', 'm.user_id', 'u.id')
        .where('m.studio_id', studioId)
        .where((w) =>
          w.where('m.role', 'owner').orWhere((p) =>
            p.where('m.role', 'painter').whereIn('u.id', trx('figures').where({ studio_id: studioId, commission_id: commissionId }).whereNotNull('painter_id').select('painter_id')),
          ),
        )
        .orderBy('u.id'),
  };
}

export type NoticesRepository = ReturnType<typeof noticesRepository>;
