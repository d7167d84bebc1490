import type { Knex } from 'knex';

/**
 * `studios.lists_version`: a number the database moves whenever a row read by the paint rack, its CSV, the
 * recipe list, the invoice list or the invoices' CSV changes. Those answers are kept in memory per studio,
 * version and query (server/features/paints/paints.service.ts, recipes/recipes.service.ts,
 * invoices/invoices.service.ts, through server/lib/version-cache.ts keptReads); almost all of their cost was
 * reading and building the same rows again on every request.
 *
 * What those lists read, and what moves the version (every insert, delete and update unless columns are named):
 *
 * - paints (the rack, its CSV, a recipe step's paint type and colour), recipes, recipe_steps and
 *   recipe_step_paints (the recipe list, and a paint's count of recipes): everything.
 * - schemes: inserts, deletes and a change of recipe_id (a recipe's count of schemes).
 * - invoices, invoice_payments and payment_events (an invoice's flagged events): everything.
 * - commissions.title and clients.name (shown on invoices and searched).
 *
 * The studio's zone moves nothing here: the invoices' kept answers are keyed by the zone read with the
 * version (a CSV page) or by the studio's day in it (a list page, whose invoices are overdue by that day),
 * and worked out in that zone.
 *
 * Same shape as the books version's triggers (20270205120000-books-version.ts), on both engines: inside the
 * writing transaction, whatever code writes (the API, seeds, an import, a foreign-key cascade). PostgreSQL:
 * deferred constraint triggers bump a studio once per transaction, at its commit, through
 * `lists_version_touch(studio)`. Trigger names start with `lists_version_`.
 */

type Watch = {
  table: string;
  /** Columns read; absent: any update bumps. */
  columns?: string[];
  /** Whether inserts and deletes bump (false: only a change of the columns). */
  rows?: boolean;
};

/** Tables whose rows carry `studio_id`. */
const watched: Watch[] = [
  { table: 'paints' },
  { table: 'recipes' },
  { table: 'recipe_steps' },
  { table: 'recipe_step_paints' },
  { table: 'schemes', columns: ['recipe_id'] },
  { table: 'invoices' },
  { table: 'invoice_payments' },
  { table: 'payment_events' },
  { table: 'commissions', columns: ['title'], rows: false },
  { table: 'clients', columns: ['name'], rows: false },
];

const name = (table: string, op: string) => `lists_version_${table}_${op}`;
const ops = (w: Watch) => (w.rows !== false ? ['insert', 'delete', 'update'] : ['update']);
const changed = (columns: string[]) => columns.map((c) => `old.${c} is distinct from new.${c}`).join(' or ');
const updateOf = (w: Watch) => (w.columns ? `update of ${w.columns.join(', ')}` : 'update');

const bump = (where: string) => `update studios set lists_version = lists_version + 1 where ${where};`;

function sqliteTriggers(): string[] {
  const out: string[] = [];
  for (const w of watched) {
    if (w.rows !== false) {
      out.push(`create trigger ${name(w.table, 'insert')} after insert on ${w.table} begin ${bump('id = new.studio_id')} end`);
      out.push(`create trigger ${name(w.table, 'delete')} after delete on ${w.table} begin ${bump('id = old.studio_id')} end`);
    }
    const when = w.columns ? ` when ${changed(w.columns)}` : '';
    // A row moved to another studio (none of ours does) would change both studios' lists.
    out.push(`create trigger ${name(w.table, 'update')} after ${updateOf(w)} on ${w.table}${when} begin ${bump('id = new.studio_id or id = old.studio_id')} end`);
  }
  return out;
}

/** Every trigger by name, with its table (the tests drop them one at a time). */
export const listsVersionTriggers = () => watched.flatMap((w) => ops(w).map((op) => ({ name: name(w.table, op), table: w.table })));

/** PostgreSQL: once per studio and transaction (the studios bumped are listed in a transaction-local setting). */
const pgFunctions = [
  `create function lists_version_touch(sid bigint) returns void language plpgsql as $$
declare
  seen text := coalesce(current_setting('sablework.lists_version_bumped', true), '');
begin
  if sid is null or position(',' || sid || ',' in seen) > 0 then
    return;
  end if;
  ${bump('id = sid')}
  perform set_config('sablework.lists_version_bumped', coalesce(nullif(seen, ''), ',') || sid || ',', true);
end
$$`,
  `create function lists_version_row() returns trigger language plpgsql as $$
begin
  if tg_op = 'DELETE' then
    perform lists_version_touch(old.studio_id);
  elsif tg_op = 'UPDATE' then
    perform lists_version_touch(new.studio_id);
    perform lists_version_touch(old.studio_id);
  else
    perform lists_version_touch(new.studio_id);
  end if;
  return null;
end
$$`,
];
const pgFunctionNames = ['lists_version_row()', 'lists_version_touch(bigint)'];

const deferred = (trigger: string, event: string, table: string, when: string | null, fn: string) =>
  `create constraint trigger ${trigger} after ${event} on ${table} deferrable initially deferred for each row${when ? ` when (${when})` : ''} execute function ${fn}()`;

function pgTriggers(): string[] {
  const out: string[] = [];
  for (const w of watched) {
    if (w.rows !== false) {
      out.push(deferred(name(w.table, 'insert'), 'insert', w.table, null, 'lists_version_row'));
      out.push(deferred(name(w.table, 'delete'), 'delete', w.table, null, 'lists_version_row'));
    }
    out.push(deferred(name(w.table, 'update'), updateOf(w), w.table, w.columns ? changed(w.columns) : null, 'lists_version_row'));
  }
  return out;
}

const isPostgres = (knex: Knex) => knex.client.config.client === 'pg';

/** The triggers, for the migration and for a bulk loader that sets them aside while it fills tables. */
export async function createListsVersionTriggers(knex: Knex) {
  for (const s of isPostgres(knex) ? [...pgFunctions, ...pgTriggers()] : sqliteTriggers()) await knex.raw(s);
}

export async function dropListsVersionTriggers(knex: Knex) {
  if (isPostgres(knex)) {
    for (const t of listsVersionTriggers()) await knex.raw(`drop trigger if exists ${t.name} on ${t.table}`);
    for (const f of pgFunctionNames) await knex.raw(`drop function if exists ${f}`);
    return;
  }
  for (const t of listsVersionTriggers()) await knex.raw(`drop trigger if exists ${t.name}`);
}

export async function up(knex: Knex) {
  await knex.schema.alterTable('studios', (t) => {
    t.integer('lists_version').notNullable().defaultTo(0);
  });
  await createListsVersionTriggers(knex);
}

export async function down(knex: Knex) {
  await dropListsVersionTriggers(knex);
  if (isPostgres(knex)) {
    await knex.schema.alterTable('studios', (t) => {
      t.dropColumn('lists_version');
    });
    return;
  }
  // In place (SQLite 3.35+): Knex's dropColumn would copy the table.
  await knex.raw('alter table studios drop column lists_version');
}
