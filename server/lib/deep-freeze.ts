const readOnly = () => {
  throw new TypeError('A kept value is read-only.');
};

/**
 * Freezes a value and everything reachable from it (plain objects, arrays, and Maps' keys and values).
 * A frozen object is not entered again: it marks what was done (cycles end there), and a prefix of a
 * kept forecast shares the kept rows.
 */
export function deepFreeze<T>(value: T): T {
  const walk = (v: unknown) => {
    if (typeof v !== 'object' || v === null || Object.isFrozen(v)) return;
    if (v instanceof Map) {
      // Object.freeze leaves a Map's entries open; these shadow the methods that would change them.
      for (const m of ['set', 'delete', 'clear']) Object.defineProperty(v, m, { value: readOnly });
      Object.freeze(v);
      for (const [k, x] of v) {
        walk(k);
        walk(x);
      }
      return;
    }
    Object.freeze(v);
    if (Array.isArray(v)) for (const x of v) walk(x);
    else for (const k in v) walk((v as Record<string, unknown>)[k]);
  };
  walk(value);
  return value;
}
