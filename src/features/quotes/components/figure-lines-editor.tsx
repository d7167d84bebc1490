import { useId } from 'react';
import { formatMoney } from '../../../../shared/money';
import { formatHours, type FigureQuoteLine } from '../../../../shared/pricing';
import { sizeClassLabels, type PriceTable } from '../../../../shared/schemas/price-table';
import { cn } from '../../../lib/cn';
import type { DraftErrors, FigureDraft } from './editor-draft';

const hoursText = (h: number) => String(Math.round(h * 100) / 100);

function FigureCard({
  index,
  draft,
  table,
  line,
  errors,
  onChange,
}: {
  index: number;
  draft: FigureDraft;
  table: PriceTable;
  line: FigureQuoteLine | undefined;
  errors: DraftErrors;
  onChange: (next: FigureDraft) => void;
}) {
  const id = useId();
  const f = draft.figure;
  const tier = table.tiers.find((t) => t.key === f.tier);
  const grid = table.stageHours[f.sizeClass]?.[f.tier];
  const extras = f.extras.map((k) => table.extras.find((e) => e.key === k)?.label ?? k);
  const changed = Object.values(draft.hours).some((v) => v.trim() !== '') || draft.omit.length > 0;
  const figureError = errors[`figures.${index}.tier`] ?? errors[`figures.${index}.extras`] ?? errors[`figures.${index}.stageHours`];

  return (
    <li className="flex flex-col gap-2 border-b border-primer-300 pb-4 last:border-b-0 last:pb-0">
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h3 className="font-semibold">
          {f.name} <span className="figures font-normal text-sable-600">× {f.quantity}</span>
        </h3>
        {line && (
          <span className="figures text-sm">
            {formatHours(line.batchMinutes)} · <span className="font-semibold">{formatMoney(line.amount, table.currency)}</span>
          </span>
        )}
      </div>
      <p className="text-sm text-sable-600">{[sizeClassLabels[f.sizeClass], tier?.label ?? f.tier, ...extras].join(' · ')}</p>
      {figureError && <p className="text-sm text-oxide-600">{figureError}</p>}
      <details className="rounded-control border border-primer-300 bg-white" open={changed || undefined}>
        <summary className="cursor-pointer px-3 py-2 text-sm font-medium text-verdigris-600">
          Adjust hours for this quote{changed ? ' (adjusted)' : ''}
        </summary>
        <div className="overflow-x-auto px-3 pb-3">
          <table className="w-full text-sm">
            <caption className="sr-only">Hours per stage for one {f.name}</caption>
            <thead>
              <tr className="text-xs text-sable-600">
                <th scope="col" className="py-1 text-left font-semibold">
                  Stage
                </th>
                <th scope="col" className="py-1 text-right font-semibold">
                  Price table
                </th>
                <th scope="col" className="py-1 pl-2 text-right font-semibold">
                  This quote
                </th>
                <th scope="col" className="py-1 pl-2 text-center font-semibold">
                  Not needed
                </th>
              </tr>
            </thead>
            <tbody>
              {table.stages.map((s) => {
                const path = `figures.${index}.stageHours.${s.key}`;
                const err = errors[path];
                const omitted = draft.omit.includes(s.key);
                return (
                  <tr key={s.key} className="border-t border-primer-300">
                    <th scope="row" className="py-1 text-left font-normal">
                      {s.label}
                    </th>
                    <td className="figures py-1 text-right whitespace-nowrap text-sable-600">{grid ? `${hoursText(grid[s.key] ?? 0)} h` : '—'}</td>
                    <td className="py-1 pl-2 text-right">
                      <input
                        type="text"
                        inputMode="decimal"
                        autoComplete="off"
                        aria-label={`${f.name}, ${s.label}, hours for this quote`}
                        aria-invalid={err ? true : undefined}
                        aria-describedby={err ? `${id}-${s.key}-err` : undefined}
                        placeholder={grid ? hoursText(grid[s.key] ?? 0) : ''}
                        disabled={omitted}
                        value={draft.hours[s.key] ?? ''}
                        onChange={(e) => onChange({ ...draft, hours: { ...draft.hours, [s.key]: e.target.value } })}
                        className={cn(
                          'figures h-9 w-20 rounded-control border border-sable-600 bg-white px-2 text-right disabled:bg-primer-100',
                          err && 'border-2 border-oxide-600',
                        )}
                      />
                      {err && (
                        <span id={`${id}-${s.key}-err`} className="block text-left text-xs text-oxide-600">
                          {err}
                        </span>
                      )}
                    </td>
                    <td className="py-1 pl-2 text-center">
                      <input
                        type="checkbox"
                        className="size-4 accent-verdigris-600"
                        aria-label={`${f.name}: ${s.label} not needed`}
                        checked={omitted}
                        onChange={(e) => onChange({ ...draft, omit: e.target.checked ? [...draft.omit, s.key] : draft.omit.filter((k) => k !== s.key) })}
                      />
                    </td>
                  </tr>
                );
              })}
            </tbody>
          </table>
          <p className="mt-2 text-xs text-sable-600">Hours for one figure; leave a box empty to use the price table’s. The batch saving applies to the total.</p>
        </div>
      </details>
    </li>
  );
}

export function FigureLinesEditor({
  figures,
  table,
  lines,
  errors,
  onChange,
}: {
  figures: FigureDraft[];
  table: PriceTable;
  lines: FigureQuoteLine[];
  errors: DraftErrors;
  onChange: (index: number, next: FigureDraft) => void;
}) {
  if (figures.length === 0) {
    return <p className="text-sm text-sable-600">This commission has no figures yet. Add them on the commission, then start a new version of the quote.</p>;
  }
  return (
    <ul className="flex flex-col gap-4">
      {figures.map((fd, i) => (
        <FigureCard key={String(fd.figure.id ?? i)} index={i} draft={fd} table={table} line={lines[i]} errors={errors} onChange={(next) => onChange(i, next)} />
      ))}
    </ul>
  );
}
