import type { ReactNode } from 'react';
import { useState } from 'react';
import { approvalSubjectLabels, approvalSubjects, approvalStatusLabels, type Approval, type ApprovalSubject } from '../../../../shared/schemas/approvals';
import { Badge } from '../../../components/ui/badge';
import { Button } from '../../../components/ui/button';
import { ErrorNote } from '../../../components/ui/error-note';
import { SelectField, TextArea } from '../../../components/ui/field';
import { LoadingBlock } from '../../../components/ui/spinner';
import { useToast } from '../../../components/ui/toast';
import { formatDateTime } from '../../../lib/format';
import { useDecideApproval } from '../api/decide-approval';
import { useApprovals } from '../api/get-approvals';
import { useRequestApproval } from '../api/request-approval';

const tone = { requested: 'attention', approved: 'success', changes: 'danger' } as const;

function ApprovalItem({ a, timezone, children, forClient = false }: { a: Approval; timezone: string; children?: ReactNode; forClient?: boolean }) {
  return (
    <li className="flex flex-col gap-2 rounded-card border border-primer-300 bg-white p-3 text-sm">
      <div className="flex flex-wrap items-center gap-2">
        <span className="font-semibold">{approvalSubjectLabels[a.subject]}</span>
        <Badge tone={tone[a.status]}>{forClient && a.status === 'requested' ? 'Waiting for you' : approvalStatusLabels[a.status]}</Badge>
      </div>
      <p className="text-xs text-sable-600">
        Asked {a.requestedBy ? `by ${a.requestedBy.name} ` : ''}on {formatDateTime(a.requestedAt, timezone)}
      </p>
      {a.requestNote && <p className="whitespace-pre-line">{a.requestNote}</p>}
      {a.decidedAt && (
        <p className="text-xs text-sable-600">
          {a.status === 'approved' ? 'Approved' : 'Changes asked'} {a.decidedBy ? `by ${a.decidedBy.name} ` : ''}on {formatDateTime(a.decidedAt, timezone)}
        </p>
      )}
      {a.comment && <blockquote className="border-l-2 border-primer-300 pl-3 whitespace-pre-line">{a.comment}</blockquote>}
      {children}
    </li>
  );
}

/** The studio asks; the list shows what the client answered. */
export function StudioApprovals({ studioId, commissionId, timezone, locked }: { studioId: number; commissionId: number; timezone: string; locked: boolean }) {
  const approvals = useApprovals(studioId, commissionId);
  const request = useRequestApproval(studioId, commissionId);
  const toast = useToast();
  const [subject, setSubject] = useState<ApprovalSubject>('scheme');
  const [note, setNote] = useState('');
  const [error, setError] = useState<string | null>(null);

  return (
    <div className="flex flex-col gap-4">
      {approvals.isPending ? (
        <LoadingBlock label="Loading approvals…" />
      ) : approvals.error ? (
        <ErrorNote>{approvals.error.message}</ErrorNote>
      ) : approvals.data.length === 0 ? (
        <p className="text-sm text-sable-600">No approvals asked yet. Ask the client to approve the colour scheme or a test figure before the batch.</p>
      ) : (
        <ul className="flex flex-col gap-2">
          {approvals.data.map((a) => (
            <ApprovalItem key={a.id} a={a} timezone={timezone} />
          ))}
        </ul>
      )}
      {!locked && (
        <form
          aria-label="Ask the client to approve"
          className="flex max-w-2xl flex-col gap-3 rounded-card border border-dashed border-primer-300 p-3"
          onSubmit={async (e) => {
            e.preventDefault();
            setError(null);
            try {
              await request.mutateAsync({ subject, note: note.trim() || undefined });
              setNote('');
              toast.show('The client has been asked. They get an e-mail unless they turned notices off.');
            } catch (err) {
              setError(err instanceof Error ? err.message : 'The request did not go out. Try again.');
            }
          }}
        >
          <SelectField label="What should the client approve?" value={subject} onChange={(e) => setSubject(e.target.value as ApprovalSubject)}>
            {approvalSubjects.map((s) => (
              <option key={s} value={s}>
                {approvalSubjectLabels[s]}
              </option>
            ))}
          </SelectField>
          <TextArea label="Note to the client" optional rows={2} value={note} onChange={(e) => setNote(e.target.value)} hint="Point them at the photos to look at." />
          {error && <ErrorNote>{error}</ErrorNote>}
          <div>
            <Button type="submit" variant="secondary" loading={request.isPending}>
              Ask for approval
            </Button>
          </div>
        </form>
      )}
    </div>
  );
}

function Decide({ studioId, a }: { studioId: number; a: Approval }) {
  const decide = useDecideApproval(studioId);
  const toast = useToast();
  const [comment, setComment] = useState('');
  const [error, setError] = useState<string | undefined>();
  const id = `approval-${a.id}-comment`;

  async function go(decision: 'approve' | 'request-changes') {
    if (decision === 'request-changes' && !comment.trim()) {
      setError('Say what should change, so the studio knows what to do.');
      document.getElementById(id)?.focus();
      return;
    }
    try {
      await decide.mutateAsync({ approvalId: a.id, decision, comment: comment.trim() || undefined });
      toast.show(decision === 'approve' ? 'Approved. The studio has been told.' : 'Sent. The studio will get back to you.');
    } catch (err) {
      setError(err instanceof Error ? err.message : 'That did not go through. Try again.');
    }
  }

  return (
    <div className="flex flex-col gap-2">
      <TextArea
        id={id}
        label={`Your comment on the ${approvalSubjectLabels[a.subject].toLowerCase()}`}
        optional
        hint="Needed when you ask for changes."
        rows={3}
        value={comment}
        error={error}
        onChange={(e) => {
          setComment(e.target.value);
          setError(undefined);
        }}
      />
      <div className="flex flex-wrap gap-2">
        <Button loading={decide.isPending && decide.variables?.decision === 'approve'} onClick={() => go('approve')}>
          Approve {approvalSubjectLabels[a.subject].toLowerCase()}
        </Button>
        <Button variant="secondary" loading={decide.isPending && decide.variables?.decision === 'request-changes'} onClick={() => go('request-changes')}>
          Ask for changes
        </Button>
      </div>
    </div>
  );
}

/** The client answers the studio's open requests. */
export function ClientApprovals({ studioId, commissionId, timezone }: { studioId: number; commissionId: number; timezone: string }) {
  const approvals = useApprovals(studioId, commissionId);
  if (approvals.isPending) return <LoadingBlock label="Loading approvals…" />;
  if (approvals.error) return <ErrorNote>{approvals.error.message}</ErrorNote>;
  if (approvals.data.length === 0) return <p className="text-sm text-sable-600">Nothing to approve yet. When the studio asks, it shows here.</p>;
  const open = approvals.data.filter((a) => a.status === 'requested');
  const earlier = approvals.data.filter((a) => a.status !== 'requested');
  return (
    <div className="flex flex-col gap-3">
      {open.length === 0 ? (
        <p className="text-sm text-sable-600">Nothing waits for your answer right now.</p>
      ) : (
        <ul aria-label="Waiting for your answer" className="flex flex-col gap-2">
          {open.map((a) => (
            <ApprovalItem key={a.id} a={a} timezone={timezone} forClient>
              <Decide studioId={studioId} a={a} />
            </ApprovalItem>
          ))}
        </ul>
      )}
      {earlier.length > 0 && (
        <details className="text-sm">
          <summary className="cursor-pointer text-verdigris-600">Your earlier answers ({earlier.length})</summary>
          <ul className="mt-2 flex flex-col gap-2">
            {earlier.map((a) => (
              <ApprovalItem key={a.id} a={a} timezone={timezone} forClient />
            ))}
          </ul>
        </details>
      )}
    </div>
  );
}
