/**
 * The last forecast of each studio, kept in memory while nothing it was worked out from has changed.
 *
 * An entry is good for one studio, one `schedule_version` (moved by database triggers whenever a row the
 * forecast reads changes, see migrations/20270121120000-schedule-version.ts) and one minute of the clock
 * (the forecast is worked out as of the start of the minute). Entries are frozen, so no caller can change
 * what the next one reads. Bounded by the stages they hold, least recently used out first. A lookup
 * shares a computation still running for the same key, so many requests after a write run it once.
 */

export type CacheKey = { studioId: number; version: number; minute: number };

type Entry<V> = { version: number; minute: number; weight: number; value: Promise<V> };

export function forecastCache<V>(opts: { maxWeight: number; weigh: (v: V) => number }) {
  const entries = new Map<number, Entry<V>>(); // by studio, least recently used first
  let total = 0;

  const drop = (studioId: number) => {
    const e = entries.get(studioId);
    if (!e) return;
    total -= e.weight;
    entries.delete(studioId);
  };

  function evict() {
    for (const [studioId] of entries) {
      if (total <= opts.maxWeight) return;
      drop(studioId);
    }
  }

  return {
    /** The value for `key` if one is kept or being worked out (touching it as recently used). */
    get(key: CacheKey): Promise<V> | undefined {
      const e = entries.get(key.studioId);
      if (!e || e.version !== key.version || e.minute !== key.minute) return undefined;
      entries.delete(key.studioId);
      entries.set(key.studioId, e);
      return e.value;
    },

    /**
     * Keeps what `compute` gives under `key`, in place of the studio's entry unless that one is newer (a
     * later minute, or a higher version in the same minute: a request that read the version just before a
     * write finishes after one that read it just after). A failure is not kept.
     */
    set(key: CacheKey, compute: Promise<V>): Promise<V> {
      const old = entries.get(key.studioId);
      if (opts.maxWeight <= 0 || (old && (old.minute > key.minute || (old.minute === key.minute && old.version > key.version)))) return compute;
      drop(key.studioId);
      const e: Entry<V> = { version: key.version, minute: key.minute, weight: 0, value: compute };
      entries.set(key.studioId, e);
      compute.then(
        (v) => {
          if (entries.get(key.studioId) !== e) return;
          e.weight = opts.weigh(v);
          total += e.weight;
          evict();
        },
        () => {
          if (entries.get(key.studioId) === e) entries.delete(key.studioId);
        },
      );
      return compute;
    },

    /** Studios kept and the weight they hold (for tests). */
    size: () => ({ studios: entries.size, weight: total }),
  };
}
