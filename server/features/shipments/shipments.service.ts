import type { CommissionStatus } from '../../../shared/commission-lifecycle';
import { addDays, localDateOf } from '../../../shared/dates';
import { formatMoney } from '../../../shared/money';
import {
  customsWording,
  DEFAULT_AUTO_CLOSE_DAYS,
  defaultPackingItems,
  type BalanceState,
  type DeliveredInput,
  type ShipInput,
  type Shipment,
  type ShippingSettings,
  type ShippingSettingsInput,
  type ShipTo,
  type UpdateShipmentInput,
} from '../../../shared/schemas/shipments';
import { DAY, iso, type Clock } from '../../lib/clock';
import type { Db } from '../../lib/db';
import { errors } from '../../lib/errors';
import type { Mailer } from '../../lib/mail/mailer';
import { templates } from '../../lib/mail/templates';
import type { InvoiceMoneyRow, SettingsRow, ShipmentRow, ShipmentsRepository, ShippingCommission } from './shipments.repository';

type Actor = { studioId: number; role: string; clientId: number | null; userId: number };
type Activity = { record(trx: Db, e: { studioId: number; commissionId: number; userId: number | null; action: string; detail?: Record<string, unknown> }): Promise<unknown> };
type Commissions = {
  transitionIn(trx: Db, by: { studioId: number; userId: number | null }, id: number, to: CommissionStatus, reason?: string, opts?: { override?: { reason: string } }): Promise<void>;
};

const num = (v: number | string | null | undefined) => Number(v ?? 0);
const plural = (n: number, one: string, many = `${one}s`) => `${n} ${n === 1 ? one : many}`;
/** Commissions in these states take no new shipment. */
const FINISHED = ['closed', 'cancelled'];

function parseChecklist(json: string): { label: string; done: boolean }[] {
  try {
    const v = JSON.parse(json);
    return Array.isArray(v) ? v.filter((x) => x && typeof x.label === 'string').map((x) => ({ label: String(x.label), done: Boolean(x.done) })) : [];
  } catch {
    return [];
  }
}

function parseItems(json: string | undefined): string[] {
  if (!json) return [...defaultPackingItems];
  try {
    const v = JSON.parse(json);
    return Array.isArray(v) && v.length ? v.map(String) : [...defaultPackingItems];
  } catch {
    return [...defaultPackingItems];
  }
}

const settingsOf = (row: SettingsRow | undefined): ShippingSettings => ({
  autoCloseDays: row ? row.auto_close_days : DEFAULT_AUTO_CLOSE_DAYS,
  fromCountry: row?.from_country ?? null,
  packingItems: parseItems(row?.packing_items),
});

const shipToOf = (r: ShipmentRow): ShipTo => {
  const out: ShipTo = {};
  const set = (k: keyof ShipTo, v: string | null) => {
    if (v) out[k] = v;
  };
  set('name', r.ship_to_name);
  set('line1', r.ship_to_line1);
  set('line2', r.ship_to_line2);
  set('city', r.ship_to_city);
  set('region', r.ship_to_region);
  set('postalCode', r.ship_to_postal_code);
  set('country', r.ship_to_country);
  return out;
};

/**
 * The rule the lifecycle enforces before a parcel leaves: every issued invoice of the commission is
 * paid, and a balance invoice exists and is paid.
 */
export function balanceOf(invoices: InvoiceMoneyRow[]): BalanceState {
  const open = invoices.filter((i) => i.status === 'open' || i.status === 'partly_paid');
  const openMinor = open.reduce((n, i) => n + Math.max(0, num(i.total) - num(i.paid) - num(i.credited)), 0);
  const currency = invoices[0]?.currency ?? null;
  const paidBalanceInvoice = invoices.some((i) => i.kind === 'balance' && i.status === 'paid');
  const unpaid = open.length > 0 || !paidBalanceInvoice;
  const summary = open.length
    ? `${currency ? formatMoney(openMinor, currency) : openMinor} is still open on ${plural(open.length, 'invoice')}.`
    : !paidBalanceInvoice
      ? 'No balance invoice has been paid yet.'
      : 'The balance is paid.';
  return { unpaid, openMinor, currency, paidBalanceInvoice, summary };
}

export function shipmentsService(deps: { db: Db; repo: ShipmentsRepository; commissions: Commissions; activity: Activity; mailer: Mailer; clock: Clock; publicUrl: string }) {
  const { db, repo, commissions, activity, mailer, clock } = deps;
  const now = () => iso(clock.now());
  const notFound = () => errors.notFound('That shipment');

  /** The commission as the caller may see it: the team sees all of the studio's, a client only their own. */
  async function commissionFor(actor: Actor, commissionId: number, trx: Db = db) {
    const c = await repo.commission(actor.studioId, commissionId, trx);
    if (!c || (actor.role === 'client' && c.client_id !== actor.clientId)) throw errors.notFound('That commission');
    return c;
  }

  async function shipmentFor(actor: Actor, commissionId: number, id: number, trx: Db = db) {
    const c = await commissionFor(actor, commissionId, trx);
    const s = await repo.get(actor.studioId, commissionId, id, trx);
    if (!s || (actor.role === 'client' && s.status === 'preparing')) throw notFound();
    return { c, s };
  }

  async function view(actor: Actor, c: ShippingCommission, s: ShipmentRow, trx: Db = db): Promise<Shipment> {
    const settings = settingsOf(await repo.settings(actor.studioId, trx));
    const forClient = actor.role === 'client';
    const abroad = Boolean(s.ship_to_country && settings.fromCountry && s.ship_to_country !== settings.fromCountry);
    let suggested: string | null = null;
    let balance: BalanceState | null = null;
    if (!forClient) {
      const facts = await repo.modelsFacts(actor.studioId, c.id, trx);
      suggested = customsWording({ supplier: facts.supplier, modelCount: facts.modelCount, studioName: c.studio_name });
      balance = balanceOf(await repo.invoices(actor.studioId, c.id, trx));
    }
    const autoCloseOn =
      s.status === 'shipped' && c.status === 'shipped' && s.shipped_at && settings.autoCloseDays
        ? addDays(localDateOf(new Date(s.shipped_at).getTime(), c.timezone), settings.autoCloseDays)
        : null;
    return {
      id: s.id,
      commissionId: s.commission_id,
      status: s.status,
      shipTo: shipToOf(s),
      carrier: s.carrier,
      service: s.service,
      tracking: s.tracking,
      weightGrams: s.weight_grams,
      lengthCm: s.length_cm,
      widthCm: s.width_cm,
      heightCm: s.height_cm,
      insuredMinor: s.insured_minor === null ? null : num(s.insured_minor),
      currency: s.currency,
      abroad,
      customsText: forClient ? null : s.customs_text,
      suggestedCustomsText: suggested,
      checklist: forClient ? null : parseChecklist(s.checklist),
      shippedAt: s.shipped_at,
      shippedBy: forClient || s.shipped_by === null || !s.shipped_by_name ? null : { id: s.shipped_by, name: s.shipped_by_name },
      overrideReason: forClient ? null : s.override_reason,
      deliveredOn: s.delivered_on,
      receivedBy: s.received_by,
      autoClosedAt: s.auto_closed_at,
      autoCloseOn,
      balance,
      createdAt: s.created_at,
    };
  }

  /** Closes the commission after delivery, if it still waits in "shipped" (it may have closed by itself already). */
  async function closeAfterDelivery(trx: Db, by: { studioId: number; userId: number | null }, c: ShippingCommission, reason: string) {
    const fresh = await repo.commission(by.studioId, c.id, trx);
    if (fresh?.status === 'shipped') await commissions.transitionIn(trx, by, c.id, 'closed', reason);
  }

  return {
    async getSettings(studioId: number) {
      return settingsOf(await repo.settings(studioId));
    },

    async saveSettings(studioId: number, input: ShippingSettingsInput) {
      await repo.saveSettings(studioId, {
        auto_close_days: input.autoCloseDays,
        from_country: input.fromCountry,
        packing_items: JSON.stringify(input.packingItems),
        updated_at: now(),
      });
      return settingsOf(await repo.settings(studioId));
    },

    async list(actor: Actor, commissionId: number): Promise<Shipment[]> {
      const c = await commissionFor(actor, commissionId);
      const rows = (await repo.forCommission(actor.studioId, commissionId)).filter((s) => actor.role !== 'client' || s.status !== 'preparing');
      return Promise.all(rows.map((s) => view(actor, c, s)));
    },

    /** Starts packing: the ship-to address from the client record, the studio's packing checklist. One per commission. */
    async create(actor: Actor, commissionId: number): Promise<Shipment> {
      const id = await db.transaction(async (trx) => {
        const c = await commissionFor(actor, commissionId, trx);
        if (FINISHED.includes(c.status)) throw errors.conflict(`This commission is ${c.status}; it takes no shipment.`, 'commission_locked');
        if ((await repo.forCommission(actor.studioId, commissionId, trx)).length) throw errors.conflict('This commission already has its shipment.', 'shipment_exists');
        const settings = settingsOf(await repo.settings(actor.studioId, trx));
        const t = now();
        const newId = await repo.insert(trx, {
          studio_id: actor.studioId,
          commission_id: commissionId,
          status: 'preparing',
          ship_to_name: c.client_name,
          ship_to_line1: c.address_line1,
          ship_to_line2: c.address_line2,
          ship_to_city: c.address_city,
          ship_to_region: c.address_region,
          ship_to_postal_code: c.address_postal_code,
          ship_to_country: c.address_country,
          currency: c.currency,
          checklist: JSON.stringify(settings.packingItems.map((label) => ({ label, done: false }))),
          created_by: actor.userId,
          created_at: t,
          updated_at: t,
        });
        await activity.record(trx, { studioId: actor.studioId, commissionId, userId: actor.userId, action: 'shipment.created', detail: { summary: 'started packing the parcel.' } });
        return newId;
      });
      const { c, s } = await shipmentFor(actor, commissionId, id);
      return view(actor, c, s);
    },

    async update(actor: Actor, commissionId: number, id: number, input: UpdateShipmentInput): Promise<Shipment> {
      await db.transaction(async (trx) => {
        const { s } = await shipmentFor(actor, commissionId, id, trx);
        if (s.status === 'delivered') throw errors.conflict('This parcel was delivered; its details no longer change.', 'shipment_delivered');
        const patch: Record<string, unknown> = {};
        const set = (col: string, v: unknown) => {
          if (v !== undefined) patch[col] = v;
        };
        if (input.shipTo) {
          const a = input.shipTo;
          Object.assign(patch, {
            ship_to_name: a.name || null,
            ship_to_line1: a.line1 ?? null,
            ship_to_line2: a.line2 ?? null,
            ship_to_city: a.city ?? null,
            ship_to_region: a.region ?? null,
            ship_to_postal_code: a.postalCode ?? null,
            ship_to_country: a.country ?? null,
          });
        }
        set('carrier', input.carrier);
        set('service', input.service);
        set('tracking', input.tracking);
        set('weight_grams', input.weightGrams);
        set('length_cm', input.lengthCm);
        set('width_cm', input.widthCm);
        set('height_cm', input.heightCm);
        set('insured_minor', input.insuredMinor);
        set('customs_text', input.customsText);
        if (input.checklist) patch.checklist = JSON.stringify(input.checklist);
        if (!Object.keys(patch).length) return;
        await repo.update(trx, actor.studioId, id, { ...patch, updated_at: now() });
      });
      const { c, s } = await shipmentFor(actor, commissionId, id);
      return view(actor, c, s);
    },

    /**
     * Sends the parcel: the commission moves to shipped through the lifecycle (whose guard refuses it while
     * the balance is unpaid, unless the owner overrides with a reason), and the client gets the tracking number.
     */
    async ship(actor: Actor, commissionId: number, id: number, input: ShipInput): Promise<Shipment> {
      const at = now();
      await db.transaction(async (trx) => {
        const { c, s } = await shipmentFor(actor, commissionId, id, trx);
        if (s.status !== 'preparing') throw errors.conflict('This parcel has already left.', 'already_shipped');
        const fields: Record<string, string> = {};
        if (!s.carrier) fields.carrier = 'Enter the carrier.';
        if (!s.tracking) fields.tracking = 'Enter the tracking number; the client gets it in the shipped e-mail.';
        if (!s.ship_to_line1) fields['shipTo.line1'] = 'Enter the street address.';
        if (!s.ship_to_city) fields['shipTo.city'] = 'Enter the town or city.';
        if (!s.ship_to_country) fields['shipTo.country'] = 'Enter the country code.';
        if (Object.keys(fields).length) throw errors.invalid('Fill in the parcel’s details before it leaves.', fields);

        const override = input.overrideUnpaid && input.overrideReason ? { reason: input.overrideReason } : undefined;
        // Moved to shipped already (through the plain transition, balance paid): the parcel just catches up.
        if (c.status !== 'shipped') await commissions.transitionIn(trx, actor, commissionId, 'shipped', undefined, { override });
        const overridden = override && balanceOf(await repo.invoices(actor.studioId, commissionId, trx)).unpaid ? override.reason : null;
        if ((await repo.move(trx, actor.studioId, id, 'preparing', { status: 'shipped', shipped_at: at, shipped_by: actor.userId, override_reason: overridden, updated_at: at })) !== 1) {
          throw errors.conflict('This parcel has already left.', 'already_shipped');
        }
        const to = c.client_email ?? c.account_email;
        if (to) {
          const service = s.service ? ` (${s.service})` : '';
          const mail = templates.notice({
            subject: `${c.studio_name}: "${c.title}" is on its way`,
            lines: [
              `Hello ${c.client_name},`,
              `Your figures left the studio today with ${s.carrier}${service}.`,
              `Tracking number: ${s.tracking}`,
              ...(s.insured_minor !== null ? [`The parcel is insured for ${formatMoney(num(s.insured_minor), s.currency)}.`] : []),
              'When it arrives, open the commission and choose "I have received it", so the studio knows it reached you safely.',
            ],
            action: { label: 'Open the commission', url: `${deps.publicUrl}/studio/${actor.studioId}/commissions/${commissionId}` },
          });
          await mailer.enqueue({ ...mail, to, template: 'shipment.shipped', studioId: actor.studioId }, trx);
        }
        await activity.record(trx, {
          studioId: actor.studioId,
          commissionId,
          userId: actor.userId,
          action: 'shipment.shipped',
          detail: { tracking: s.tracking, carrier: s.carrier, summary: `sent the parcel with ${s.carrier}, tracking ${s.tracking}${overridden ? `, before the balance was paid: ${overridden}` : ''}.` },
        });
      });
      mailer.kick();
      const { c, s } = await shipmentFor(actor, commissionId, id);
      return view(actor, c, s);
    },

    /** The owner records the day the parcel arrived; the commission closes. */
    async delivered(actor: Actor, commissionId: number, id: number, input: DeliveredInput): Promise<Shipment> {
      await db.transaction(async (trx) => {
        const { c, s } = await shipmentFor(actor, commissionId, id, trx);
        if (s.status === 'preparing') throw errors.conflict('This parcel has not been sent yet.', 'not_shipped');
        if (s.shipped_at && input.deliveredOn < s.shipped_at.slice(0, 10)) throw errors.field('deliveredOn', 'The parcel cannot arrive before it was sent.');
        await repo.update(trx, actor.studioId, id, { status: 'delivered', delivered_on: input.deliveredOn, received_by: 'studio', updated_at: now() });
        await activity.record(trx, { studioId: actor.studioId, commissionId, userId: actor.userId, action: 'shipment.delivered', detail: { deliveredOn: input.deliveredOn, summary: `recorded the parcel as delivered on ${input.deliveredOn}.` } });
        await closeAfterDelivery(trx, actor, c, `Delivered on ${input.deliveredOn}`);
      });
      const { c, s } = await shipmentFor(actor, commissionId, id);
      return view(actor, c, s);
    },

    /** The client confirms the parcel arrived; the commission closes and the owners hear of it. */
    async received(actor: Actor, commissionId: number, id: number): Promise<Shipment> {
      await db.transaction(async (trx) => {
        const { c, s } = await shipmentFor(actor, commissionId, id, trx);
        if (s.status === 'delivered') throw errors.conflict('This parcel is already marked as received.', 'already_received');
        const today = localDateOf(clock.now().getTime(), c.timezone);
        if ((await repo.move(trx, actor.studioId, id, 'shipped', { status: 'delivered', delivered_on: today, received_by: 'client', updated_at: now() })) !== 1) {
          throw errors.conflict('This parcel is already marked as received.', 'already_received');
        }
        await activity.record(trx, { studioId: actor.studioId, commissionId, userId: actor.userId, action: 'shipment.received', detail: { summary: 'confirmed the parcel arrived.' } });
        await closeAfterDelivery(trx, actor, c, 'Received by the client');
        for (const o of await repo.owners(actor.studioId, trx)) {
          const mail = templates.notice({
            subject: `${c.client_name} has received "${c.title}"`,
            lines: [`Hello ${o.name},`, `${c.client_name} confirmed today that the parcel with "${c.title}" arrived. The commission is closed.`],
            action: { label: 'Open the commission', url: `${deps.publicUrl}/studio/${actor.studioId}/commissions/${commissionId}` },
          });
          await mailer.enqueue({ ...mail, to: o.email, template: 'shipment.received', studioId: actor.studioId }, trx);
        }
      });
      mailer.kick();
      const { c, s } = await shipmentFor(actor, commissionId, id);
      return view(actor, c, s);
    },

    /**
     * The scheduled job: a commission still in "shipped" closes by itself its studio's number of days
     * after the parcel left. Only commissions still in "shipped" are touched, so running it again changes nothing.
     */
    async autoCloseShipped(): Promise<number> {
      const t = clock.now().getTime();
      let closed = 0;
      for (const row of await repo.awaitingClose()) {
        const days = row.has_settings === null ? DEFAULT_AUTO_CLOSE_DAYS : row.auto_close_days;
        if (!days || new Date(row.shipped_at).getTime() + days * DAY > t) continue;
        const done = await db.transaction(async (trx) => {
          const c = await repo.commission(row.studio_id, row.commission_id, trx);
          if (c?.status !== 'shipped') return false;
          await commissions.transitionIn(trx, { studioId: row.studio_id, userId: null }, row.commission_id, 'closed', `Closed by itself ${plural(days, 'day')} after shipping`);
          await repo.update(trx, row.studio_id, row.id, { auto_closed_at: now(), updated_at: now() });
          return true;
        });
        if (done) closed++;
      }
      return closed;
    },

    /**
     * The guard the commissions service runs on every status change: the move to shipped waits for the
     * balance, unless the owner gives a reason to ship anyway (which goes into the log).
     */
    async shippedGuard(trx: Db, change: { studioId: number; commissionId: number; to: CommissionStatus; override: { reason: string } | null }) {
      if (change.to !== 'shipped') return;
      const balance = balanceOf(await repo.invoices(change.studioId, change.commissionId, trx));
      if (!balance.unpaid) return;
      if (!change.override) {
        throw errors.conflict(
          `The balance is not paid yet: ${balance.summary} Record the payment first, or ship from the Shipping section with a reason for going ahead.`,
          'balance_unpaid',
          { balance },
        );
      }
      return { override: 'balance_unpaid', reason: `Shipped before the balance was paid: ${change.override.reason}` };
    },
  };
}

export type ShipmentsService = ReturnType<typeof shipmentsService>;
