import { useMemo, type ComponentProps } from 'react';
import { SelectField } from '../ui/field';

function browserZones(): string[] {
  try {
    return Intl.supportedValuesOf('timeZone');
  } catch {
    return [];
  }
}

function allZones(extra: string[]): string[] {
  const zones = browserZones();
  const set = new Set([...zones, 'UTC', ...extra.filter(Boolean)]);
  return [...set].sort((a, b) => a.localeCompare(b));
}

/** Every IANA zone this browser knows, plus the current value so a saved zone is never lost. */
export function TimezoneField({
  label = 'Timezone',
  hint = 'Dates and deadlines show in this timezone.',
  error,
  value,
  ...select
}: { label?: string; hint?: string; error?: string; value?: string } & Omit<ComponentProps<'select'>, 'value'>) {
  const zones = useMemo(() => allZones(value ? [value] : []), [value]);
  return (
    <SelectField label={label} hint={hint} error={error} value={value} {...select}>
      {zones.map((z) => (
        <option key={z} value={z}>
          {z.replaceAll('_', ' ')}
        </option>
      ))}
    </SelectField>
  );
}
