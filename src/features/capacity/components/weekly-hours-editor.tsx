import { useState } from 'react';
import { Plus, X } from 'lucide-react';
import { isoWeekdays, setHoursInput, weekdayLabels, type PainterCapacityView, type TimeRange, type WeeklyHours } from '../../../../shared/schemas/capacity';
import { Button } from '../../../components/ui/button';
import { ErrorNote } from '../../../components/ui/error-note';
import { useToast } from '../../../components/ui/toast';
import { isApiError } from '../../../lib/api-client';
import { useSetHours } from '../api/set-hours';

type Key = keyof WeeklyHours;
const keys = isoWeekdays.map((d) => String(d) as Key);
const minutes = (t: string) => (/^\d\d:\d\d$/.test(t) ? Number(t.slice(0, 2)) * 60 + Number(t.slice(3)) : NaN);

function total(hours: WeeklyHours): number {
  let m = 0;
  for (const k of keys) for (const r of hours[k] ?? []) m += Math.max(0, minutes(r.end) - minutes(r.start)) || 0;
  return Math.round((m / 60) * 100) / 100;
}

/** One painter's week: ranges per weekday in the studio's local time, saved together. */
export function WeeklyHoursEditor({ studioId, painter, editable }: { studioId: number; painter: PainterCapacityView; editable: boolean }) {
  const [hours, setHours] = useState<WeeklyHours>(painter.hours);
  const [errors, setErrors] = useState<Record<string, string>>({});
  const save = useSetHours(studioId, painter.userId);
  const toast = useToast();
  const dirty = JSON.stringify(hours) !== JSON.stringify(painter.hours);

  const update = (k: Key, ranges: TimeRange[]) => setHours((h) => ({ ...h, [k]: ranges }));
  const copyMonday = () => setHours((h) => ({ ...h, '2': h['1'] ?? [], '3': h['1'] ?? [], '4': h['1'] ?? [], '5': h['1'] ?? [] }));

  function submit() {
    const clean: WeeklyHours = {};
    for (const k of keys) if (hours[k]?.length) clean[k] = hours[k];
    const parsed = setHoursInput.safeParse({ hours: clean });
    if (!parsed.success) {
      const f: Record<string, string> = {};
      for (const i of parsed.error.issues) f[i.path.join('.')] ??= i.message;
      setErrors(f);
      return;
    }
    setErrors({});
    save.mutate(parsed.data, {
      onSuccess: (view) => {
        // The server keeps the ranges sorted; take its version so the form is no longer "not saved".
        setHours(view.painters.find((p) => p.userId === painter.userId)?.hours ?? parsed.data.hours);
        toast.show(`${painter.name}’s hours are saved; the forecast has moved with them.`);
      },
      onError: (err) => {
        if (isApiError(err, 400)) setErrors(err.fields);
      },
    });
  }

  const name = painter.name;
  return (
    <div className="flex flex-col gap-3">
      <ul className="flex flex-col divide-y divide-primer-300 rounded-control border border-primer-300 bg-white" aria-label={`${name}’s working hours`}>
        {keys.map((k) => {
          const ranges = hours[k] ?? [];
          const day = weekdayLabels[Number(k)];
          return (
            <li key={k} className="flex flex-col gap-x-3 gap-y-1 px-3 py-2 sm:flex-row sm:items-start">
              <span className="shrink-0 text-sm font-medium sm:w-24 sm:pt-2">{day}</span>
              <div className="flex min-w-0 flex-1 flex-col gap-2">
                {ranges.length === 0 && <span className="text-sm text-sable-600 sm:pt-2">Not working</span>}
                {ranges.map((r, i) => {
                  const err = errors[`hours.${k}.${i}.start`] ?? errors[`hours.${k}.${i}.end`];
                  return (
                    <div key={i} className="flex flex-col gap-1">
                      <div className="flex items-center gap-1.5 sm:gap-2">
                        <input
                          type="time"
                          step={900}
                          value={r.start}
                          disabled={!editable}
                          aria-label={`${day}, range ${i + 1}, from`}
                          aria-invalid={err ? true : undefined}
                          onChange={(e) => update(k, ranges.map((x, j) => (j === i ? { ...x, start: e.target.value } : x)))}
                          className="min-h-10 w-[7.25rem] min-w-0 rounded-control border border-sable-600 bg-white px-1.5 text-sm aria-invalid:border-2 aria-invalid:border-oxide-600 sm:w-36 sm:px-2 sm:text-base"
                        />
                        <span aria-hidden="true">to</span>
                        <input
                          type="time"
                          step={900}
                          value={r.end === '24:00' ? '23:59' : r.end}
                          disabled={!editable}
                          aria-label={`${day}, range ${i + 1}, until`}
                          aria-invalid={err ? true : undefined}
                          onChange={(e) => update(k, ranges.map((x, j) => (j === i ? { ...x, end: e.target.value === '23:59' ? '24:00' : e.target.value } : x)))}
                          className="min-h-10 w-[7.25rem] min-w-0 rounded-control border border-sable-600 bg-white px-1.5 text-sm aria-invalid:border-2 aria-invalid:border-oxide-600 sm:w-36 sm:px-2 sm:text-base"
                        />
                        {editable && (
                          <Button variant="ghost" size="sm" onClick={() => update(k, ranges.filter((_, j) => j !== i))} aria-label={`Remove ${day} range ${i + 1}`}>
                            <X aria-hidden="true" className="size-4" />
                          </Button>
                        )}
                      </div>
                      {err && <p className="text-sm text-oxide-600">{err}</p>}
                    </div>
                  );
                })}
              </div>
              {editable && ranges.length < 4 && (
                <Button
                  variant="ghost"
                  size="sm"
                  className="self-start sm:mt-1"
                  onClick={() => update(k, [...ranges, ranges.length ? { start: '13:00', end: '17:00' } : { start: '09:00', end: '15:00' }])}
                  aria-label={ranges.length ? `Add another range on ${day}` : `Add working hours on ${day}`}
                >
                  <Plus aria-hidden="true" className="size-4" />
                  {ranges.length ? 'Add a range' : 'Add hours'}
                </Button>
              )}
            </li>
          );
        })}
      </ul>
      <div className="flex flex-wrap items-center gap-3">
        <p className="figures text-sm" aria-live="polite">
          {total(hours)} h a week{dirty ? ' (not saved yet)' : ''}
        </p>
        {editable && (
          <>
            <Button variant="ghost" size="sm" onClick={copyMonday} disabled={!(hours['1'] ?? []).length}>
              Same as Monday, Tuesday to Friday
            </Button>
            <Button onClick={submit} loading={save.isPending} disabled={!dirty} className="ml-auto">
              Save {name.split(' ')[0]}’s hours
            </Button>
          </>
        )}
      </div>
      {save.error && !isApiError(save.error, 400) && <ErrorNote>{save.error.message}</ErrorNote>}
    </div>
  );
}
