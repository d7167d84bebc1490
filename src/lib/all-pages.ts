import { MAX_PAGE_SIZE } from '../../shared/schemas/common';
import { api } from './api-client';

type Query = Record<string, string | number | boolean | null | undefined>;

/**
 * Every row of a list that answers a bare array, read a page at a time: the server sends at most
 * MAX_PAGE_SIZE rows a request, so a longer list takes a few requests (each one as cheap as the first).
 * `max` stops early for lists where the newest rows are enough (the activity log).
 */
export async function allPages<T>(path: string, opts: { query?: Query; signal?: AbortSignal; max?: number } = {}): Promise<T[]> {
  const max = opts.max ?? Infinity;
  const rows: T[] = [];
  for (let offset = 0; rows.length < max; offset += MAX_PAGE_SIZE) {
    const page = await api<T[]>(path, { query: { ...opts.query, limit: MAX_PAGE_SIZE, offset }, signal: opts.signal });
    rows.push(...page);
    if (page.length < MAX_PAGE_SIZE) break;
  }
  return rows.slice(0, max);
}

/**
 * Every page of a list that answers an object with a `total` (the board, the timeline): `fetchPage`
 * gets the page from an offset, `merge` folds the later pages into the first.
 */
export async function allOffsets<P extends { total: number; limit: number }>(fetchPage: (offset: number) => Promise<P>, merge: (into: P, next: P) => P): Promise<P> {
  let all = await fetchPage(0);
  for (let offset = all.limit; offset < all.total; offset += all.limit) all = merge(all, await fetchPage(offset));
  return all;
}
