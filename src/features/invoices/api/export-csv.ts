/** The accountant's CSV: a plain link, downloaded with the session cookie. Dates are yyyy-mm-dd, both optional. */
export function invoicesCsvUrl(studioId: number, range: { from?: string; to?: string }): string {
  const q = new URLSearchParams();
  if (range.from) q.set('from', range.from);
  if (range.to) q.set('to', range.to);
  const qs = q.toString();
  return `/api/studios/${studioId}/invoices/export.csv${qs ? `?${qs}` : ''}`;
}
