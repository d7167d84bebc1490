import { useState } from 'react';
import type { AcceptEnquiryResult, Enquiry } from '../../../../shared/schemas/enquiries';
import { Button } from '../../../components/ui/button';
import { Dialog } from '../../../components/ui/dialog';
import { ErrorNote } from '../../../components/ui/error-note';
import { TextArea, TextField } from '../../../components/ui/field';
import { isApiError } from '../../../lib/api-client';
import { pluralize } from '../../../lib/format';
import { useAcceptEnquiry } from '../api/accept-enquiry';
import { useDeclineEnquiry } from '../api/decline-enquiry';

const suggestedTitle = (e: Enquiry) => {
  const first = e.figures[0];
  if (!first) return `Enquiry from ${e.name}`;
  return e.figures.length > 1 ? `${first.name} and ${pluralize(e.figures.length - 1, 'more figure')}` : first.name;
};

export function AcceptDialog({ studioId, enquiry, open, onClose, onAccepted }: { studioId: number; enquiry: Enquiry; open: boolean; onClose: () => void; onAccepted: (r: AcceptEnquiryResult) => void }) {
  const accept = useAcceptEnquiry(studioId, enquiry.id);
  const [title, setTitle] = useState(suggestedTitle(enquiry));
  const [invite, setInvite] = useState(true);
  const [error, setError] = useState<{ message: string; title?: string } | null>(null);
  const existing = enquiry.existingClient;
  return (
    <Dialog
      open={open}
      onClose={onClose}
      title="Accept as a commission"
      description={`A commission in the enquiry state, with the ${pluralize(enquiry.figures.length, 'figure line')} and photos of this enquiry.`}
      footer={
        <>
          <Button variant="secondary" onClick={onClose}>
            Not yet
          </Button>
          <Button
            loading={accept.isPending}
            onClick={async () => {
              setError(null);
              try {
                onAccepted(await accept.mutateAsync({ title, invite }));
              } catch (err) {
                setError({ message: err instanceof Error ? err.message : 'That did not work. Try again.', title: isApiError(err) ? err.fields.title : undefined });
              }
            }}
          >
            Accept and create the commission
          </Button>
        </>
      }
    >
      <div className="flex flex-col gap-4">
        {error && !error.title && <ErrorNote>{error.message}</ErrorNote>}
        <TextField label="Commission title" value={title} maxLength={120} onChange={(e) => setTitle(e.target.value)} error={error?.title} />
        <p className="text-sm">
          {existing ? (
            <>
              <span className="font-medium">{existing.name}</span> is already your client with this e-mail address; the commission goes to them.
            </>
          ) : (
            <>
              A new client, <span className="font-medium">{enquiry.name}</span> ({enquiry.email}), is added.
            </>
          )}
        </p>
        {existing?.hasAccount ? (
          <p className="text-sm text-sable-600">They already have an account, so no invitation is needed: they see the commission when they sign in.</p>
        ) : (
          <label className="flex items-start gap-3 text-sm">
            <input type="checkbox" className="mt-0.5 size-5 accent-verdigris-600" checked={invite} onChange={(e) => setInvite(e.target.checked)} />
            <span>Invite them to the client portal by e-mail, so they can follow the commission, approve and pay</span>
          </label>
        )}
      </div>
    </Dialog>
  );
}

export function DeclineDialog({ studioId, enquiry, open, onClose, onDeclined }: { studioId: number; enquiry: Enquiry; open: boolean; onClose: () => void; onDeclined: () => void }) {
  const decline = useDeclineEnquiry(studioId, enquiry.id);
  const [message, setMessage] = useState(enquiry.declineDraft);
  const [error, setError] = useState<string | null>(null);
  return (
    <Dialog
      open={open}
      onClose={onClose}
      title="Decline the enquiry"
      description={`This e-mail goes to ${enquiry.email}. Change it as you like before sending.`}
      footer={
        <>
          <Button variant="secondary" onClick={onClose}>
            Keep the enquiry
          </Button>
          <Button
            variant="danger"
            loading={decline.isPending}
            onClick={async () => {
              setError(null);
              try {
                await decline.mutateAsync({ message });
                onDeclined();
              } catch (err) {
                setError(isApiError(err) && err.fields.message ? err.fields.message : err instanceof Error ? err.message : 'That did not work. Try again.');
              }
            }}
          >
            Send and decline
          </Button>
        </>
      }
    >
      <TextArea label="Your message" rows={10} maxLength={4000} value={message} onChange={(e) => setMessage(e.target.value)} error={error ?? undefined} />
    </Dialog>
  );
}
