import { invoiceKindLabels, invoiceStatusLabels, type InvoiceKind, type InvoiceStatus, type PaymentMethod } from '../../../../shared/schemas/invoices';
import { Badge, type BadgeTone } from '../../../components/ui/badge';
import { formatDate } from '../../../lib/format';

export const statusLabels = invoiceStatusLabels;
export const kindLabels = invoiceKindLabels;

const tones: Record<InvoiceStatus, BadgeTone> = {
  draft: 'neutral',
  open: 'attention',
  partly_paid: 'attention',
  paid: 'success',
  void: 'neutral',
  refunded: 'info',
};

export function InvoiceStatusBadge({ status, overdue = false }: { status: InvoiceStatus; overdue?: boolean }) {
  if (overdue) return <Badge tone="danger">Overdue</Badge>;
  return <Badge tone={tones[status]}>{statusLabels[status]}</Badge>;
}

export const methodLabels: Record<PaymentMethod, string> = {
  card: 'Card',
  bank: 'Bank transfer',
  cash: 'Cash',
  other: 'Other',
};

/** A calendar day (yyyy-mm-dd) with its weekday, formatted at UTC noon so no timezone moves it. */
export function formatDay(date: string): string {
  return formatDate(`${date}T12:00:00Z`, 'UTC');
}

/** Today in the studio's timezone, as yyyy-mm-dd. */
export function todayIn(timezone: string): string {
  try {
    return new Intl.DateTimeFormat('en-CA', { timeZone: timezone, year: 'numeric', month: '2-digit', day: '2-digit' }).format(new Date());
  } catch {
    return new Date().toISOString().slice(0, 10);
  }
}

/** "Deposit invoice 2026-0007", "Credit note 2026-0009", "Progress invoice (draft)" */
export function invoiceTitle(inv: { kind: InvoiceKind; number: string | null }): string {
  return inv.number ? `${kindLabels[inv.kind]} ${inv.number}` : `${kindLabels[inv.kind]} (draft)`;
}
