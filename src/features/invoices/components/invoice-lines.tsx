import { formatMoney } from '../../../../shared/money';
import { formatBasisPoints } from '../../../../shared/pricing';
import { Table, TBody, Td, Th, THead, Tr } from '../../../components/ui/table';
import type { Invoice } from '../../../../shared/schemas/invoices';

function Row({ label, value, strong = false }: { label: string; value: string; strong?: boolean }) {
  return (
    <div className={strong ? 'flex justify-between gap-4 border-t border-primer-300 pt-2 text-base font-semibold' : 'flex justify-between gap-4'}>
      <dt>{label}</dt>
      <dd className="figures text-right">{value}</dd>
    </div>
  );
}

/** Lines, tax and totals as on the PDF. */
export function InvoiceLines({ invoice }: { invoice: Invoice }) {
  const taxLabel = invoice.taxLabel || 'Tax';
  const m = (minor: number) => formatMoney(minor, invoice.currency);
  const showTaxColumn = invoice.lines.some((l) => l.taxBp > 0);
  return (
    <div className="flex flex-col gap-4">
      <Table caption="Lines" captionHidden>
        <THead>
          <Tr>
            <Th>What</Th>
            <Th className="text-right">Qty</Th>
            <Th className="hidden text-right sm:table-cell">Each</Th>
            {showTaxColumn && <Th className="hidden text-right sm:table-cell">{taxLabel}</Th>}
            <Th className="text-right">Amount</Th>
          </Tr>
        </THead>
        <TBody>
          {invoice.lines.map((l, i) => (
            <Tr key={i}>
              <Td className="break-words">{l.description}</Td>
              <Td className="figures text-right">{l.quantity}</Td>
              <Td className="figures hidden text-right whitespace-nowrap sm:table-cell">{m(l.unitMinor)}</Td>
              {showTaxColumn && <Td className="figures hidden text-right sm:table-cell">{formatBasisPoints(l.taxBp)}</Td>}
              <Td className="figures text-right whitespace-nowrap">{m(l.amountMinor)}</Td>
            </Tr>
          ))}
        </TBody>
      </Table>
      <dl className="ml-auto flex w-full max-w-sm flex-col gap-1 text-sm">
        <Row label="Subtotal" value={m(invoice.subtotal)} />
        {invoice.tax !== 0 && <Row label={invoice.taxInclusive ? `Includes ${taxLabel}` : taxLabel} value={m(invoice.tax)} />}
        <Row label={invoice.kind === 'credit_note' ? 'Credit' : 'Total'} value={m(invoice.total)} strong />
        {invoice.kind !== 'credit_note' && (
          <>
            {invoice.paid !== 0 && <Row label="Paid" value={m(invoice.paid)} />}
            {invoice.refunded !== 0 && <Row label="Refunded" value={m(invoice.refunded)} />}
            {invoice.credited !== 0 && <Row label="Credited" value={m(invoice.credited)} />}
            <Row label="Left to pay" value={m(invoice.balanceDue)} strong />
          </>
        )}
      </dl>
    </div>
  );
}
