import { Plus, Trash2 } from 'lucide-react';
import { formatMoney } from '../../../../shared/money';
import { extraLineKinds, type ExtraLineKind, type PriceTable } from '../../../../shared/schemas/price-table';
import { Button } from '../../../components/ui/button';
import { SelectField, TextField } from '../../../components/ui/field';
import { lineFromPreset, type DraftErrors, type LineDraft } from './editor-draft';

const kindLabels: Record<ExtraLineKind, string> = {
  shipping: 'Shipping',
  insurance: 'Insurance',
  models: 'Models bought for the client',
  custom: 'Something else',
};

export function ExtraLinesEditor({
  lines,
  table,
  errors,
  onChange,
}: {
  lines: LineDraft[];
  table: PriceTable;
  errors: DraftErrors;
  onChange: (lines: LineDraft[]) => void;
}) {
  const currency = table.currency;
  const set = (i: number, patch: Partial<LineDraft>) => onChange(lines.map((l, k) => (k === i ? { ...l, ...patch } : l)));
  return (
    <div className="flex flex-col gap-4">
      {lines.length === 0 ? (
        <p className="text-sm text-sable-600">No extra lines. Shipping, insurance and models you buy for the client go here.</p>
      ) : (
        <ul className="flex flex-col gap-4">
          {lines.map((l, i) => {
            const p = `extraLines.${i}`;
            return (
              <li key={i} className="grid grid-cols-2 gap-3 border-b border-primer-300 pb-4 last:border-b-0 sm:grid-cols-12 sm:items-start">
                <TextField label="Line" className="col-span-2 sm:col-span-4" autoComplete="off" value={l.label} onChange={(e) => set(i, { label: e.target.value })} error={errors[`${p}.label`]} />
                <SelectField label="Kind" className="col-span-2 sm:col-span-3" value={l.kind} onChange={(e) => set(i, { kind: e.target.value as ExtraLineKind })}>
                  {extraLineKinds.map((k) => (
                    <option key={k} value={k}>
                      {kindLabels[k]}
                    </option>
                  ))}
                </SelectField>
                <TextField
                  label="Qty"
                  className="figures sm:col-span-1"
                  inputMode="numeric"
                  autoComplete="off"
                  value={l.quantity}
                  onChange={(e) => set(i, { quantity: e.target.value })}
                  error={errors[`${p}.quantity`]}
                />
                <TextField
                  label={`Each (${currency})`}
                  className="figures sm:col-span-2"
                  inputMode="decimal"
                  autoComplete="off"
                  value={l.unitAmount}
                  onChange={(e) => set(i, { unitAmount: e.target.value })}
                  error={errors[`${p}.unitAmount`]}
                />
                <div className="col-span-2 flex items-center justify-between gap-2 sm:flex-col sm:items-start sm:pt-6">
                  <label className="flex min-h-8 items-center gap-2 text-sm">
                    <input type="checkbox" className="size-4 accent-verdigris-600" checked={l.taxable} onChange={(e) => set(i, { taxable: e.target.checked })} />
                    Taxed
                  </label>
                  <Button variant="ghost" size="sm" onClick={() => onChange(lines.filter((_, k) => k !== i))} aria-label={`Remove ${l.label || `line ${i + 1}`}`}>
                    <Trash2 aria-hidden="true" className="size-4" />
                    Remove
                  </Button>
                </div>
              </li>
            );
          })}
        </ul>
      )}
      <div className="flex flex-wrap gap-2">
        {table.presetLines.map((p) => (
          <Button key={p.key} variant="secondary" size="sm" onClick={() => onChange([...lines, lineFromPreset(p, currency)])}>
            <Plus aria-hidden="true" className="size-4" />
            {p.label}
            {p.amount > 0 && <span className="figures text-sable-600">{formatMoney(p.amount, currency)}</span>}
          </Button>
        ))}
        <Button
          variant="secondary"
          size="sm"
          onClick={() => onChange([...lines, { id: null, kind: 'custom', label: '', quantity: '1', unitAmount: '', taxable: true }])}
        >
          <Plus aria-hidden="true" className="size-4" />
          Another line
        </Button>
      </div>
    </div>
  );
}
