/** Adds a value to the list under its key (the list made on first use). */
export function pushTo<K, V>(map: Map<K, V[]>, key: K, value: V) {
  const list = map.get(key);
  if (list) list.push(value);
  else map.set(key, [value]);
}

/** Rows grouped by a key, each group in the rows' order: one pass, so many rows cost no more than their count. */
export function groupBy<T, K>(rows: Iterable<T>, key: (r: T) => K): Map<K, T[]> {
  const out = new Map<K, T[]>();
  for (const r of rows) pushTo(out, key(r), r);
  return out;
}
