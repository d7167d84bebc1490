import { useMemo, useState } from 'react';
import { useWatch, type Control } from 'react-hook-form';
import { formatMoney, mulDiv } from '../../../../shared/money';
import { formatHours, quoteFigures, type FigureQuoteLine } from '../../../../shared/pricing';
import { sizeClasses, sizeClassLabels, type SizeClass } from '../../../../shared/schemas/price-table';
import { SelectField, TextField } from '../../../components/ui/field';
import { fromDraft, type PriceDraft } from './draft';

/** One quote line priced by the shared engine from the boxes as typed, so the owner sees what a change does. */
export function TryPrices({ control }: { control: Control<PriceDraft> }) {
  const draft = useWatch({ control }) as PriceDraft;
  const [size, setSize] = useState<SizeClass>('28');
  const [tier, setTier] = useState(draft.tiers?.[0]?.key ?? '');
  const [qty, setQty] = useState('10');

  const quantity = /^\d+$/.test(qty) && Number(qty) >= 1 && Number(qty) <= 500 ? Number(qty) : null;
  const result = useMemo(() => {
    const { table, issues } = fromDraft(draft);
    if (issues.length > 0 || quantity === null) return null;
    try {
      const one = quoteFigures({
        priceTable: table,
        figures: [{ id: null, name: 'Example', quantity: 1, sizeClass: size, tier, extras: [], stageHours: {}, omitStages: [] }],
        today: '2026-01-01',
      }).lines[0] as FigureQuoteLine;
      const batch = quoteFigures({
        priceTable: table,
        figures: [{ id: null, name: 'Example', quantity, sizeClass: size, tier, extras: [], stageHours: {}, omitStages: [] }],
        today: '2026-01-01',
      }).lines[0] as FigureQuoteLine;
      return { one, batch, currency: table.currency };
    } catch {
      return null;
    }
  }, [draft, size, tier, quantity]);

  return (
    <div className="flex flex-col gap-4">
      <div className="grid gap-4 sm:grid-cols-3">
        <SelectField label="Example base size" value={size} onChange={(e) => setSize(e.target.value as SizeClass)}>
          {sizeClasses.map((s) => (
            <option key={s} value={s}>
              {sizeClassLabels[s]}
            </option>
          ))}
        </SelectField>
        <SelectField label="Example tier" value={tier} onChange={(e) => setTier(e.target.value)}>
          {(draft.tiers ?? []).map((t) => (
            <option key={t.key} value={t.key}>
              {t.label}
            </option>
          ))}
        </SelectField>
        <TextField
          label="Example: identical figures"
          className="figures"
          inputMode="numeric"
          value={qty}
          onChange={(e) => setQty(e.target.value)}
          error={quantity === null ? 'Use a whole number from 1 to 500.' : undefined}
        />
      </div>
      <div aria-live="polite">
        {result ? (
          <dl className="figures grid gap-x-6 gap-y-1 text-sm sm:grid-cols-[auto_1fr]">
            <dt className="text-sable-600">One figure</dt>
            <dd>
              {formatHours(result.one.batchMinutes)} · {formatMoney(result.one.amount, result.currency)}
            </dd>
            <dt className="text-sable-600">{quantity} identical figures</dt>
            <dd>
              {formatHours(result.batch.batchMinutes)} in all · {formatMoney(result.batch.amount, result.currency)} (
              {formatMoney(mulDiv(result.batch.amount, 1, result.batch.quantity), result.currency)} each on average)
            </dd>
          </dl>
        ) : (
          <p className="text-sm text-sable-600">Fix the boxes marked in red to see an example.</p>
        )}
      </div>
    </div>
  );
}
