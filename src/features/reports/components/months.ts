/** "Mar 2026" for "2026-03". */
export function monthLabel(month: string): string {
  const [y, m] = month.split('-').map(Number);
  return new Intl.DateTimeFormat(undefined, { month: 'short', year: 'numeric', timeZone: 'UTC' }).format(new Date(Date.UTC(y, m - 1, 15)));
}

export const percent = (share: number | null, digits = 0) =>
  share === null ? '—' : `${share > 0 ? '+' : ''}${new Intl.NumberFormat(undefined, { maximumFractionDigits: digits, minimumFractionDigits: digits }).format(share * 100)} %`;

export const hoursText = (h: number) => `${new Intl.NumberFormat(undefined, { maximumFractionDigits: 2 }).format(h)} h`;
