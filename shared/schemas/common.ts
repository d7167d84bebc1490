import { z } from 'zod';
import { code as currencyRecord } from 'currency-codes';

/** E-mail addresses are compared ignoring case everywhere, so they are stored lower-cased and trimmed. */
export const email = z
  .string({ error: 'Enter an e-mail address.' })
  .trim()
  .toLowerCase()
  .max(254, 'That e-mail address is too long.')
  .pipe(z.email({ error: 'That does not look like an e-mail address.' }));

export const password = z
  .string({ error: 'Enter a password.' })
  .min(12, 'Use at least 12 characters.')
  .max(200, 'Use at most 200 characters.');

export const personName = z
  .string({ error: 'Enter a name.' })
  .trim()
  .min(1, 'Enter a name.')
  .max(120, 'Use at most 120 characters.');

export const currencyCode = z
  .string({ error: 'Choose a currency.' })
  .trim()
  .toUpperCase()
  .refine((c) => /^[A-Z]{3}$/.test(c) && currencyRecord(c) !== undefined, 'Use an ISO 4217 currency code such as EUR, USD or JPY.');

export function isTimeZone(tz: string): boolean {
  try {
    new Intl.DateTimeFormat('en', { timeZone: tz });
    return tz.length > 0;
  } catch {
    return false;
  }
}

export const timeZone = z
  .string({ error: 'Choose a timezone.' })
  .trim()
  .refine(isTimeZone, 'Use a timezone name such as Europe/Berlin or America/Chicago.');

/** An id as text is plain decimal digits: '12', never '0x0c', '1e1', '12.0' or ' 12' (no second spelling of one record). */
export const decimalId = /^[1-9][0-9]{0,9}$/;
/** Ids are database serials: PostgreSQL's `integer` ends here, so a larger number can name no record. */
export const MAX_ID = 2_147_483_647;

/** Route ids are positive integers; anything else is a 404 at the policy, never a 500. */
export const id = z.preprocess((v) => (typeof v === 'string' ? (decimalId.test(v) ? Number(v) : Number.NaN) : v), z.number().int().positive().max(MAX_ID));

export const optionalText = (max: number) =>
  z
    .string()
    .trim()
    .max(max, `Use at most ${max} characters.`)
    .optional()
    .transform((v) => (v === '' ? undefined : v));

/** The most rows one page of any list holds. */
export const MAX_PAGE_SIZE = 200;

/** `limit` (page size, `size` unless asked, at most MAX_PAGE_SIZE) and `offset` of one page of a list. */
export const pageParams = (size = 50) =>
  z.object({
    limit: z.coerce.number().int().min(1).max(MAX_PAGE_SIZE).default(size),
    offset: z.coerce.number().int().min(0).max(1_000_000).default(0),
  });
export type PageParams = z.infer<ReturnType<typeof pageParams>>;

/**
 * Lists that answer a bare array (their shape from before paging): up to MAX_PAGE_SIZE rows unless asked
 * for fewer, the count of all of them in the X-Total-Count header.
 */
export const arrayPageParams = pageParams(MAX_PAGE_SIZE);

export const pageQuery = pageParams(50).extend({
  q: z.string().trim().max(200).optional(),
});
export type PageQuery = z.infer<typeof pageQuery>;

export const roles = ['owner', 'painter', 'client'] as const;
export type Role = (typeof roles)[number];

export type Page<T> = { items: T[]; total: number; limit: number; offset: number };

export type ApiErrorBody = { error: { code: string; message: string; fields?: Record<string, string> } };
