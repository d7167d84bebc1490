// Models in (what the client's models looked like on arrival) and shipping out (packing, parcel, customs,
// delivery): requests (zod), responses and the customs wording.
import { z } from 'zod';
import { address } from './clients';

const dateOnly = z.iso.date({ error: 'Use a date such as 2026-05-31.' });
const blankToNull = (v: unknown) => (v === '' ? null : v);
/** Text that can be cleared: '' or null clear it, undefined leaves it. */
const clearable = (max: number) => z.preprocess(blankToNull, z.string().trim().max(max, `Use at most ${max} characters.`).nullable()).optional();
const clearableDate = z.preprocess(blankToNull, dateOnly.nullable()).optional();
const clearableInt = (min: number, max: number, what: string) =>
  z
    .preprocess(
      blankToNull,
      z
        .number({ error: `Enter the ${what} as a number.` })
        .int('Use a whole number.')
        .min(min, `At least ${min}.`)
        .max(max, `At most ${max}.`)
        .nullable(),
    )
    .optional();

// --- models in -----------------------------------------------------------------------------------

export const modelSuppliers = ['client_ships', 'studio_buys', 'retailer'] as const;
export type ModelSupplier = (typeof modelSuppliers)[number];
export const modelSupplierLabels: Record<ModelSupplier, string> = {
  client_ships: 'The client sends them',
  studio_buys: 'The studio buys them',
  retailer: 'Sent straight from a shop',
};

export const modelsInInput = z.object({
  supplier: z.enum(modelSuppliers, { error: 'Choose who supplies the models.' }),
  retailer: clearable(120),
  expectedOn: clearableDate,
  receivedOn: clearableDate,
  carrier: clearable(80),
  tracking: clearable(80),
  /** The studio's own note; the client never sees it. */
  note: clearable(2000),
  figures: z
    .array(
      z.object({
        figureId: z.number().int().positive(),
        received: z.number({ error: 'Enter how many arrived.' }).int('Use a whole number.').min(0, 'Cannot be negative.').max(500, 'At most 500.'),
        damaged: z.boolean().default(false),
        note: clearable(300),
      }),
    )
    .max(200)
    .default([]),
});
export type ModelsInInput = z.infer<typeof modelsInInput>;
export type ModelsInFormValues = z.input<typeof modelsInInput>;

export type ModelsInFigure = { figureId: number; name: string; quantity: number; received: number; damaged: boolean; note: string | null };

export type ModelsIn = {
  commissionId: number;
  /** false until the studio records anything */
  recorded: boolean;
  supplier: ModelSupplier;
  retailer: string | null;
  expectedOn: string | null;
  receivedOn: string | null;
  carrier: string | null;
  tracking: string | null;
  note: string | null;
  figures: ModelsInFigure[];
  /** every figure arrived in full and none is marked damaged */
  complete: boolean;
  missing: number;
  damaged: number;
  noticeSentAt: string | null;
  /** What the note to the client could say, from the checks. */
  noticeDraft: string;
  updatedAt: string | null;
};

export const modelsNoticeInput = z.object({
  message: z.string({ error: 'Write the note to the client.' }).trim().min(1, 'Write the note to the client.').max(4000, 'Use at most 4000 characters.'),
});
export type ModelsNoticeInput = z.infer<typeof modelsNoticeInput>;

// --- shipping settings ---------------------------------------------------------------------------

/** A studio's packing checklist until it writes its own (common practice for miniatures by post). */
export const defaultPackingItems = [
  'Each figure wrapped so it cannot move',
  'Magnetised bases on steel sheet, others in foam cut-outs',
  'Contents slip in the box',
  'Fragile labels on the outside',
  'Photos of the packed box',
];
/** Days after shipping when a commission nobody marked received closes by itself. */
export const DEFAULT_AUTO_CLOSE_DAYS = 21;

const countryCode = z
  .string()
  .trim()
  .toUpperCase()
  .regex(/^([A-Z]{2})?$/, 'Use a two-letter country code such as DE or US.');

export const shippingSettingsInput = z.object({
  autoCloseDays: z.number({ error: 'Enter a number of days.' }).int('Use whole days.').min(1, 'At least 1 day.').max(365, 'At most 365 days.').nullable(),
  fromCountry: z.preprocess(blankToNull, countryCode.nullable()),
  packingItems: z
    .array(z.string({ error: 'Write the step.' }).trim().min(1, 'Write the step, or remove it.').max(200, 'Use at most 200 characters.'))
    .min(1, 'Keep at least one packing step.')
    .max(30, 'At most 30 steps.'),
});
export type ShippingSettingsInput = z.infer<typeof shippingSettingsInput>;
export type ShippingSettings = { autoCloseDays: number | null; fromCountry: string | null; packingItems: string[] };

// --- shipments ------------------------------------------------------------------------------------

export const shipmentStatuses = ['preparing', 'shipped', 'delivered'] as const;
export type ShipmentStatus = (typeof shipmentStatuses)[number];
export const shipmentStatusLabels: Record<ShipmentStatus, string> = { preparing: 'Packing', shipped: 'On its way', delivered: 'Delivered' };

export const shipToInput = address.extend({ name: z.string().trim().max(120, 'Use at most 120 characters.').optional() });
export type ShipTo = { name?: string; line1?: string; line2?: string; city?: string; region?: string; postalCode?: string; country?: string };

export const updateShipmentInput = z.object({
  shipTo: shipToInput.optional(),
  carrier: clearable(80),
  service: clearable(80),
  tracking: clearable(80),
  weightGrams: clearableInt(1, 100_000, 'weight'),
  lengthCm: clearableInt(1, 300, 'length'),
  widthCm: clearableInt(1, 300, 'width'),
  heightCm: clearableInt(1, 300, 'height'),
  insuredMinor: clearableInt(0, 1e12, 'insured value'),
  customsText: clearable(2000),
  checklist: z
    .array(z.object({ label: z.string().trim().min(1, 'Write the step.').max(200, 'Use at most 200 characters.'), done: z.boolean() }))
    .max(40, 'At most 40 steps.')
    .optional(),
});
export type UpdateShipmentInput = z.infer<typeof updateShipmentInput>;

export const shipInput = z
  .object({
    /** Ship although the balance is not paid; needs a reason, which is logged. */
    overrideUnpaid: z.boolean().optional(),
    overrideReason: z.preprocess((v) => (v === '' ? undefined : v), z.string().trim().max(500, 'Use at most 500 characters.').optional()),
  })
  .superRefine((v, ctx) => {
    if (v.overrideUnpaid && !v.overrideReason) ctx.addIssue({ code: 'custom', path: ['overrideReason'], message: 'Say why the parcel leaves before the balance is paid.' });
  });
export type ShipInput = z.infer<typeof shipInput>;

export const deliveredInput = z.object({ deliveredOn: dateOnly });
export type DeliveredInput = z.infer<typeof deliveredInput>;

export type BalanceState = {
  /** the move to shipped is refused while this is true (unless the owner overrides it) */
  unpaid: boolean;
  /** what is still open on the commission's issued invoices, in minor units */
  openMinor: number;
  currency: string | null;
  paidBalanceInvoice: boolean;
  summary: string;
};

export type Shipment = {
  id: number;
  commissionId: number;
  status: ShipmentStatus;
  shipTo: ShipTo;
  carrier: string | null;
  service: string | null;
  tracking: string | null;
  weightGrams: number | null;
  lengthCm: number | null;
  widthCm: number | null;
  heightCm: number | null;
  insuredMinor: number | null;
  currency: string;
  /** ship-to country differs from the studio's own */
  abroad: boolean;
  /** null for the client */
  customsText: string | null;
  suggestedCustomsText: string | null;
  checklist: { label: string; done: boolean }[] | null;
  shippedAt: string | null;
  shippedBy: { id: number; name: string } | null;
  overrideReason: string | null;
  deliveredOn: string | null;
  receivedBy: 'client' | 'studio' | null;
  autoClosedAt: string | null;
  /** when the commission closes by itself if nobody marks it received; null when it will not */
  autoCloseOn: string | null;
  /** null for the client */
  balance: BalanceState | null;
  createdAt: string;
};

// --- customs wording ------------------------------------------------------------------------------

export const CUSTOMS_CAUTION =
  'Customs rules differ from country to country and change. This wording is a starting point written by Sablework, not legal advice: check what your carrier and the destination ask for.';

/**
 * A truthful description of the parcel for a customs form: what the figures are, whose they are, and that
 * the studio's service was painting them. Our own wording; the studio edits it per shipment.
 */
export function customsWording(d: {
  supplier: ModelSupplier | null;
  modelCount: number;
  studioName: string;
  serviceValue?: string | null;
}): string {
  const one = d.modelCount === 1;
  const figures = `${d.modelCount > 0 ? d.modelCount : 'The'} painted hobby miniature figure${one ? '' : 's'} (plastic, resin or metal models for tabletop games)`;
  const [they, were, are] = one ? ['The figure', 'was', 'is'] : ['The figures', 'were', 'are'];
  const whose =
    d.supplier === 'studio_buys'
      ? `${they} ${were} bought by ${d.studioName} for the recipient and painted to order: the parcel holds goods sold together with a painting service.`
      : `${they} ${are} the recipient's own property. ${one ? 'It was' : 'They were'} sent to ${d.studioName} only to be painted and ${one ? 'is' : 'are'} being returned to ${one ? 'its' : 'their'} owner; ${one ? 'it was' : 'they were'} not bought from ${d.studioName}.`;
  const value = d.serviceValue ? ` Value of the painting service: ${d.serviceValue}.` : '';
  return `${figures}. ${whose}${value}`;
}
