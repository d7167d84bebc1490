import { z } from 'zod';

/**
 * Erasing a client: the owner types the client's name to confirm. Open commissions without issued
 * invoices block the erase unless `deleteOpenCommissions` says to delete them with everything else.
 */
export const eraseClientInput = z.object({
  confirmName: z.string({ error: "Type the client's name to confirm." }).trim().min(1, "Type the client's name to confirm.").max(200, 'Use at most 200 characters.'),
  deleteOpenCommissions: z.boolean().optional().default(false),
});
export type EraseClientInput = z.input<typeof eraseClientInput>;

/** Same comparison on both sides: spaces squeezed, case ignored. */
export const sameName = (typed: string, name: string) => {
  const norm = (s: string) => s.trim().replace(/\s+/g, ' ').toLocaleLowerCase();
  return norm(typed) === norm(name);
};

/**
 * Something that stops an erase. `overridable`: an open commission without issued invoices, which
 * the erase may delete when asked to; the others need the owner to settle or finish them first.
 */
export type EraseBlocker = {
  kind: 'commission' | 'invoice';
  id: number;
  label: string;
  reason: string;
  overridable: boolean;
};

export type ClientPrivacy = {
  clientId: number;
  name: string;
  erasedAt: string | null;
  blockers: EraseBlocker[];
  /** What the erase would touch, for the confirmation dialog. */
  counts: { commissions: number; photos: number; issuedInvoices: number; enquiries: number };
};

export type EraseResult = {
  clientId: number;
  placeholder: string;
  erasedAt: string;
  alreadyErased: boolean;
  /** account: the client's sign-in was deleted, kept (they belong to another studio), anonymised, or there was none. */
  account: 'deleted' | 'kept' | 'anonymised' | 'none';
  deleted: Record<string, number>;
  kept: { commissions: number; invoices: number };
  photoFiles: number;
};
