// Dates show in the studio's timezone, always with the weekday (look.md); the browser's locale
// decides the order of day and month.

function toDate(value: string | number | Date): Date {
  return value instanceof Date ? value : new Date(value);
}

function safeZone(timeZone: string | undefined): string | undefined {
  if (!timeZone) return undefined;
  try {
    new Intl.DateTimeFormat(undefined, { timeZone });
    return timeZone;
  } catch {
    return undefined;
  }
}

/** "Tue, 3 Dec 2024" */
export function formatDate(value: string | number | Date, timeZone?: string): string {
  const d = toDate(value);
  if (Number.isNaN(d.getTime())) return '—';
  return new Intl.DateTimeFormat(undefined, {
    weekday: 'short',
    day: 'numeric',
    month: 'short',
    year: 'numeric',
    timeZone: safeZone(timeZone),
  }).format(d);
}

/** "Tue, 3 Dec 2024, 14:05" */
export function formatDateTime(value: string | number | Date, timeZone?: string): string {
  const d = toDate(value);
  if (Number.isNaN(d.getTime())) return '—';
  return new Intl.DateTimeFormat(undefined, {
    weekday: 'short',
    day: 'numeric',
    month: 'short',
    year: 'numeric',
    hour: '2-digit',
    minute: '2-digit',
    timeZone: safeZone(timeZone),
  }).format(d);
}

/** Digits after the decimal point for a currency (JPY 0, EUR 2, BHD 3), from Intl. */
export function currencyDigits(currency: string): number {
  try {
    return new Intl.NumberFormat('en', { style: 'currency', currency }).resolvedOptions().maximumFractionDigits ?? 2;
  } catch {
    return 2;
  }
}

/** Money is integer minor units; shown always with its currency. */
export function formatMoney(minor: number, currency: string): string {
  const digits = currencyDigits(currency);
  const major = minor / 10 ** digits;
  try {
    return new Intl.NumberFormat(undefined, {
      style: 'currency',
      currency,
      minimumFractionDigits: digits,
      maximumFractionDigits: digits,
    }).format(major);
  } catch {
    return `${major.toFixed(digits)} ${currency}`;
  }
}

/** Hours from minutes, one decimal: "14.5 h". */
export function formatHours(minutes: number): string {
  const hours = Math.round((minutes / 60) * 10) / 10;
  return `${new Intl.NumberFormat(undefined, { maximumFractionDigits: 1 }).format(hours)} h`;
}

export function pluralize(count: number, one: string, many = `${one}s`): string {
  return `${count} ${count === 1 ? one : many}`;
}

/** Whole minutes to wait, rounded up, for throttling messages. */
export function minutesFromSeconds(seconds: number): number {
  return Math.max(1, Math.ceil(seconds / 60));
}

export function browserTimeZone(): string {
  try {
    return Intl.DateTimeFormat().resolvedOptions().timeZone || 'UTC';
  } catch {
    return 'UTC';
  }
}
