import { useState, type FormEvent } from 'react';
import { Download } from 'lucide-react';
import type { Client } from '../../../../shared/schemas/clients';
import { sameName, type ClientPrivacy, type EraseBlocker } from '../../../../shared/schemas/privacy';
import { Button, buttonClasses } from '../../../components/ui/button';
import { Dialog } from '../../../components/ui/dialog';
import { ErrorNote, Note } from '../../../components/ui/error-note';
import { TextField } from '../../../components/ui/field';
import { LoadingBlock } from '../../../components/ui/spinner';
import { useToast } from '../../../components/ui/toast';
import { isApiError } from '../../../lib/api-client';
import { formatDate } from '../../../lib/format';
import { useEraseClient } from '../api/erase-client';
import { clientExportUrl, useClientPrivacy } from '../api/get-client-privacy';

const plural = (n: number, one: string, many = `${one}s`) => `${n} ${n === 1 ? one : many}`;

function BlockerList({ items }: { items: EraseBlocker[] }) {
  return (
    <ul className="ml-5 list-disc">
      {items.map((b) => (
        <li key={`${b.kind}-${b.id}`}>
          <span className="font-medium">{b.label}</span>: {b.reason}
        </li>
      ))}
    </ul>
  );
}

function EraseDialog({ studioId, client, privacy, open, onClose }: { studioId: number; client: Client; privacy: ClientPrivacy; open: boolean; onClose: () => void }) {
  const erase = useEraseClient(studioId, client.id);
  const toast = useToast();
  const [typed, setTyped] = useState('');
  const [alsoOpen, setAlsoOpen] = useState(false);
  const [typedError, setTypedError] = useState<string | null>(null);
  const [formError, setFormError] = useState<string | null>(null);
  const hard = privacy.blockers.filter((b) => !b.overridable);
  const soft = privacy.blockers.filter((b) => b.overridable);
  const { counts } = privacy;

  function close() {
    setTyped('');
    setAlsoOpen(false);
    setTypedError(null);
    setFormError(null);
    onClose();
  }

  async function submit(e: FormEvent) {
    e.preventDefault();
    setFormError(null);
    if (!sameName(typed, client.name)) {
      setTypedError(`Type ${client.name} exactly as it is written here.`);
      return;
    }
    setTypedError(null);
    try {
      const done = await erase.mutateAsync({ confirmName: typed, deleteOpenCommissions: alsoOpen });
      toast.show(done.kept.invoices > 0 ? `${client.name} is erased. Their invoices stay under “${done.placeholder}”.` : `${client.name} is erased.`);
      close();
    } catch (err) {
      if (isApiError(err, 400) && err.fields.confirmName) setTypedError(err.fields.confirmName);
      else setFormError(err instanceof Error ? err.message : 'The client was not erased. Try again.');
    }
  }

  return (
    <Dialog open={open} onClose={close} title={`Erase ${client.name}?`} description="This cannot be undone. Download their data first if you or they need a copy.">
      <form onSubmit={submit} noValidate className="flex flex-col gap-4">
        {formError && <ErrorNote title="Nothing was erased">{formError}</ErrorNote>}
        {hard.length > 0 && (
          <ErrorNote title="Settle these first">
            <BlockerList items={hard} />
          </ErrorNote>
        )}
        <div className="text-sm">
          <p className="font-medium">What goes</p>
          <ul className="ml-5 list-disc text-sable-900">
            <li>Their name, e-mail, phone, address and notes, and their portal account if this is their only studio.</li>
            <li>{[counts.photos && plural(counts.photos, 'photo'), 'comments, approvals, scheme notes and shipping details', counts.enquiries && plural(counts.enquiries, 'enquiry', 'enquiries')].filter(Boolean).join(', ')}.</li>
            {counts.commissions > 0 && <li>Commissions without invoices.</li>}
          </ul>
          {counts.issuedInvoices > 0 && (
            <>
              <p className="mt-2 font-medium">What stays</p>
              <p className="text-sable-900">
                {plural(counts.issuedInvoices, 'issued invoice')} with their numbers, dates, lines and amounts, and the commissions they belong to in a bare form.
                The name becomes “Erased client {client.id}”. Studios usually must keep invoices for years; check your local rules.
              </p>
            </>
          )}
        </div>
        {hard.length === 0 && soft.length > 0 && (
          <div className="flex flex-col gap-2 rounded-control border border-primer-300 p-3 text-sm">
            <p>These commissions are still open:</p>
            <BlockerList items={soft} />
            <label className="flex items-start gap-2 font-medium">
              <input type="checkbox" className="mt-0.5 size-4 accent-verdigris-600" checked={alsoOpen} onChange={(e) => setAlsoOpen(e.target.checked)} />
              Also delete open commissions
            </label>
          </div>
        )}
        {hard.length === 0 && (
          <TextField
            label={`Type ${client.name} to confirm`}
            autoComplete="off"
            spellCheck={false}
            value={typed}
            onChange={(e) => setTyped(e.target.value)}
            error={typedError ?? undefined}
          />
        )}
        <div className="flex flex-wrap justify-end gap-2">
          <Button variant="secondary" onClick={close}>
            {hard.length ? 'Close' : 'Keep the client'}
          </Button>
          {hard.length === 0 && (
            <Button type="submit" variant="danger" loading={erase.isPending} disabled={soft.length > 0 && !alsoOpen}>
              Erase client
            </Button>
          )}
        </div>
      </form>
    </Dialog>
  );
}

/** The owner's privacy tools for one client: hand over a copy of their data, or erase it. */
export function ClientPrivacyPanel({ studioId, client, timezone }: { studioId: number; client: Client; timezone: string }) {
  const privacy = useClientPrivacy(studioId, client.id);
  const [open, setOpen] = useState(false);

  if (privacy.isPending) return <LoadingBlock label="Loading privacy details…" />;
  if (privacy.error) return <ErrorNote title="Privacy details did not load">{privacy.error.message}</ErrorNote>;
  const p = privacy.data;
  const download = (
    <a href={clientExportUrl(studioId, client.id)} download className={buttonClasses('secondary', 'md', 'no-underline')}>
      <Download aria-hidden="true" className="size-4" />
      Download all data
    </a>
  );

  if (p.erasedAt) {
    return (
      <div className="flex flex-col gap-3">
        <Note>
          Erased on {formatDate(p.erasedAt, timezone)}. Only what invoices must keep is left, under this placeholder name.
        </Note>
        <div>{download}</div>
      </div>
    );
  }

  const hard = p.blockers.filter((b) => !b.overridable);
  return (
    <div className="flex flex-col gap-5">
      <div className="flex flex-col gap-2">
        <p className="text-sm text-sable-600">
          A ZIP with every record about {client.name} (a data.json file anyone can open) and the original of every photo — for when they ask for a copy.
        </p>
        <div>{download}</div>
      </div>
      <div className="flex flex-col gap-2 border-t border-primer-300 pt-4">
        <p className="text-sm text-sable-600">
          Erasing deletes their details, photos, comments and enquiries. Issued invoices stay, with the name replaced, because invoices are records a studio usually must keep.
        </p>
        {hard.length > 0 && (
          <div className="text-sm" id={`erase-blockers-${client.id}`}>
            <p className="font-medium text-oxide-600">Before you can erase:</p>
            <BlockerList items={hard} />
          </div>
        )}
        <div>
          <Button
            variant="danger"
            onClick={() => {
              void privacy.refetch();
              setOpen(true);
            }} aria-describedby={hard.length ? `erase-blockers-${client.id}` : undefined}>
            Erase client…
          </Button>
        </div>
      </div>
      <EraseDialog studioId={studioId} client={client} privacy={p} open={open} onClose={() => setOpen(false)} />
    </div>
  );
}
