import { toMinor } from '../../../../shared/money';

/** The amount typed in a box, exactly, or the reason it cannot be read. */
export function readAmount(text: string, currency: string, opts: { max?: number } = {}): { minor: number } | { error: string } {
  if (text.trim() === '') return { error: 'Enter an amount.' };
  try {
    const minor = toMinor(text, currency);
    if (minor <= 0) return { error: 'Enter an amount above zero.' };
    if (opts.max !== undefined && minor > opts.max) return { error: 'That is more than is left on this invoice.' };
    return { minor };
  } catch (err) {
    return { error: err instanceof Error ? err.message : 'That is not an amount.' };
  }
}
