// Bidirectional controls in text people type. A right-to-left override (U+202E) or embedding that is
// never closed runs on past the end of the field: in "Mira‮ approved the quote" on a screen, in an
// e-mail or a notice, the app's own words after the name come out backwards (a known spoofing trick).
// Such an unclosed control is dropped from the text. Controls the text opens and closes itself stay,
// and so does everything else, right-to-left letters and marks included. Dropping (rather than closing
// at the end) never makes a text longer than the length its field allows.

const EMBEDDINGS = new Set(['\u202A', '\u202B', '\u202D', '\u202E']); // LRE RLE LRO RLO
const POP_EMBEDDING = '\u202C'; // PDF
const ISOLATES = new Set(['\u2066', '\u2067', '\u2068']); // LRI RLI FSI
const POP_ISOLATE = '\u2069'; // PDI
const ANY_OPENER = /[\u202A\u202B\u202D\u202E\u2066-\u2068]/;

/**
 * The text without the embeddings, overrides and isolates it opens and never closes, matched as the
 * Unicode bidirectional algorithm (UAX #9) matches them: a PDF closes the innermost embedding within
 * the current isolate, a PDI closes its isolate and whatever was opened inside it.
 */
export function dropUnclosedBidi(text: string): string {
  if (!ANY_OPENER.test(text)) return text;
  const chars = Array.from(text);
  const open: { kind: 'e' | 'i'; at: number }[] = [];
  chars.forEach((ch, at) => {
    if (EMBEDDINGS.has(ch)) open.push({ kind: 'e', at });
    else if (ISOLATES.has(ch)) open.push({ kind: 'i', at });
    else if (ch === POP_EMBEDDING) {
      if (open.at(-1)?.kind === 'e') open.pop();
    } else if (ch === POP_ISOLATE && open.some((o) => o.kind === 'i')) {
      while (open.pop()?.kind !== 'i') {
        /* embeddings inside the isolate end with it */
      }
    }
  });
  if (!open.length) return text;
  const drop = new Set(open.map((o) => o.at));
  return chars.filter((_, i) => !drop.has(i)).join('');
}

/**
 * dropUnclosedBidi on every string in a parsed request body (objects and arrays walked, other values
 * kept); `keep` names keys whose values stay exactly as sent (a password is compared, never shown).
 */
export function dropUnclosedBidiDeep<T>(value: T, keep: (key: string) => boolean = () => false): T {
  if (typeof value === 'string') return dropUnclosedBidi(value) as T;
  if (Array.isArray(value)) return value.map((v) => dropUnclosedBidiDeep(v, keep)) as T;
  if (value && typeof value === 'object' && Object.getPrototypeOf(value) === Object.prototype) {
    return Object.fromEntries(Object.entries(value).map(([k, v]) => [k, keep(k) ? v : dropUnclosedBidiDeep(v, keep)])) as T;
  }
  return value;
}
