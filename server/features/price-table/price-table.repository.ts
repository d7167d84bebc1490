import type { Db } from '../../lib/db';

/** The studio's saved price table (JSON as the shared schema defines it); none saved → undefined. */
export function priceTableRepository(db: Db) {
  return {
    async get(studioId: number, trx: Db = db): Promise<unknown | undefined> {
      const row = await trx('price_tables').where({ studio_id: studioId }).first('table_json');
      return row ? JSON.parse(row.table_json) : undefined;
    },
    save: (studioId: number, table: unknown, by: number | null, at: string, trx: Db = db) =>
      trx('price_tables')
        .insert({ studio_id: studioId, table_json: JSON.stringify(table), updated_by: by, updated_at: at })
        .onConflict('studio_id')
        .merge(['table_json', 'updated_by', 'updated_at']),
    studio: (studioId: number, trx: Db = db) =>
      trx('studios').where({ id: studioId }).first('id', 'name', 'currency', 'timezone') as Promise<{ id: number; name: string; currency: string; timezone: string } | undefined>,
  };
}

export type PriceTableRepository = ReturnType<typeof priceTableRepository>;
