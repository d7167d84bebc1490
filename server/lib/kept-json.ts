/**
 * JSON of answers that are, or hold, values kept frozen by keptReads (server/lib/version-cache.ts), written
 * from bytes kept beside each such value; used by json() in server/lib/routes.ts for every answer.
 */

/** The UTF-8 JSON of frozen values, by identity (see keptJson). */
const keptBytes = new WeakMap<object, Buffer>();
const isObject = (v: unknown): v is object => typeof v === 'object' && v !== null;
const isKept = (v: unknown): v is object => isObject(v) && Object.isFrozen(v);
const isPlain = (v: object): v is Record<string, unknown> => {
  const proto = Object.getPrototypeOf(v);
  return (proto === Object.prototype || proto === null) && !('toJSON' in v);
};
function bytesOf(v: object): Buffer {
  let bytes = keptBytes.get(v);
  if (!bytes) {
    // A buffer of its own: a small Buffer.from is a slice of a shared 8 KB slab, which would stay in memory as
    // long as any one value written into it is kept.
    const text = JSON.stringify(v);
    bytes = Buffer.allocUnsafeSlow(Buffer.byteLength(text));
    bytes.write(text);
    keptBytes.set(v, bytes);
  }
  return bytes;
}

/** Marks an answer put together per request around kept values deeper than its top level (keptJson looks in). */
const HOLDS_KEPT = Symbol('holds kept values');
export const holdsKept = <T extends object>(body: T): T => Object.defineProperty(body, HOLDS_KEPT, { value: true });

/** JSON text and kept bytes, in order. */
function chunks() {
  const parts: Buffer[] = [];
  let text = '';
  return {
    text: (t: string) => void (text += t),
    bytes(b: Buffer) {
      if (text) parts.push(Buffer.from(text));
      text = '';
      parts.push(b);
    },
    done() {
      if (text) parts.push(Buffer.from(text));
      return Buffer.concat(parts);
    },
  };
}
type Chunks = ReturnType<typeof chunks>;

/**
 * Writes `v` as JSON.stringify would: a kept (frozen) value from its kept bytes; with `deep`, plain objects and
 * arrays are written here, element by element, so kept values inside them are found; everything else (and
 * without `deep`, every value that is not kept) by JSON.stringify. In an array a value JSON cannot hold is
 * null; in an object its property is left out.
 */
const writtenHere = (v: unknown, deep: boolean) => isKept(v) || (deep && isObject(v) && (Array.isArray(v) || isPlain(v)));
function write(v: unknown, out: Chunks, deep: boolean) {
  if (isKept(v)) out.bytes(bytesOf(v));
  else if (Array.isArray(v)) {
    out.text('[');
    v.forEach((x, i) => {
      if (i) out.text(',');
      if (writtenHere(x, deep)) write(x, out, deep);
      else out.text(JSON.stringify(x) ?? 'null');
    });
    out.text(']');
  } else writeObject(v as Record<string, unknown>, out, deep);
}
function writeObject(v: Record<string, unknown>, out: Chunks, deep: boolean) {
  let first = true;
  for (const k of Object.keys(v)) {
    const x = v[k];
    const here = writtenHere(x, deep);
    const text = here ? '' : JSON.stringify(x);
    if (!here && text === undefined) continue;
    out.text(`${first ? '{' : ','}${JSON.stringify(k)}:`);
    first = false;
    if (here) write(x, out, deep);
    else out.text(text);
  }
  out.text(first ? '{}' : '}');
}

/**
 * The body as UTF-8 JSON when it is a value kept frozen (keptReads freezes what it keeps:
 * server/lib/version-cache.ts), holds one at its top level, or is marked with holdsKept; else undefined (and
 * res.json writes it). A frozen value cannot change, so its JSON is written out once and kept beside it for as
 * long as it is kept itself (a WeakMap): an unchanged kept list is not serialised again on every request. The
 * bytes are those JSON.stringify gives: keys in their order, values JSON cannot hold left out (or null in arrays).
 * (One difference: a toJSON of a value written by JSON.stringify on its own is not told its key; the answers'
 * only toJSON is Date's, which does not look at it.)
 */
export function keptJson(body: unknown): Buffer | undefined {
  if (!isObject(body)) return undefined;
  if (Object.isFrozen(body)) return bytesOf(body);
  if (Array.isArray(body) || !isPlain(body)) return undefined;
  const deep = HOLDS_KEPT in body;
  if (!deep && !Object.values(body).some(isKept)) return undefined;
  const out = chunks();
  writeObject(body, out, deep);
  return out.done();
}
