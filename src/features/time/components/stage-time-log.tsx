import { useState } from 'react';
import { Pencil, Trash2 } from 'lucide-react';
import { Button } from '../../../components/ui/button';
import { ErrorNote } from '../../../components/ui/error-note';
import { TextField } from '../../../components/ui/field';
import { LoadingBlock } from '../../../components/ui/spinner';
import { useToast } from '../../../components/ui/toast';
import { formatDate, formatDateTime } from '../../../lib/format';
import type { TimeEntry } from '../../../../shared/schemas/commissions';
import { useAddTime } from '../api/add-time';
import { useStageTime } from '../api/get-stage-time';
import { useRemoveTime } from '../api/remove-time';
import { useUpdateTime } from '../api/update-time';

/** Today (yyyy-mm-dd) in the studio's timezone: time cannot be logged for a day still to come. */
function todayIn(timeZone: string): string {
  try {
    return new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' }).format(new Date());
  } catch {
    return new Date().toISOString().slice(0, 10);
  }
}

const h = (n: number) => new Intl.NumberFormat(undefined, { maximumFractionDigits: 2 }).format(n);

function parseHours(v: string): number | null {
  const s = v.trim().replace(',', '.');
  // "1:30" means an hour and a half.
  const m = /^(\d+):([0-5]?\d)$/.exec(s);
  if (m) return Number(m[1]) + Number(m[2]) / 60;
  const n = Number(s);
  return s && Number.isFinite(n) ? n : null;
}

function EntryRow({ studioId, entry, canEdit, stageName, timezone }: { studioId: number; entry: TimeEntry; canEdit: boolean; stageName: string; timezone: string }) {
  const update = useUpdateTime(studioId);
  const remove = useRemoveTime(studioId);
  const toast = useToast();
  const [editing, setEditing] = useState(false);
  const [hours, setHours] = useState(String(entry.hours ?? ''));
  const [note, setNote] = useState(entry.note ?? '');
  const [error, setError] = useState<string | undefined>();

  if (editing) {
    return (
      <li className="py-2">
        <form
          aria-label={`Change the entry of ${formatDate(entry.startedAt, timezone)}`}
          className="flex flex-wrap items-end gap-2"
          onSubmit={async (e) => {
            e.preventDefault();
            const n = parseHours(hours);
            if (n === null || n <= 0 || n > 24) {
              setError('Use hours between 0.01 and 24, such as 1.5 or 1:30.');
              return;
            }
            try {
              await update.mutateAsync({ entryId: entry.id, hours: Math.round(n * 100) / 100, note: note.trim() || null });
              setEditing(false);
              toast.show('Time changed. The change is in the activity log.');
            } catch (err) {
              setError(err instanceof Error ? err.message : 'That did not save. Try again.');
            }
          }}
        >
          <TextField label="Hours" inputMode="decimal" className="w-24" value={hours} error={error} onChange={(e) => setHours(e.target.value)} />
          <TextField label="Note" optional className="min-w-40 flex-1" value={note} onChange={(e) => setNote(e.target.value)} />
          <Button type="submit" size="sm" loading={update.isPending}>
            Save
          </Button>
          <Button variant="secondary" size="sm" onClick={() => setEditing(false)}>
            Cancel
          </Button>
        </form>
      </li>
    );
  }
  return (
    <li className="flex flex-wrap items-center gap-x-3 gap-y-1 py-2 text-sm">
      <span className="figures w-16 font-medium">{entry.hours === null ? 'running' : `${h(entry.hours)} h`}</span>
      <span className="text-sable-600">
        {entry.user.name} · {entry.source === 'timer' ? formatDateTime(entry.startedAt, timezone) : formatDate(entry.startedAt, timezone)}
        {entry.source === 'timer' ? ' · timer' : ' · by hand'}
      </span>
      {entry.note && <span className="min-w-0 break-words">{entry.note}</span>}
      {canEdit && entry.hours !== null && (
        <span className="ml-auto flex gap-1">
          <Button variant="ghost" size="sm" aria-label={`Change ${h(entry.hours)} h on ${stageName}`} onClick={() => setEditing(true)}>
            <Pencil aria-hidden="true" className="size-4" />
            Change
          </Button>
          <Button
            variant="ghost"
            size="sm"
            className="text-oxide-600"
            aria-label={`Delete ${h(entry.hours)} h on ${stageName}`}
            loading={remove.isPending}
            onClick={async () => {
              try {
                await remove.mutateAsync(entry.id);
                toast.show('Entry deleted.');
              } catch (err) {
                toast.show(err instanceof Error ? err.message : 'That did not work. Try again.', 'error');
              }
            }}
          >
            <Trash2 aria-hidden="true" className="size-4" />
          </Button>
        </span>
      )}
    </li>
  );
}

/** The stage's time entries, with a form for time worked without the timer. */
export function StageTimeLog({
  studioId,
  stageId,
  stageName,
  userId,
  isOwner,
  locked,
  timezone,
}: {
  studioId: number;
  stageId: number;
  stageName: string;
  userId: number;
  isOwner: boolean;
  locked: boolean;
  timezone: string;
}) {
  const entries = useStageTime(studioId, stageId);
  const add = useAddTime(studioId, stageId);
  const toast = useToast();
  const [hours, setHours] = useState('');
  const [date, setDate] = useState('');
  const [note, setNote] = useState('');
  const [error, setError] = useState<string | undefined>();

  return (
    <div className="flex flex-col gap-3 rounded-control border border-primer-300 bg-white p-3">
      {entries.isPending ? (
        <LoadingBlock label="Loading time…" />
      ) : entries.error ? (
        <ErrorNote>{entries.error.message}</ErrorNote>
      ) : entries.data.length === 0 ? (
        <p className="text-sm text-sable-600">No time on {stageName} yet.</p>
      ) : (
        <ul aria-label={`Time on ${stageName}`} className="divide-y divide-primer-300">
          {entries.data.map((e) => (
            <EntryRow key={e.id} studioId={studioId} entry={e} stageName={stageName} timezone={timezone} canEdit={!locked && (isOwner || e.user.id === userId)} />
          ))}
        </ul>
      )}
      {!locked && (
        <form
          aria-label={`Add time to ${stageName} by hand`}
          className="flex flex-wrap items-end gap-2"
          onSubmit={async (e) => {
            e.preventDefault();
            const n = parseHours(hours);
            if (n === null || n <= 0 || n > 24) {
              setError('Use hours between 0.01 and 24, such as 1.5 or 1:30.');
              return;
            }
            try {
              await add.mutateAsync({ hours: Math.round(n * 100) / 100, date: date || undefined, note: note.trim() || undefined });
              setHours('');
              setNote('');
              toast.show(`${h(n)} h added to ${stageName}.`);
            } catch (err) {
              setError(err instanceof Error ? err.message : 'That did not save. Try again.');
            }
          }}
        >
          <TextField
            label="Hours worked"
            inputMode="decimal"
            placeholder="1.5"
            className="w-32"
            value={hours}
            error={error}
            onChange={(e) => {
              setHours(e.target.value);
              setError(undefined);
            }}
          />
          <TextField label="Day" type="date" optional max={todayIn(timezone)} hint="Today if left empty." className="w-44" value={date} onChange={(e) => setDate(e.target.value)} />
          <TextField label="Note" optional className="min-w-40 flex-1" value={note} onChange={(e) => setNote(e.target.value)} />
          <Button type="submit" variant="secondary" loading={add.isPending}>
            Add time
          </Button>
        </form>
      )}
    </div>
  );
}
