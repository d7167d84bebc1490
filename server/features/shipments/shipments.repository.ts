import type { ModelSupplier, ShipmentStatus } from '../../../shared/schemas/shipments';
import type { Db } from '../../lib/db';

export type ShipmentRow = {
  id: number;
  studio_id: number;
  commission_id: number;
  status: ShipmentStatus;
  ship_to_name: string | null;
  ship_to_line1: string | null;
  ship_to_line2: string | null;
  ship_to_city: string | null;
  ship_to_region: string | null;
  ship_to_postal_code: string | null;
  ship_to_country: string | null;
  carrier: string | null;
  service: string | null;
  tracking: string | null;
  weight_grams: number | null;
  length_cm: number | null;
  width_cm: number | null;
  height_cm: number | null;
  insured_minor: number | string | null;
  currency: string;
  customs_text: string | null;
  checklist: string;
  shipped_at: string | null;
  shipped_by: number | null;
  shipped_by_name?: string | null;
  override_reason: string | null;
  delivered_on: string | null;
  received_by: 'client' | 'studio' | null;
  auto_closed_at: string | null;
  created_at: string;
  updated_at: string;
};

export type SettingsRow = { studio_id: number; auto_close_days: number | null; from_country: string | null; packing_items: string; updated_at: string };

export type ShippingCommission = {
  id: number;
  title: string;
  status: string;
  client_id: number;
  client_name: string;
  client_email: string | null;
  account_email: string | null;
  address_line1: string | null;
  address_line2: string | null;
  address_city: string | null;
  address_region: string | null;
  address_postal_code: string | null;
  address_country: string | null;
  studio_name: string;
  currency: string;
  timezone: string;
};

export type InvoiceMoneyRow = { kind: string; status: string; total: number | string; paid: number | string; credited: number | string; currency: string };

/** Shipments and the studio's shipping settings; every query takes the studio id first. */
export function shipmentsRepository(db: Db) {
  const shipments = (trx: Db) => trx('shipments as s').leftJoin('users as u', 'u.id', 's.shipped_by').select('s.*', 'u.name as shipped_by_name');
  return {
    settings: (studioId: number, trx: Db = db) => trx('studio_shipping_settings').where({ studio_id: studioId }).first() as Promise<SettingsRow | undefined>,
    saveSettings: (studioId: number, row: Omit<SettingsRow, 'studio_id'>) =>
      db('studio_shipping_settings').insert({ studio_id: studioId, ...row }).onConflict('studio_id').merge(['auto_close_days', 'from_country', 'packing_items', 'updated_at']),

    commission: (studioId: number, commissionId: number, trx: Db = db) =>
      trx('commissions as c')
        .join('clients as cl', 'cl.id', 'c.client_id')
        .join('studios as st', 'st.id', 'c.studio_id')
        .leftJoin('users as u', 'u.id', 'cl.user_id')
        .where({ 'c.studio_id': studioId, 'c.id': commissionId })
        .first(
          'c.id',
          'c.title',
          'c.status',
          'c.client_id',
          'cl.name as client_name',
          'cl.email as client_email',
          'u.email as account_email',
          'cl.address_line1',
          'cl.address_line2',
          'cl.address_city',
          'cl.address_region',
          'cl.address_postal_code',
          'cl.address_country',
          'st.name as studio_name',
          'st.currency',
          'st.timezone',
        ) as Promise<ShippingCommission | undefined>,
    /** Who supplied the models (from the models-in record) and how many the commission holds, for the customs wording. */
    async modelsFacts(studioId: number, commissionId: number, trx: Db = db) {
      const [m, count] = await Promise.all([
        trx('models_in').where({ studio_id: studioId, commission_id: commissionId }).first('supplier'),
        trx('figures').where({ studio_id: studioId, commission_id: commissionId }).sum({ n: 'quantity' }).first(),
      ]);
      return { supplier: (m?.supplier as ModelSupplier | undefined) ?? null, modelCount: Number(count?.n ?? 0) };
    },
    /** The commission's invoices (credit notes aside), for the rule that the balance is paid before the parcel leaves. */
    invoices: (studioId: number, commissionId: number, trx: Db = db) =>
      trx('invoices').where({ studio_id: studioId, commission_id: commissionId }).whereNot('kind', 'credit_note').select('kind', 'status', 'total', 'paid', 'credited', 'currency') as Promise<InvoiceMoneyRow[]>,

    forCommission: (studioId: number, commissionId: number, trx: Db = db) =>
      shipments(trx).where({ 's.studio_id': studioId, 's.commission_id': commissionId }).orderBy('s.id') as Promise<ShipmentRow[]>,
    get: (studioId: number, commissionId: number, id: number, trx: Db = db) =>
      shipments(trx).where({ 's.studio_id': studioId, 's.commission_id': commissionId, 's.id': id }).first() as Promise<ShipmentRow | undefined>,
    async insert(trx: Db, row: Record<string, unknown>) {
      const [r] = await trx('shipments').insert(row).returning('id');
      return typeof r === 'object' ? (r.id as number) : (r as number);
    },
    update: (trx: Db, studioId: number, id: number, patch: Record<string, unknown>) => trx('shipments').where({ studio_id: studioId, id }).update(patch),
    /** Marks the shipment only while it is in `from`, so two requests cannot both ship or deliver it. */
    move: (trx: Db, studioId: number, id: number, from: ShipmentStatus, patch: Record<string, unknown>) => trx('shipments').where({ studio_id: studioId, id, status: from }).update(patch),

    /** Shipped parcels whose commission still waits in "shipped", with the studio's auto-close days. */
    awaitingClose: () =>
      db('shipments as s')
        .join('commissions as c', 'c.id', 's.commission_id')
        .leftJoin('studio_shipping_settings as ss', 'ss.studio_id', 's.studio_id')
        .where({ 's.status': 'shipped', 'c.status': 'shipped' })
        .whereNotNull('s.shipped_at')
        .select('s.id', 's.studio_id', 's.commission_id', 's.shipped_at', 'ss.studio_id as has_settings', 'ss.auto_close_days') as Promise<
        { id: number; studio_id: number; commission_id: number; shipped_at: string; has_settings: number | null; auto_close_days: number | null }[]
      >,
    /** The studio's owners who take e-mail notices. */
    owners: (studioId: number, trx: Db = db) =>
      trx('memberships as m')
        .join('users as u', 'u.id', 'm.user_id')
        .where({ 'm.studio_id': studioId, 'm.role': 'owner', 'u.email_notices': true })
        .select('u.id', 'u.email', 'u.name') as Promise<{ id: number; email: string; name: string }[]>,
  };
}

export type ShipmentsRepository = ReturnType<typeof shipmentsRepository>;
