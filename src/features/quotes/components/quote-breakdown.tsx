import type { ClientBreakdown } from '../../../../shared/pricing';
import { formatBasisPoints, formatHours } from '../../../../shared/pricing';
import { formatMoney } from '../../../../shared/money';
import { Table, TBody, Td, Th, THead, Tr } from '../../../components/ui/table';
import { cn } from '../../../lib/cn';

function Row({ label, value, strong = false, muted = false }: { label: string; value: string; strong?: boolean; muted?: boolean }) {
  return (
    <div className={cn('flex justify-between gap-4', strong && 'border-t border-primer-300 pt-2 text-base font-semibold', muted && 'text-sable-600')}>
      <dt>{label}</dt>
      <dd className="figures text-right whitespace-nowrap">{value}</dd>
    </div>
  );
}

/**
 * The quote as the client reads it: lines, adjustments, tax, total, deposit and balance. `minutes`
 * overrides the hours per line (the owner always sees them); otherwise they show only when the
 * studio shares hours.
 */
export function QuoteBreakdown({ breakdown, minutes, caption = 'Quote lines', compact = false }: { breakdown: ClientBreakdown; minutes?: (number | null)[]; caption?: string; compact?: boolean }) {
  const m = (minor: number) => formatMoney(minor, breakdown.currency);
  const hoursOf = (i: number) => (minutes ? minutes[i] : breakdown.lines[i].minutes);
  const showHours = breakdown.lines.some((_, i) => hoursOf(i) !== null && hoursOf(i) !== undefined);
  const totalMinutes = minutes ? minutes.reduce<number>((s, x) => s + (x ?? 0), 0) : breakdown.totalMinutes;
  const tax = breakdown.tax;
  return (
    <div className="flex flex-col gap-4">
      {breakdown.lines.length === 0 ? (
        <p className="text-sm text-sable-600">No lines yet.</p>
      ) : (
        <Table caption={caption} captionHidden>
          <THead>
            <Tr>
              <Th>What</Th>
              <Th className="text-right">Qty</Th>
              {showHours && !compact && <Th className="text-right">Hours</Th>}
              <Th className="text-right">Amount</Th>
            </Tr>
          </THead>
          <TBody>
            {breakdown.lines.map((l, i) => {
              const mins = hoursOf(i);
              return (
                <Tr key={i}>
                  <Td className="break-words">
                    <span className="font-medium">{l.label}</span>
                    {compact
                      ? mins !== null && mins !== undefined && <span className="figures block text-xs text-sable-600">{formatHours(mins)}</span>
                      : l.detail && <span className="block text-xs text-sable-600">{l.detail}</span>}
                  </Td>
                  <Td className="figures text-right">{l.quantity}</Td>
                  {showHours && !compact && <Td className="figures text-right whitespace-nowrap">{mins === null || mins === undefined ? '—' : formatHours(mins)}</Td>}
                  <Td className="figures text-right whitespace-nowrap">{m(l.amount)}</Td>
                </Tr>
              );
            })}
          </TBody>
        </Table>
      )}
      <dl className="ml-auto flex w-full max-w-sm flex-col gap-1 text-sm">
        <Row label="Subtotal" value={m(breakdown.subtotal)} />
        {breakdown.adjustments.map((a) => (
          <Row key={a.kind} label={a.label} value={`${a.effect === 'subtract' ? '−' : '+'} ${m(a.amount)}`} />
        ))}
        {tax && !tax.inclusive && <Row label={`${tax.label} ${formatBasisPoints(tax.rateBp)}`} value={m(tax.amount)} />}
        <Row label="Total" value={m(breakdown.total)} strong />
        {tax && tax.inclusive && <Row label={`Includes ${tax.label} ${formatBasisPoints(tax.rateBp)}`} value={m(tax.amount)} muted />}
        <Row label="Deposit, to book" value={m(breakdown.deposit)} />
        <Row label="Balance, when finished" value={m(breakdown.balance)} />
        {showHours && totalMinutes !== null && <Row label="Bench time" value={formatHours(totalMinutes)} muted />}
      </dl>
    </div>
  );
}
