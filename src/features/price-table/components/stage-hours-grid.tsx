import { useId, useRef, type KeyboardEvent } from 'react';
import { useWatch, type Control, type FieldErrors, type UseFormRegister } from 'react-hook-form';
import { sizeClasses, sizeClassLabels } from '../../../../shared/schemas/price-table';
import { cn } from '../../../lib/cn';
import { hoursToText, type PriceDraft } from './draft';
import { errorAt } from './form-bits';

type Props = {
  register: UseFormRegister<PriceDraft>;
  control: Control<PriceDraft>;
  errors: FieldErrors<PriceDraft>;
  stages: PriceDraft['stages'];
  tiers: PriceDraft['tiers'];
  tier: string;
  onTierChange: (tier: string) => void;
};

function countErrors(errors: FieldErrors<PriceDraft>, tier: string): number {
  const grid = errors.stageHours as Record<string, Record<string, Record<string, unknown>> | undefined> | undefined;
  if (!grid) return 0;
  let n = 0;
  for (const size of Object.values(grid)) n += Object.keys(size?.[tier] ?? {}).length;
  return n;
}

/** Sum of one row's hours as typed; rows with a box that is not a number show a dash. */
function RowTotal({ control, size, tier, stages }: { control: Control<PriceDraft>; size: string; tier: string; stages: PriceDraft['stages'] }) {
  const row = useWatch({ control, name: `stageHours.${size}.${tier}` as const }) as Record<string, string> | undefined;
  let total = 0;
  for (const s of stages) {
    const v = row?.[s.key]?.trim() ?? '';
    if (!/^\d+(\.\d+)?$/.test(v)) return <span className="text-sable-600">—</span>;
    total += Number(v);
  }
  return <>{hoursToText(Math.round(total * 100) / 100)} h</>;
}

/**
 * Hours per stage for one figure, size classes down and stages across, one tier at a time.
 * Arrow keys move between boxes like a spreadsheet (left and right once the caret reaches the edge
 * of the text), Enter moves down.
 */
export function StageHoursGrid({ register, control, errors, stages, tiers, tier, onTierChange }: Props) {
  const base = useId();
  const tableRef = useRef<HTMLTableElement>(null);
  const tabRefs = useRef<Record<string, HTMLButtonElement | null>>({});
  const tierLabel = tiers.find((t) => t.key === tier)?.label ?? tier;

  function move(e: KeyboardEvent<HTMLInputElement>, row: number, col: number) {
    const input = e.currentTarget;
    const atStart = input.selectionStart === 0 && input.selectionEnd === 0;
    const atEnd = input.selectionStart === input.value.length;
    let r = row;
    let c = col;
    if (e.key === 'ArrowUp') r--;
    else if (e.key === 'ArrowDown' || e.key === 'Enter') r++;
    else if (e.key === 'ArrowLeft' && atStart) c--;
    else if (e.key === 'ArrowRight' && atEnd) c++;
    else return;
    // Enter moves down like a spreadsheet and never submits the whole form from inside the grid
    if (e.key === 'Enter') e.preventDefault();
    const next = tableRef.current?.querySelector<HTMLInputElement>(`input[data-cell="${r}:${c}"]`);
    if (!next) return;
    e.preventDefault();
    next.focus();
    next.select();
  }

  function onTabKey(e: KeyboardEvent<HTMLButtonElement>, index: number) {
    const targets: Record<string, number> = {
      ArrowRight: (index + 1) % tiers.length,
      ArrowLeft: (index - 1 + tiers.length) % tiers.length,
      Home: 0,
      End: tiers.length - 1,
    };
    const i = targets[e.key];
    if (i === undefined) return;
    e.preventDefault();
    const key = tiers[i].key;
    onTierChange(key);
    tabRefs.current[key]?.focus();
  }

  const problems: { path: string; where: string; message: string; cell: string }[] = [];
  sizeClasses.forEach((size, r) =>
    stages.forEach((s, c) => {
      const message = errorAt(errors, `stageHours.${size}.${tier}.${s.key}`);
      if (message) problems.push({ path: `stageHours.${size}.${tier}.${s.key}`, where: `${sizeClassLabels[size]} · ${s.label}`, message, cell: `${r}:${c}` });
    }),
  );

  return (
    <div className="flex flex-col gap-3">
      <div role="tablist" aria-label="Tier to edit" className="flex flex-wrap gap-1 border-b border-primer-300">
        {tiers.map((t, i) => {
          const selected = t.key === tier;
          const n = countErrors(errors, t.key);
          return (
            <button
              key={t.key}
              ref={(el) => {
                tabRefs.current[t.key] = el;
              }}
              type="button"
              role="tab"
              id={`${base}-tab-${t.key}`}
              aria-selected={selected}
              aria-controls={`${base}-panel`}
              tabIndex={selected ? 0 : -1}
              onClick={() => onTierChange(t.key)}
              onKeyDown={(e) => onTabKey(e, i)}
              className={cn(
                '-mb-px min-h-10 rounded-t-control border border-b-0 px-4 text-sm',
                selected ? 'border-primer-300 bg-white font-semibold' : 'border-transparent text-sable-600 hover:bg-primer-100',
              )}
            >
              {t.label}
              {n > 0 && <span className="ml-2 rounded-control bg-oxide-600 px-1.5 text-xs text-white">{n} to fix</span>}
            </button>
          );
        })}
      </div>
      <div role="tabpanel" id={`${base}-panel`} aria-labelledby={`${base}-tab-${tier}`}>
        <div className="overflow-x-auto rounded-card border border-primer-300 bg-white">
          <table ref={tableRef} className="border-collapse text-sm">
            <caption className="sr-only">Hours per stage for one {tierLabel} figure, by base size</caption>
            <thead>
              <tr className="border-b border-primer-300 text-xs text-sable-600">
                <th scope="col" className="sticky left-0 z-10 bg-white px-2 py-2 text-left align-bottom font-semibold">
                  Base size
                </th>
                {stages.map((s) => (
                  <th key={s.key} scope="col" className="w-14 px-0.5 py-2 text-right align-bottom leading-tight font-semibold">
                    {s.label}
                  </th>
                ))}
                <th scope="col" className="px-2 py-2 text-right align-bottom leading-tight font-semibold">
                  Per figure
                </th>
              </tr>
            </thead>
            <tbody>
              {sizeClasses.map((size, r) => (
                <tr key={size} className="border-b border-primer-300 last:border-b-0">
                  <th scope="row" className="sticky left-0 z-10 bg-white px-2 py-1 text-left font-medium whitespace-nowrap">
                    {sizeClassLabels[size]}
                  </th>
                  {stages.map((s, c) => {
                    const path = `stageHours.${size}.${tier}.${s.key}` as const;
                    const message = errorAt(errors, path);
                    return (
                      <td key={s.key} className="px-0.5 py-1">
                        <input
                          type="text"
                          inputMode="decimal"
                          autoComplete="off"
                          data-cell={`${r}:${c}`}
                          aria-label={`${sizeClassLabels[size]}, ${s.label}, hours`}
                          aria-invalid={message ? true : undefined}
                          className={cn(
                            'figures h-9 w-14 rounded-control bg-white px-1.5 text-right text-sm',
                            message ? 'border-2 border-oxide-600' : 'border border-primer-300 focus:border-verdigris-600',
                          )}
                          onKeyDown={(e) => move(e, r, c)}
                          {...register(path)}
                        />
                      </td>
                    );
                  })}
                  <td className="figures px-2 py-1 text-right whitespace-nowrap text-sable-600">
                    <RowTotal control={control} size={size} tier={tier} stages={stages} />
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
        {problems.length > 0 && (
          <ul className="mt-2 flex flex-col gap-1 text-sm text-oxide-600" aria-label={`Hours to fix for ${tierLabel}`}>
            {problems.map((p) => (
              <li key={p.path}>
                <button
                  type="button"
                  className="text-left underline"
                  onClick={() => tableRef.current?.querySelector<HTMLInputElement>(`input[data-cell="${p.cell}"]`)?.focus()}
                >
                  {p.where}
                </button>
                : {p.message}
              </li>
            ))}
          </ul>
        )}
      </div>
    </div>
  );
}
