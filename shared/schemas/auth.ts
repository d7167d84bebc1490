import { z } from 'zod';
import { currencyCode, email, password, personName, timeZone, type Role } from './common';

export const signupInput = z.object({
  name: personName,
  email,
  password,
  studioName: z.string({ error: 'Enter the studio name.' }).trim().min(2, 'Use at least 2 characters.').max(80, 'Use at most 80 characters.'),
  currency: currencyCode,
  timezone: timeZone,
});
export type SignupInput = z.infer<typeof signupInput>;

export const loginInput = z.object({
  email,
  password: z.string({ error: 'Enter your password.' }).min(1, 'Enter your password.').max(200),
});
export type LoginInput = z.infer<typeof loginInput>;

export const resetRequestInput = z.object({ email });
export type ResetRequestInput = z.infer<typeof resetRequestInput>;

export const resetConfirmInput = z.object({
  token: z.string().min(10).max(200),
  password,
});
export type ResetConfirmInput = z.infer<typeof resetConfirmInput>;

/** Accepting an invitation: a new person sets name and password; an existing account confirms with its password. */
export const acceptInvitationInput = z.object({
  name: personName.optional(),
  password: z.string({ error: 'Enter a password.' }).min(1, 'Enter a password.').max(200),
});
export type AcceptInvitationInput = z.infer<typeof acceptInvitationInput>;

export const updateMeInput = z.object({
  name: personName.optional(),
  emailNotices: z.boolean().optional(),
});
export type UpdateMeInput = z.infer<typeof updateMeInput>;

/** A signed-in person changes their password: the current one, and the new one under the usual rules. */
export const changePasswordInput = z.object({
  currentPassword: z.string({ error: 'Enter your current password.' }).min(1, 'Enter your current password.').max(200),
  newPassword: password,
});
export type ChangePasswordInput = z.infer<typeof changePasswordInput>;

export type Membership = { studioId: number; studioName: string; role: Role };
export type SessionUser = { id: number; email: string; name: string; emailNotices: boolean };
export type MeResponse = { user: SessionUser; memberships: Membership[] };

export type InvitationPreview = {
  studioName: string;
  email: string;
  role: Role;
  accountExists: boolean;
  expiresAt: string;
};

export type AppMeta = { demo: boolean; demoPassword?: string; devMail: boolean };
