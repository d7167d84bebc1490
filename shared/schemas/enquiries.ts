// The studio's public page, its enquiry form and the owner's enquiries inbox: requests (zod) and responses.
import { z } from 'zod';
import { listKey, sizeClasses, type SizeClass } from './commissions';
import { email, pageQuery, personName } from './common';

// Limits for visitors who are not signed in: smaller than the studio's own uploads.
/** Most reference photos on one enquiry. */
export const ENQUIRY_MAX_PHOTOS = 5;
/** Largest photo a visitor may send (413 above); the browser scales photos down before sending. */
export const ENQUIRY_MAX_PHOTO_BYTES = 8 * 1024 * 1024;
/** Most figure lines on one enquiry. */
export const ENQUIRY_MAX_FIGURES = 30;
/** Enquiries per hour from one address, and to one e-mail address. */
export const ENQUIRIES_PER_HOUR = 5;

const dateOnly = z.iso.date({ error: 'Use a date such as 2026-05-31.' });
const text = (max: number) => z.string().trim().max(max, `Use at most ${max} characters.`);
const blankToUndefined = (v: unknown) => (v === '' || v === null ? undefined : v);

export const enquiryFigureInput = z.object({
  name: z.string({ error: 'Name the figure.' }).trim().min(1, 'Name the figure.').max(120, 'Use at most 120 characters.'),
  quantity: z
    .number({ error: 'Enter how many.' })
    .int('Use a whole number.')
    .min(1, 'At least 1.')
    .max(500, 'At most 500 of one figure.'),
  sizeClass: z.enum(sizeClasses, { error: 'Choose a base size.' }),
});
export type EnquiryFigureInput = z.infer<typeof enquiryFigureInput>;

/** The enquiry form, as the browser's form holds it (the resolver) and as the server checks it. */
export const enquiryInput = z.object({
  name: personName,
  email,
  figures: z
    .array(enquiryFigureInput, { error: 'List the figures.' })
    .min(1, 'List at least one figure.')
    .max(ENQUIRY_MAX_FIGURES, `At most ${ENQUIRY_MAX_FIGURES} lines; put the rest in the notes.`),
  tier: z.preprocess(blankToUndefined, listKey.optional()),
  extras: z.array(listKey).max(20, 'At most 20 extras.').default([]),
  dueDate: z.preprocess(blankToUndefined, dateOnly.optional()),
  /** In the studio's currency, as typed: "250" or "250.50". */
  budget: z.preprocess(blankToUndefined, text(16).regex(/^\d+(\.\d+)?$/, 'Write the budget as a number, such as 250 or 250.50.').optional()),
  notes: z.preprocess(blankToUndefined, text(4000).optional()),
  consent: z.literal(true, { error: 'Tick the box so the studio may contact you about this enquiry.' }),
  /** The honeypot: hidden from people, filled in by form-filling robots. */
  website: z.preprocess(blankToUndefined, z.string().max(200).optional()),
});
export type EnquiryInput = z.infer<typeof enquiryInput>;
export type EnquiryFormValues = z.input<typeof enquiryInput>;

/** Multipart text fields arrive as strings: the lists as JSON, the tick box as "true". */
function jsonField(v: unknown) {
  if (typeof v !== 'string') return v;
  try {
    return JSON.parse(v);
  } catch {
    return v;
  }
}
export const enquiryMultipartFields = z.preprocess((raw) => {
  if (!raw || typeof raw !== 'object') return raw;
  const r = raw as Record<string, unknown>;
  return {
    ...r,
    figures: jsonField(r.figures),
    extras: r.extras === undefined || r.extras === '' ? undefined : jsonField(r.extras),
    consent: r.consent === 'true' || r.consent === true,
  };
}, enquiryInput);

// --- the public page ----------------------------------------------------------------------------

export const turnaroundSources = ['forecast', 'text'] as const;
export type TurnaroundSource = (typeof turnaroundSources)[number];

export const publicPageInput = z.object({
  enabled: z.boolean({ error: 'Say whether the page is on.' }),
  intro: z.preprocess(blankToUndefined, text(1000).optional()),
  turnaroundText: z.preprocess(blankToUndefined, text(300).optional()),
  turnaroundSource: z.enum(turnaroundSources, { error: 'Choose the forecast or your own text.' }),
});
export type PublicPageInput = z.infer<typeof publicPageInput>;

export type PublicPageSettings = {
  enabled: boolean;
  slug: string;
  /** The page's path in the app: /s/<slug> */
  path: string;
  intro: string | null;
  turnaroundText: string | null;
  turnaroundSource: TurnaroundSource;
};

export type PublicTier = { key: string; label: string; /** a 28 mm figure, before tax; null when the studio has no price table */ fromMinor: number | null };

export type PublicStudio = {
  name: string;
  slug: string;
  intro: string | null;
  currency: string;
  tiers: PublicTier[];
  extras: { key: string; label: string }[];
  /** forecast: the studio's queue says when new work could start; text: the studio's own words */
  turnaround: { source: 'forecast'; startDate: string; queueLength: number } | { source: 'text'; text: string } | null;
  limits: { maxPhotos: number; maxPhotoBytes: number; maxFigures: number };
};

export type EnquiryReceived = { received: true; message: string };

// --- the inbox --------------------------------------------------------------------------------

export const enquiryStatuses = ['new', 'accepted', 'declined'] as const;
export type EnquiryStatus = (typeof enquiryStatuses)[number];
export const enquiryStatusLabels: Record<EnquiryStatus, string> = { new: 'New', accepted: 'Accepted', declined: 'Declined' };

export const enquiryListQuery = pageQuery.extend({
  status: z.enum(enquiryStatuses, { error: 'Unknown status.' }).optional(),
});
export type EnquiryListQuery = z.infer<typeof enquiryListQuery>;

export const acceptEnquiryInput = z.object({
  title: z.preprocess(blankToUndefined, z.string().trim().max(120, 'Use at most 120 characters.').optional()),
  /** Invite the client to the portal (skipped when they already have an account). */
  invite: z.boolean().default(true),
});
export type AcceptEnquiryInput = z.infer<typeof acceptEnquiryInput>;

export const declineEnquiryInput = z.object({
  message: z.string({ error: 'Write the message to the enquirer.' }).trim().min(1, 'Write the message to the enquirer.').max(4000, 'Use at most 4000 characters.'),
});
export type DeclineEnquiryInput = z.infer<typeof declineEnquiryInput>;

export type EnquiryFigure = { name: string; quantity: number; sizeClass: SizeClass };
export type EnquiryPhoto = { id: number; width: number; height: number; urls: { thumb: string; medium: string; large: string; original: string } };

export type EnquirySummary = {
  id: number;
  status: EnquiryStatus;
  name: string;
  email: string;
  figureCount: number;
  modelCount: number;
  tier: { key: string; label: string } | null;
  dueDate: string | null;
  photoCount: number;
  createdAt: string;
};

export type Enquiry = EnquirySummary & {
  figures: EnquiryFigure[];
  extras: { key: string; label: string }[];
  budgetMinor: number | null;
  currency: string;
  notes: string | null;
  photos: EnquiryPhoto[];
  decidedAt: string | null;
  decidedBy: { id: number; name: string } | null;
  clientId: number | null;
  commissionId: number | null;
  declineMessage: string | null;
  /** A polite refusal the owner can edit before sending. */
  declineDraft: string;
  /** A client of the studio with this e-mail already exists (accepting links to them). */
  existingClient: { id: number; name: string; hasAccount: boolean } | null;
};

export type AcceptEnquiryResult = {
  enquiry: Enquiry;
  commissionId: number;
  client: { id: number; name: string; matched: boolean };
  invitation: { sent: boolean; note: string };
};
