import { z } from 'zod';
import { email, optionalText, pageQuery, personName } from './common';

export const address = z.object({
  line1: optionalText(200),
  line2: optionalText(200),
  city: optionalText(100),
  region: optionalText(100),
  postalCode: optionalText(20),
  country: z
    .string()
    .trim()
    .toUpperCase()
    .regex(/^([A-Z]{2})?$/, 'Use a two-letter country code such as DE or US.')
    .optional()
    .transform((v) => (v === '' ? undefined : v)),
});
export type Address = { [K in keyof z.infer<typeof address>]?: string };

export const createClientInput = z.object({
  name: personName,
  email: z.union([z.literal(''), email]).optional().transform((v) => (v === '' ? undefined : v)),
  phone: z
    .string()
    .trim()
    .max(40, 'Use at most 40 characters.')
    .regex(/^[0-9+()\-. ]*$/, 'Use digits, spaces and + ( ) - . only.')
    .optional()
    .transform((v) => (v === '' ? undefined : v)),
  address: address.optional(),
  notes: optionalText(4000),
});
export type CreateClientInput = z.infer<typeof createClientInput>;

export const updateClientInput = createClientInput.partial();
export type UpdateClientInput = z.infer<typeof updateClientInput>;

export type Client = {
  id: number;
  name: string;
  email: string | null;
  phone: string | null;
  address: Address;
  notes: string | null;
  hasAccount: boolean;
  invitedAt: string | null;
  createdAt: string;
  /** Set when the client was erased: the record is a placeholder that only keeps old invoices. */
  erasedAt: string | null;
};

/** The clients list: a page, a search, and whether erased placeholders are listed (pickers for new work hide them). */
export const clientListQuery = pageQuery.extend({
  erased: z.enum(['shown', 'hidden']).default('shown'),
});
export type ClientListQuery = z.infer<typeof clientListQuery>;
