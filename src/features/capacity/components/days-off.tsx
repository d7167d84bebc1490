import { useState, type FormEvent } from 'react';
import { Trash2 } from 'lucide-react';
import { dayOffInput, dayOffKindLabels, type DayOff, type DayOffKind } from '../../../../shared/schemas/capacity';
import { Badge } from '../../../components/ui/badge';
import { Button } from '../../../components/ui/button';
import { ErrorNote } from '../../../components/ui/error-note';
import { SelectField, TextField } from '../../../components/ui/field';
import { useToast } from '../../../components/ui/toast';
import { isApiError } from '../../../lib/api-client';
import { useAddDayOff } from '../api/add-day-off';
import { useRemoveDayOff } from '../api/remove-day-off';
import { dayRange } from './dates';

/**
 * Days without work: one painter's days off and holidays (`userId` set), or the studio's closed days
 * (`userId` null). Ranges are whole local days, first and last included.
 */
export function DaysOff({
  studioId,
  userId,
  who,
  entries,
  editable,
  today,
}: {
  studioId: number;
  userId: number | null;
  who: string;
  entries: DayOff[];
  editable: boolean;
  today: string;
}) {
  const add = useAddDayOff(studioId);
  const remove = useRemoveDayOff(studioId);
  const toast = useToast();
  const closed = userId === null;
  const [kind, setKind] = useState<DayOffKind>(closed ? 'closed' : 'day_off');
  const [from, setFrom] = useState(today);
  const [to, setTo] = useState(today);
  const [note, setNote] = useState('');
  const [errors, setErrors] = useState<Record<string, string>>({});

  function submit(e: FormEvent) {
    e.preventDefault();
    const parsed = dayOffInput.safeParse({ userId, kind, from, to: to || from, note });
    if (!parsed.success) {
      const f: Record<string, string> = {};
      for (const i of parsed.error.issues) f[i.path.join('.')] ??= i.message;
      setErrors(f);
      return;
    }
    setErrors({});
    add.mutate(parsed.data, {
      onSuccess: (d) => {
        toast.show(`${dayOffKindLabels[d.kind]} added: ${dayRange(d.from, d.to)}.`);
        setNote('');
      },
      onError: (err) => isApiError(err, 400) && setErrors(err.fields),
    });
  }

  const idBase = `off-${userId ?? 'studio'}`;
  return (
    <div className="flex flex-col gap-3">
      {entries.length === 0 ? (
        <p className="text-sm text-sable-600">{closed ? 'No closed days ahead.' : `No days off ahead for ${who}.`}</p>
      ) : (
        <ul className="flex flex-col divide-y divide-primer-300 rounded-control border border-primer-300 bg-white" aria-label={closed ? 'Studio closed days' : `${who}’s days off`}>
          {entries.map((d) => (
            <li key={d.id} className="flex flex-wrap items-center gap-2 px-3 py-2 text-sm">
              <Badge tone={d.kind === 'closed' ? 'attention' : 'neutral'}>{dayOffKindLabels[d.kind]}</Badge>
              <span className="figures">{dayRange(d.from, d.to)}</span>
              {d.note && <span className="text-sable-600">{d.note}</span>}
              {editable && (
                <Button
                  variant="ghost"
                  size="sm"
                  className="ml-auto"
                  loading={remove.isPending && remove.variables === d.id}
                  onClick={() => remove.mutate(d.id, { onSuccess: () => toast.show('Removed; the forecast counts those days again.') })}
                  aria-label={`Remove ${dayOffKindLabels[d.kind].toLowerCase()} ${dayRange(d.from, d.to)}`}
                >
                  <Trash2 aria-hidden="true" className="size-4" />
                  Remove
                </Button>
              )}
            </li>
          ))}
        </ul>
      )}
      {remove.error && <ErrorNote>{remove.error.message}</ErrorNote>}
      {editable && <p className="text-sm font-medium">{closed ? 'Close the studio on' : 'Add a day off or a holiday'}</p>}
      {editable && (
        <form onSubmit={submit} className="flex flex-wrap items-end gap-3" aria-label={closed ? 'Add a closed day' : `Add a day off for ${who}`} noValidate>
          {!closed && (
            <SelectField id={`${idBase}-kind`} label="Kind" className="w-36" value={kind} onChange={(e) => setKind(e.target.value as DayOffKind)} error={errors.kind}>
              <option value="day_off">Day off</option>
              <option value="holiday">Holiday</option>
            </SelectField>
          )}
          <TextField
            id={`${idBase}-from`}
            type="date"
            className="w-44"
            label="First day"
            value={from}
            onChange={(e) => {
              setFrom(e.target.value);
              if (!to || to < e.target.value) setTo(e.target.value);
            }}
            error={errors.from}
          />
          <TextField id={`${idBase}-to`} type="date" className="w-44" label="Last day" value={to} min={from} onChange={(e) => setTo(e.target.value)} error={errors.to} />
          <TextField id={`${idBase}-note`} className="min-w-48 flex-1" label="Note" optional value={note} maxLength={120} onChange={(e) => setNote(e.target.value)} error={errors.note} placeholder={closed ? 'e.g. Public holiday' : 'e.g. Family visit'} />
          <Button type="submit" loading={add.isPending} variant="secondary">
            {closed ? 'Close the studio' : 'Add the days'}
          </Button>
        </form>
      )}
      {add.error && !isApiError(add.error, 400) && <ErrorNote>{add.error.message}</ErrorNote>}
    </div>
  );
}
