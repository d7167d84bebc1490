import { useMemo, useState } from 'react';
import { Button } from '../../../components/ui/button';
import { ErrorNote } from '../../../components/ui/error-note';
import { SelectField } from '../../../components/ui/field';
import { useToast } from '../../../components/ui/toast';
import { useUpdateTimezone } from '../api/update-timezone';

function zones(current: string): string[] {
  let all: string[];
  try {
    all = (Intl as unknown as { supportedValuesOf?: (k: string) => string[] }).supportedValuesOf?.('timeZone') ?? [];
  } catch {
    all = [];
  }
  return all.includes(current) ? all : [current, ...all];
}

/** The studio's timezone: working hours, days off and every date of the calendar are read in it. */
export function TimezoneForm({ studioId, timezone }: { studioId: number; timezone: string }) {
  const [value, setValue] = useState(timezone);
  const list = useMemo(() => zones(timezone), [timezone]);
  const save = useUpdateTimezone(studioId);
  const toast = useToast();
  return (
    <form
      className="flex flex-wrap items-end gap-3"
      onSubmit={(e) => {
        e.preventDefault();
        save.mutate(value, { onSuccess: () => toast.show(`The studio now keeps time in ${value}.`) });
      }}
    >
      <SelectField id="studio-timezone" label="Studio timezone" value={value} onChange={(e) => setValue(e.target.value)} className="min-w-64" hint="Working hours stay at the same local clock times across daylight-saving changes.">
        {list.map((z) => (
          <option key={z} value={z}>
            {z.replace(/_/g, ' ')}
          </option>
        ))}
      </SelectField>
      <Button type="submit" variant="secondary" loading={save.isPending} disabled={value === timezone}>
        Save timezone
      </Button>
      {save.error && <ErrorNote className="w-full">{save.error.message}</ErrorNote>}
    </form>
  );
}
