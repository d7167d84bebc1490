import { useEffect, useRef, useState } from 'react';
import { CalendarPlus, Copy } from 'lucide-react';
import type { CalendarFeedView } from '../../../../shared/schemas/schedule';
import { Button } from '../../../components/ui/button';
import { Card } from '../../../components/ui/card';
import { Dialog } from '../../../components/ui/dialog';
import { ErrorNote, Note } from '../../../components/ui/error-note';
import { Spinner } from '../../../components/ui/spinner';
import { useToast } from '../../../components/ui/toast';
import { formatDateTime } from '../../../lib/format';
import { useCreateCalendarFeed } from '../api/create-calendar-feed';
import { useCalendarFeed } from '../api/get-calendar-feed';
import { useRemoveCalendarFeed } from '../api/remove-calendar-feed';

/**
 * The person's own calendar address: due dates and forecast ready-to-ship dates for their calendar app.
 * The address is the key, so it is shown once when made; making a new one retires the old.
 */
export function CalendarFeedCard({ studioId, timezone, role }: { studioId: number; timezone: string; role: 'owner' | 'painter' }) {
  const feed = useCalendarFeed(studioId);
  const create = useCreateCalendarFeed(studioId);
  const remove = useRemoveCalendarFeed(studioId);
  const toast = useToast();
  const [fresh, setFresh] = useState<CalendarFeedView | null>(null);
  const [confirm, setConfirm] = useState<null | 'rotate' | 'off'>(null);
  // Keyboard focus after the controls change under it: to the new address, or to "Make my calendar address".
  const addressRef = useRef<HTMLInputElement>(null);
  const makeRef = useRef<HTMLButtonElement>(null);
  const focusMake = useRef(false);
  useEffect(() => {
    if (fresh?.url) addressRef.current?.focus();
  }, [fresh?.url]);
  const active = feed.data?.active;
  const dialogOpen = confirm !== null;
  useEffect(() => {
    // Once the feed is off and the dialog has closed (the page behind a modal cannot take focus).
    if (active === false && !dialogOpen && focusMake.current) {
      focusMake.current = false;
      makeRef.current?.focus();
    }
  }, [active, dialogOpen]);

  const make = () =>
    create.mutate(undefined, {
      onSuccess: (f) => {
        setFresh(f);
        setConfirm(null);
      },
    });
  const off = () => {
    focusMake.current = true;
    remove.mutate(undefined, {
      onError: () => {
        focusMake.current = false;
      },
      onSuccess: () => {
        setFresh(null);
        setConfirm(null);
        toast.show('Your calendar address is turned off. Calendar apps that used it get nothing more.');
      },
    });
  };
  async function copy(url: string) {
    try {
      await navigator.clipboard.writeText(url);
      toast.show('Address copied.');
    } catch {
      toast.show('Copying is not allowed here; select the address and copy it by hand.', 'error');
    }
  }

  const what = role === 'owner' ? 'every commission in the queue' : 'the commissions with figures on your bench';
  return (
    <Card title="Your calendar feed" description={`Due dates and forecast ready-to-ship dates of ${what}, in your own calendar app. It refreshes as the forecast moves.`}>
      {feed.isPending ? (
        <Spinner label="Loading your calendar feed…" />
      ) : feed.error ? (
        <ErrorNote>{feed.error.message}</ErrorNote>
      ) : (
        <div className="flex flex-col gap-3">
          {fresh?.url && (
            <div className="flex flex-col gap-2">
              <label htmlFor="feed-url" className="text-sm font-medium">
                Your secret calendar address
              </label>
              <div className="flex flex-wrap gap-2">
                <input ref={addressRef} id="feed-url" readOnly value={fresh.url} onFocus={(e) => e.currentTarget.select()} className="min-h-10 min-w-0 flex-1 rounded-control border border-sable-600 bg-white px-3 font-mono text-sm" />
                <Button variant="secondary" onClick={() => copy(fresh.url!)}>
                  <Copy aria-hidden="true" className="size-4" />
                  Copy
                </Button>
              </div>
              <Note>
                Add it to your calendar app as a subscription (“from URL” or “by address”). Anyone with this address can read these dates, so keep it to yourself.
                We show it only now; if you lose it, make a new one.
              </Note>
            </div>
          )}
          {feed.data.active ? (
            <p className="text-sm">
              On since {feed.data.createdAt ? formatDateTime(feed.data.createdAt, timezone) : '—'}
              {feed.data.lastUsedAt ? `; last read by a calendar app ${formatDateTime(feed.data.lastUsedAt, timezone)}.` : '; not read by a calendar app yet.'}
            </p>
          ) : (
            <p className="text-sm text-sable-600">You have no calendar address yet.</p>
          )}
          {create.error && <ErrorNote>{create.error.message}</ErrorNote>}
          {remove.error && <ErrorNote>{remove.error.message}</ErrorNote>}
          <div className="flex flex-wrap gap-2">
            {feed.data.active ? (
              <>
                <Button variant="secondary" onClick={() => setConfirm('rotate')}>
                  Make a new address
                </Button>
                <Button variant="ghost" onClick={() => setConfirm('off')}>
                  Turn the feed off
                </Button>
              </>
            ) : (
              <Button ref={makeRef} onClick={make} loading={create.isPending}>
                <CalendarPlus aria-hidden="true" className="size-4" />
                Make my calendar address
              </Button>
            )}
          </div>
        </div>
      )}
      <Dialog
        open={confirm !== null}
        onClose={() => setConfirm(null)}
        title={confirm === 'off' ? 'Turn your calendar feed off?' : 'Make a new calendar address?'}
        description={
          confirm === 'off'
            ? 'Calendar apps that use the current address will stop getting dates.'
            : 'The current address stops working at once; calendar apps that use it need the new one.'
        }
        footer={
          <>
            <Button variant="secondary" onClick={() => setConfirm(null)}>
              Keep the current one
            </Button>
            {confirm === 'off' ? (
              <Button variant="danger" onClick={off} loading={remove.isPending}>
                Turn it off
              </Button>
            ) : (
              <Button onClick={make} loading={create.isPending}>
                Make a new address
              </Button>
            )}
          </>
        }
      />
    </Card>
  );
}
