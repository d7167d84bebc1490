import type { Response } from 'express';
import type { Knex } from 'knex';
import type { Page, PageParams } from '../../shared/schemas/common';

/**
 * One page of a list: the ordered query with limit and offset, and the count of all its rows (the same
 * query without its columns and order). Two queries whatever the list holds.
 */
export async function pageRows<T>(rows: Knex.QueryBuilder, q: PageParams): Promise<{ rows: T[]; total: number }> {
  const count = rows.clone().clearSelect().clearOrder().count({ n: '*' }).first();
  const [page, c] = await Promise.all([rows.clone().limit(q.limit).offset(q.offset), count]);
  return { rows: page as T[], total: Number((c as { n?: number | string } | undefined)?.n ?? 0) };
}

/** The page as the API answers it. */
export const pageOf = <T>(items: T[], total: number, q: PageParams): Page<T> => ({ items, total, limit: q.limit, offset: q.offset });

/**
 * Lists that have always answered a bare array keep that shape: the body is the page's rows and the
 * count of all rows travels in `X-Total-Count` (`limit` and `offset` ask for the next page).
 */
export function arrayPage<T>(res: Response, page: Page<T>): T[] {
  res.setHeader('X-Total-Count', String(page.total));
  return page.items;
}
