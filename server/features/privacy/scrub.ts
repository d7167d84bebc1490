// Taking a person's name and e-mail addresses out of text that stays (kept invoices, mails to others,
// the activity of a kept commission). Pure functions, no I/O.

const escapeRegExp = (s: string) => s.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');
const escapeHtml = (s: string) => s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;').replace(/'/g, '&#39;');

/**
 * Replaces every whole-word occurrence of the needles (any case, also HTML-escaped) by the
 * placeholder. Whole words only, so erasing "Ash" leaves "ashes" alone.
 */
export function scrubber(needles: (string | null | undefined)[], placeholder: string) {
  const words = [...new Set(needles.map((n) => n?.trim()).filter((n): n is string => !!n && n.length >= 2))];
  const variants = [...new Set(words.flatMap((w) => [w, escapeHtml(w)]))].sort((a, b) => b.length - a.length);
  if (!variants.length) return (s: string) => s;
  const re = new RegExp(`(?<![\\p{L}\\p{N}_])(?:${variants.map(escapeRegExp).join('|')})(?![\\p{L}\\p{N}_])`, 'giu');
  return (s: string) => s.replace(re, placeholder);
}

export type Scrub = ReturnType<typeof scrubber>;

/** The same on a nullable column. */
export const scrubNullable = (scrub: Scrub, s: string | null | undefined) => (typeof s === 'string' ? scrub(s) : (s ?? null));

/** Walks parsed JSON: strings are scrubbed, values under keys in `drop` become null (free text that may say anything). */
export function scrubValue(value: unknown, scrub: Scrub, drop: ReadonlySet<string> = new Set()): unknown {
  if (typeof value === 'string') return scrub(value);
  if (Array.isArray(value)) return value.map((v) => scrubValue(v, scrub, drop));
  if (value && typeof value === 'object') {
    return Object.fromEntries(Object.entries(value).map(([k, v]) => [k, drop.has(k) ? null : scrubValue(v, scrub, drop)]));
  }
  return value;
}

/** A JSON text column: parsed and walked when it parses, else treated as text. */
export function scrubJson(text: string | null, scrub: Scrub, drop?: ReadonlySet<string>): string | null {
  if (text === null) return null;
  try {
    return JSON.stringify(scrubValue(JSON.parse(text), scrub, drop));
  } catch {
    return scrub(text);
  }
}
