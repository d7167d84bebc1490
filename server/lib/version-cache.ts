/**
 * What a read gave from the database, kept in memory per studio, schedule version and query: the bench
 * board's (server/features/board/board.service.ts) and the commission list's
 * (server/features/commissions/commissions.service.ts), each its own store; and the books' and the owner's
 * home (server/features/reports/reports.service.ts, server/features/dashboard/dashboard.service.ts) under
 * `booksVersion` below, whose keys name the month or minute of the clock they were worked out for.
 *
 * An entry is good for one studio, one `schedule_version` (moved by database triggers whenever a row such
 * a read depends on changes: migrations/20270121120000-schedule-version.ts, 20270203120000-board-version.ts,
 * 20270204120000-commission-list-version.ts) and one query (filters and page, `key`). Unlike the forecast
 * there is no minute in the key: what is kept must not depend on the clock (the board works its cards'
 * waits out per request).
 *
 * Bounded by weight (rows held), least recently used out first. A lookup shares a read still running for
 * the same key, so many requests after a write read the database once. When an entry of a newer version
 * of a studio is kept, the studio's entries of older versions are dropped: no request can use them again
 * once the newer version is committed (a request that read the older version just before finds no
 * entry and reads for itself).
 */

import { readFirst, type Db } from './db';
import { deepFreeze } from './deep-freeze';

/**
 * The studio's schedule version: database triggers move it with every committed change to a row the
 * forecast, the board or the commission list reads (the migrations above list them). Undefined when there
 * is no such studio.
 */
export const scheduleVersion = (db: Db, studioId: number): Promise<number | undefined> =>
  readFirst<{ schedule_version: number | string }>(db, db('studios').where({ id: studioId }).select('schedule_version')).then((r) =>
    r ? Number(r.schedule_version) : undefined,
  );

/** A version read with the studio's zone, for keys that name a day or month in it. */
export type VersionInZone = { version: number; timeZone: string };

/**
 * The version of what the books and the owner's home read (server/features/reports/,
 * server/features/dashboard/): `schedule_version` + `books_version` (migrations/20270205120000-books-version.ts
 * moves the second on the money tables and the rest those answers read). Both only grow and are read from
 * one row at once, so two reads give the same sum only when neither moved between them. With the studio's
 * zone, for keys that depend on the clock in it (the zone is in the same row; changing it moves the
 * schedule version). Undefined when there is no such studio.
 */
export const booksVersion = (db: Db, studioId: number): Promise<VersionInZone | undefined> =>
  readFirst<{ schedule_version: number | string; books_version: number | string; timezone: string }>(
    db,
    db('studios').where({ id: studioId }).select('schedule_version', 'books_version', 'timezone'),
  ).then((r) => (r ? { version: Number(r.schedule_version) + Number(r.books_version), timeZone: r.timezone } : undefined));

/**
 * The version of what the paint rack and its CSV, the recipe list, the invoices and their CSV, the quotes
 * and the enquiries read (`lists_version`, moved by migrations/20270207120000-lists-version.ts and
 * 20270208120000-lists-version-quotes-enquiries.ts), with the studio's zone, which the invoices' and the
 * quotes' keys name. Undefined when there is no such studio.
 */
export const listsVersion = (db: Db, studioId: number): Promise<VersionInZone | undefined> =>
  readFirst<{ lists_version: number | string; timezone: string }>(db, db('studios').where({ id: studioId }).select('lists_version', 'timezone')).then((r) =>
    r ? { version: Number(r.lists_version), timeZone: r.timezone } : undefined,
  );

/**
 * The version of what the owner's money view reads (server/features/money/): `schedule_version` +
 * `books_version` + `lists_version` (migrations/20270208120000-lists-version-quotes-enquiries.ts says which
 * moves for what), as booksVersion adds two: all only grow and are read from one row. With the studio's zone.
 */
export const moneyVersion = (db: Db, studioId: number): Promise<VersionInZone | undefined> =>
  readFirst<{ schedule_version: number | string; books_version: number | string; lists_version: number | string; timezone: string }>(
    db,
    db('studios').where({ id: studioId }).select('schedule_version', 'books_version', 'lists_version', 'timezone'),
  ).then((r) => (r ? { version: Number(r.schedule_version) + Number(r.books_version) + Number(r.lists_version), timeZone: r.timezone } : undefined));

type Entry<V> = { studioId: number; version: number; weight: number; value: Promise<V> };

export function versionCache<V>(opts: { maxWeight: number; weigh: (v: V) => number }) {
  const entries = new Map<string, Entry<V>>(); // least recently used first
  /** Per studio: the newest version kept and the keys of its entries. */
  const studios = new Map<number, { version: number; keys: Set<string> }>();
  let total = 0;

  const id = (studioId: number, key: string) => `${studioId} ${key}`;

  const drop = (k: string) => {
    const e = entries.get(k);
    if (!e) return;
    total -= e.weight;
    entries.delete(k);
    const s = studios.get(e.studioId);
    if (s) {
      s.keys.delete(k);
      if (!s.keys.size) studios.delete(e.studioId);
    }
  };

  function evict() {
    for (const [k] of entries) {
      if (total <= opts.maxWeight) return;
      drop(k);
    }
  }

  return {
    /** The value kept (or being read) for this studio, version and key, touching it as recently used. */
    get(studioId: number, version: number, key: string): Promise<V> | undefined {
      const k = id(studioId, key);
      const e = entries.get(k);
      if (!e || e.version !== version) return undefined;
      entries.delete(k);
      entries.set(k, e);
      return e.value;
    },

    /**
     * Keeps what `read` gives under the key, unless the studio already has a newer version kept (a request
     * that read the version just before a write finishes after one that read it just after). A failure is
     * not kept.
     */
    set(studioId: number, version: number, key: string, read: Promise<V>): Promise<V> {
      if (opts.maxWeight <= 0) return read;
      const s = studios.get(studioId);
      if (s && s.version > version) return read;
      if (s && s.version < version) for (const old of [...s.keys]) drop(old);
      const k = id(studioId, key);
      drop(k);
      const e: Entry<V> = { studioId, version, weight: 0, value: read };
      entries.set(k, e);
      const now = studios.get(studioId);
      if (now) now.keys.add(k);
      else studios.set(studioId, { version, keys: new Set([k]) });
      read.then(
        (v) => {
          if (entries.get(k) !== e) return;
          e.weight = opts.weigh(v);
          total += e.weight;
          evict();
        },
        () => {
          if (entries.get(k) === e) drop(k);
        },
      );
      return read;
    },

    /** Entries kept and the weight they hold (for tests). */
    size: () => ({ entries: entries.size, weight: total }),
  };
}

/**
 * A read kept by studio version and key, frozen (deepFreeze: whoever is given a kept value cannot change it
 * for the next caller; with the cache off it is frozen too, so both answer alike): `read()` once per version and key, or every time when `maxWeight`
 * is 0 (no cache) or the studio is unknown. The version is read first and the data after it: a write
 * committed between the two only makes the data kept newer than its key, never older, and the next request
 * reads the newer version and misses. Whoever reads a version after a write's commit therefore never gets
 * data from before that write, on any instance.
 */
export function keptReads<V, At extends number | { version: number } = number>(opts: {
  version: (studioId: number) => Promise<At | undefined>;
  maxWeight: number;
  weigh: (v: V) => number;
}) {
  const cache = opts.maxWeight > 0 ? versionCache<V>(opts) : null;
  /** `key` may be worked out from what the version read gave beside the version (e.g. a month in the studio's zone). */
  return async (studioId: number, key: string | ((at: At) => string), read: () => Promise<V>): Promise<V> => {
    const frozen = () => read().then(deepFreeze);
    if (!cache) return frozen();
    const at = await opts.version(studioId);
    if (at === undefined) return frozen();
    const version = typeof at === 'number' ? at : at.version;
    const k = typeof key === 'string' ? key : key(at);
    return cache.get(studioId, version, k) ?? cache.set(studioId, version, k, frozen());
  };
}

/**
 * keptReads for reads whose version the caller has already read itself, in the same one-row read as its
 * access check (the commission sub-lists: comments, activity, a stage's time, under `commissions.thread_version`,
 * migrations/20270209120000-thread-version.ts). `slot` is what the version is of (a commission id; its entries
 * of older versions are dropped as a studio's are in versionCache). Frozen either way, like keptReads; with
 * `maxWeight` 0, read every time. The caller reads the version before the data, as keptReads does.
 */
export function keptAtVersion<V>(opts: { maxWeight: number; weigh: (v: V) => number }) {
  const cache = opts.maxWeight > 0 ? versionCache<V>(opts) : null;
  return (slot: number, version: number, key: string, read: () => Promise<V>): Promise<V> => {
    const frozen = () => read().then(deepFreeze);
    if (!cache) return frozen();
    return cache.get(slot, version, key) ?? cache.set(slot, version, key, frozen());
  };
}
