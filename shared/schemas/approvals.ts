import { z } from 'zod';
import { optionalText } from './common';

export const approvalSubjects = ['scheme', 'test-figure', 'finished'] as const;
export type ApprovalSubject = (typeof approvalSubjects)[number];
export const approvalSubjectLabels: Record<ApprovalSubject, string> = {
  scheme: 'Colour scheme',
  'test-figure': 'Test figure',
  finished: 'Finished work',
};

export const approvalStatuses = ['requested', 'approved', 'changes'] as const;
export type ApprovalStatus = (typeof approvalStatuses)[number];
export const approvalStatusLabels: Record<ApprovalStatus, string> = {
  requested: 'Waiting for the client',
  approved: 'Approved',
  changes: 'Changes asked',
};

export const requestApprovalInput = z.object({
  subject: z.enum(approvalSubjects, { error: 'Choose what to approve: scheme, test-figure or finished.' }),
  note: optionalText(2000),
});
export type RequestApprovalInput = z.infer<typeof requestApprovalInput>;

export const approveInput = z.object({ comment: optionalText(2000) });
export type ApproveInput = z.infer<typeof approveInput>;

export const requestChangesInput = z.object({
  comment: z.string({ error: 'Say what should change.' }).trim().min(1, 'Say what should change.').max(2000, 'Use at most 2000 characters.'),
});
export type RequestChangesInput = z.infer<typeof requestChangesInput>;

type Person = { id: number; name: string } | null;
export type Approval = {
  id: number;
  commissionId: number;
  subject: ApprovalSubject;
  status: ApprovalStatus;
  requestNote: string | null;
  requestedBy: Person;
  requestedAt: string;
  decidedBy: Person;
  decidedAt: string | null;
  comment: string | null;
};
