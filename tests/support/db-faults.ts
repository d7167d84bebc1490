import type { Knex } from 'knex';

const isPostgres = (db: Knex) => db.client.config.client === 'pg';

/**
 * Test-only fault: every insert into `table` fails inside the database with `message`, until the
 * returned function removes the trigger again. A SQLite trigger with RAISE(ABORT) on SQLite, a PL/pgSQL
 * trigger function that raises on PostgreSQL.
 */
export async function failInsertsInto(db: Knex, table: string, message: string): Promise<() => Promise<void>> {
  const name = `fail_insert_${table}`;
  const text = message.replace(/'/g, "''");
  if (isPostgres(db)) {
    await db.raw(`create function ${name}() returns trigger language plpgsql as $$ begin raise exception '${text}'; end $$`);
    await db.raw(`create trigger ${name} before insert on ${table} for each row execute function ${name}()`);
    return async () => {
      await db.raw(`drop trigger ${name} on ${table}`);
      await db.raw(`drop function ${name}()`);
    };
  }
  await db.raw(`create trigger ${name} before insert on ${table} begin select raise(abort, '${text}'); end`);
  return async () => {
    await db.raw(`drop trigger ${name}`);
  };
}
