import { z } from 'zod';
import type { Role } from './common';

export const createCommentInput = z.object({
  body: z.string({ error: 'Write a comment.' }).trim().min(1, 'Write a comment.').max(4000, 'Use at most 4000 characters.'),
});
export type CreateCommentInput = z.infer<typeof createCommentInput>;

export type Comment = {
  id: number;
  /** null when the author's account is gone; role null when they no longer belong to the studio. */
  user: { id: number; name: string; role: Role | null } | null;
  body: string;
  createdAt: string;
};
