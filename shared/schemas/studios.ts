import { z } from 'zod';
import { currencyCode, email, optionalText, timeZone, type Role } from './common';

export const updateStudioInput = z.object({
  name: z.string().trim().min(2, 'Use at least 2 characters.').max(80, 'Use at most 80 characters.').optional(),
  currency: currencyCode.optional(),
  timezone: timeZone.optional(),
  slug: z
    .string()
    .trim()
    .toLowerCase()
    .regex(/^[a-z0-9](?:[a-z0-9-]{0,46}[a-z0-9])?$/, 'Use 1–48 lower-case letters, digits and dashes.')
    .optional(),
  about: optionalText(2000),
});
export type UpdateStudioInput = z.infer<typeof updateStudioInput>;

export type Studio = {
  id: number;
  name: string;
  slug: string;
  currency: string;
  timezone: string;
  about: string | null;
  role: Role;
};

export const inviteMemberInput = z.object({
  email,
  role: z.enum(['painter', 'owner'], { error: 'Choose painter or owner.' }),
});
export type InviteMemberInput = z.infer<typeof inviteMemberInput>;

export type Member = { userId: number; name: string; email: string; role: Role; joinedAt: string };
export type Invitation = {
  id: number;
  email: string;
  role: Role;
  clientId: number | null;
  expiresAt: string;
  createdAt: string;
};
