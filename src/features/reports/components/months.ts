export const percent = (share: number | null, digits = 0) =>
  share === null ? '—' : `${share > 0 ? '+' : ''}${new Intl.NumberFormat(undefined, { maximumFractionDigits: digits, minimumFractionDigits: digits }).format(share * 100)} %`;

export const hoursText = (h: number) => `${new Intl.NumberFormat(undefined, { maximumFractionDigits: 2 }).format(h)} h`;
