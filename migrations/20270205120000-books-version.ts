import type { Knex } from 'knex';

/**
 * `studios.books_version`: a number the database moves whenever a row the books (the earnings and actuals
 * reports, server/features/reports/) or the owner's home (server/features/dashboard/) read changes and
 * `schedule_version` (migrations/20270121120000-schedule-version.ts, 20270203120000-board-version.ts,
 * 20270204120000-commission-list-version.ts) does not already move for it. Those answers are kept in memory
 * under the sum of the two versions (server/lib/version-cache.ts `booksVersion`); money writes do not
 * touch `schedule_version`, so they leave the forecast, the board and the commission list kept.
 *
 * Column by column, what the books and the owner's home read, and what moves which version:
 *
 * - stages (status, template_key, name, estimate_minutes, done_at, position, figure_id, commission_id),
 *   figures (name, quantity, position, painter_id), commissions (status, title, client_id, due_date, inserts
 *   and deletes), clients (name), users (name), closed time_entries (commission_id, stage_id, ended_at,
 *   minutes) and studios.timezone: `schedule_version`.
 * - figures: size_class, tier and extras (the actuals' cells and hour-extras): here.
 * - time_entries that are running (no `ended_at`: the owner's own running timer on the home page): inserts,
 *   deletes and changes of user_id, stage_id, figure_id, commission_id, started_at or ended_at while the
 *   row is running before or after (stopping one moves both versions): here.
 * - quotes that are accepted before or after the write (the pass-through costs and the quote's total):
 *   inserts, deletes and changes of commission_id, status, version, result_json or total: here. Drafts
 *   being edited move nothing.
 * - invoices (every column the reports and the unpaid list read), invoice_payments, invoice_refunds,
 *   books_settings (the card fee) and price_tables (currency, hourly rate, stages, tiers, cells): every
 *   insert and delete, and a change of a column read: here.
 * - studios.currency (the default price table until the owner saves one): here.
 *
 * Same shape as the schedule version's triggers, on both engines: inside the writing transaction, whatever
 * code writes (the API, seeds, an erasure, a foreign-key cascade). PostgreSQL: deferred constraint
 * triggers bump a studio once per transaction, at its commit, after every other lock it takes (see
 * 20270121120000 for the deadlock that immediate triggers made), through `books_version_touch(studio)`.
 *
 * Trigger names start with `books_version_`: a bulk loader that sets triggers aside by name
 * (tests/bench/support/generate.ts) must name that prefix too.
 */

type Watch = {
  table: string;
  /** Columns read; a change to any of them bumps the version. */
  columns: string[];
  /** Extra condition on the row (`r` is new or old) for inserts and deletes; absent: always. */
  row?: (r: string) => string;
  /** Whether inserts and deletes bump (false: only a change of the columns). */
  rows?: boolean;
};

const running = (r: string) => `${r}.ended_at is null`;
const accepted = (r: string) => `${r}.status = 'accepted'`;

/** Tables whose rows carry `studio_id`. */
const watched: Watch[] = [
  { table: 'figures', columns: ['size_class', 'tier', 'extras'], rows: false },
  { table: 'time_entries', columns: ['user_id', 'stage_id', 'figure_id', 'commission_id', 'started_at', 'ended_at'], row: running },
  { table: 'quotes', columns: ['commission_id', 'status', 'version', 'result_json', 'total'], row: accepted },
  { table: 'invoices', columns: ['commission_id', 'client_id', 'kind', 'status', 'number', 'currency', 'tax', 'total', 'paid', 'credited', 'due_date'] },
  { table: 'invoice_payments', columns: ['invoice_id', 'method', 'amount', 'received_at'] },
  { table: 'invoice_refunds', columns: ['invoice_id', 'payment_id', 'amount', 'created_at'] },
  { table: 'books_settings', columns: ['card_fee_bp', 'card_fee_fixed'] },
  { table: 'price_tables', columns: ['table_json'] },
];

const name = (table: string, op: string) => `books_version_${table}_${op}`;
const ops = (w: Watch) => (w.rows !== false ? ['insert', 'delete', 'update'] : ['update']);
const changed = (columns: string[]) => columns.map((c) => `old.${c} is distinct from new.${c}`).join(' or ');
/** An update bumps when a watched column changed, and (with a row condition) the row counts before or after. */
const updateWhen = (w: Watch) => (w.row ? `(${changed(w.columns)}) and (${w.row('old')} or ${w.row('new')})` : changed(w.columns));

const bump = (where: string) => `update studios set books_version = books_version + 1 where ${where};`;

function sqliteTriggers(): string[] {
  const out: string[] = [];
  for (const w of watched) {
    if (w.rows !== false) {
      const when = (r: string) => (w.row ? ` when ${w.row(r)}` : '');
      out.push(`create trigger ${name(w.table, 'insert')} after insert on ${w.table}${when('new')} begin ${bump('id = new.studio_id')} end`);
      out.push(`create trigger ${name(w.table, 'delete')} after delete on ${w.table}${when('old')} begin ${bump('id = old.studio_id')} end`);
    }
    out.push(`create trigger ${name(w.table, 'update')} after update of ${w.columns.join(', ')} on ${w.table} when ${updateWhen(w)} begin ${bump('id = new.studio_id')} end`);
  }
  // The bump writes books_version only, so it starts neither this trigger nor the schedule version's (timezone).
  out.push(`create trigger ${name('studios', 'update')} after update of currency on studios when ${changed(['currency'])} begin ${bump('id = new.id')} end`);
  return out;
}

const triggers = () => [...watched.flatMap((w) => ops(w).map((op) => ({ name: name(w.table, op), table: w.table }))), { name: name('studios', 'update'), table: 'studios' }];

/** PostgreSQL: once per studio and transaction (the studios bumped are listed in a transaction-local setting). */
const pgFunctions = [
  `create function books_version_touch(sid bigint) returns void language plpgsql as $$
declare
  seen text := coalesce(current_setting('sablework.books_version_bumped', true), '');
begin
  if sid is null or position(',' || sid || ',' in seen) > 0 then
    return;
  end if;
  ${bump('id = sid')}
  perform set_config('sablework.books_version_bumped', coalesce(nullif(seen, ''), ',') || sid || ',', true);
end
$$`,
  `create function books_version_row() returns trigger language plpgsql as $$
begin
  if tg_op = 'DELETE' then
    perform books_version_touch(old.studio_id);
  else
    perform books_version_touch(new.studio_id);
  end if;
  return null;
end
$$`,
  `create function books_version_studio() returns trigger language plpgsql as $$
begin
  perform books_version_touch(new.id);
  return null;
end
$$`,
];
const pgFunctionNames = ['books_version_row()', 'books_version_studio()', 'books_version_touch(bigint)'];

const deferred = (trigger: string, event: string, table: string, when: string | null, fn: string) =>
  `create constraint trigger ${trigger} after ${event} on ${table} deferrable initially deferred for each row${when ? ` when (${when})` : ''} execute function ${fn}()`;

function pgTriggers(): string[] {
  const out: string[] = [];
  for (const w of watched) {
    if (w.rows !== false) {
      out.push(deferred(name(w.table, 'insert'), 'insert', w.table, w.row ? w.row('new') : null, 'books_version_row'));
      out.push(deferred(name(w.table, 'delete'), 'delete', w.table, w.row ? w.row('old') : null, 'books_version_row'));
    }
    out.push(deferred(name(w.table, 'update'), `update of ${w.columns.join(', ')}`, w.table, updateWhen(w), 'books_version_row'));
  }
  out.push(deferred(name('studios', 'update'), 'update of currency', 'studios', changed(['currency']), 'books_version_studio'));
  return out;
}

const isPostgres = (knex: Knex) => knex.client.config.client === 'pg';

/** The triggers, for the migration and for a bulk loader that sets them aside while it fills tables. */
export async function createBooksVersionTriggers(knex: Knex) {
  for (const s of isPostgres(knex) ? [...pgFunctions, ...pgTriggers()] : sqliteTriggers()) await knex.raw(s);
}

export async function dropBooksVersionTriggers(knex: Knex) {
  if (isPostgres(knex)) {
    for (const t of triggers()) await knex.raw(`drop trigger if exists ${t.name} on ${t.table}`);
    for (const f of pgFunctionNames) await knex.raw(`drop function if exists ${f}`);
    return;
  }
  for (const t of triggers()) await knex.raw(`drop trigger if exists ${t.name}`);
}

export async function up(knex: Knex) {
  await knex.schema.alterTable('studios', (t) => {
    t.integer('books_version').notNullable().defaultTo(0);
  });
  await createBooksVersionTriggers(knex);
}

export async function down(knex: Knex) {
  await dropBooksVersionTriggers(knex);
  if (isPostgres(knex)) {
    await knex.schema.alterTable('studios', (t) => {
      t.dropColumn('books_version');
    });
    return;
  }
  // In place (SQLite 3.35+): Knex's dropColumn would copy the table.
  await knex.raw('alter table studios drop column books_version');
}
