import { useState } from 'react';
import { Bell, BellOff } from 'lucide-react';
import { Button } from '../../../components/ui/button';
import { Dialog } from '../../../components/ui/dialog';
import { useToast } from '../../../components/ui/toast';
import { useUpdateEmailNotices } from '../api/update-email-notices';

/** In the header for every role: whether Sablework e-mails this person about comments, photos and approvals. */
export function EmailNoticesButton({ on, role }: { on: boolean; role: 'owner' | 'painter' | 'client' }) {
  const [open, setOpen] = useState(false);
  const update = useUpdateEmailNotices();
  const toast = useToast();
  // Shown at once; put back if the server says no.
  const [checked, setChecked] = useState(on);
  const [shownOn, setShownOn] = useState(on);
  if (shownOn !== on) {
    setShownOn(on);
    setChecked(on);
  }
  const Icon = on ? Bell : BellOff;
  const what =
    role === 'client'
      ? 'new comments from the studio, newly shared photos, and requests to approve'
      : 'new comments from clients, and their approvals or requests for changes';
  return (
    <>
      <Button variant="ghost" onClick={() => setOpen(true)} aria-haspopup="dialog">
        <Icon aria-hidden="true" className="size-4" />
        <span className="sr-only md:not-sr-only">E-mail notices</span>
      </Button>
      <Dialog open={open} onClose={() => setOpen(false)} title="E-mail notices" description={`We e-mail you about ${what}.`}>
        <div className="flex items-start gap-3 text-sm">
          <input
            id="email-notices"
            type="checkbox"
            aria-describedby="email-notices-hint"
            className="mt-0.5 size-5 accent-verdigris-600"
            checked={checked}
            disabled={update.isPending}
            onChange={async (e) => {
              const next = e.target.checked;
              setChecked(next);
              try {
                await update.mutateAsync(next);
                toast.show(next ? 'E-mail notices are on.' : 'No more e-mail notices. You can still see everything here.');
              } catch (err) {
                setChecked(!next);
                toast.show(err instanceof Error ? err.message : 'That did not save. Try again.', 'error');
              }
            }}
          />
          <div>
            <label htmlFor="email-notices" className="block font-medium">
              Send me e-mail notices
            </label>
            <p id="email-notices-hint" className="text-sable-600">
              Invitations and password e-mails always come; this covers the rest.
            </p>
          </div>
        </div>
      </Dialog>
    </>
  );
}
