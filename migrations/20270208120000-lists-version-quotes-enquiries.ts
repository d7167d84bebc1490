import type { Knex } from 'knex';

/**
 * `studios.lists_version` (migrations/20270207120000-lists-version.ts) moved by more tables, for three more
 * answers kept in memory per studio, version and query (through server/lib/version-cache.ts keptReads): the
 * quote list (server/features/quotes/quotes.service.ts, the owner's and each client's), the enquiry list
 * (server/features/enquiries/enquiries.service.ts) and the owner's money view
 * (server/features/money/money.service.ts). Almost all of their cost was reading the same rows again on
 * every request.
 *
 * What they read, and what moves which version (every insert, delete and update unless columns are named):
 *
 * - The quote list: quotes (here), commissions.title and clients.name (already the lists version's), and the
 *   studio's day (its key names it, in the zone read with the version: a sent quote past its validity is
 *   shown, and written, as expired).
 * - The enquiry list: enquiries, enquiry_figures (counts of figures and models), enquiry_photos (the count of
 *   photos) and studio_lists (the tiers' labels): here.
 * - The money view is kept under the sum of the schedule, books and lists versions
 *   (server/lib/version-cache.ts moneyVersion; all three only grow and are read from one row). Its invoices,
 *   payments, refunds, price table and studios.currency are the books version's, clients.name,
 *   commissions.status and studios.timezone the schedule version's, payment_events (the flagged events) the
 *   lists version's; commissions.status_before_hold (a deposit held for a commission on hold from quoted or
 *   booked), which no version moved alone, here. Its key names the studio's day in its zone (overdue
 *   invoices, this month's payments).
 *
 * Same shape as the lists version's first triggers; on PostgreSQL through the same
 * `lists_version_touch(studio)` (once per studio and transaction, at its commit).
 * Trigger names start with `lists_version_`, so a bulk loader that sets that prefix aside
 * (tests/bench/support/generate.ts) sets these aside too.
 */

type Watch = {
  table: string;
  /** Columns read; absent: any update bumps. */
  columns?: string[];
  /** Whether inserts and deletes bump (false: only a change of the columns). */
  rows?: boolean;
  /** The trigger names' middle (default: the table). */
  as?: string;
};

/** Tables whose rows carry `studio_id`. */
const watched: Watch[] = [
  { table: 'quotes' },
  { table: 'enquiries' },
  { table: 'enquiry_figures' },
  { table: 'enquiry_photos' },
  { table: 'studio_lists' },
  { table: 'commissions', as: 'commissions_hold', columns: ['status_before_hold'], rows: false },
];

const name = (w: Watch, op: string) => `lists_version_${w.as ?? w.table}_${op}`;
const ops = (w: Watch) => (w.rows !== false ? ['insert', 'delete', 'update'] : ['update']);
const changed = (columns: string[]) => columns.map((c) => `old.${c} is distinct from new.${c}`).join(' or ');
const updateOf = (w: Watch) => (w.columns ? `update of ${w.columns.join(', ')}` : 'update');

const bump = (where: string) => `update studios set lists_version = lists_version + 1 where ${where};`;

function sqliteTriggers(): string[] {
  const out: string[] = [];
  for (const w of watched) {
    if (w.rows !== false) {
      out.push(`create trigger ${name(w, 'insert')} after insert on ${w.table} begin ${bump('id = new.studio_id')} end`);
      out.push(`create trigger ${name(w, 'delete')} after delete on ${w.table} begin ${bump('id = old.studio_id')} end`);
    }
    const when = w.columns ? ` when ${changed(w.columns)}` : '';
    out.push(`create trigger ${name(w, 'update')} after ${updateOf(w)} on ${w.table}${when} begin ${bump('id = new.studio_id or id = old.studio_id')} end`);
  }
  return out;
}

/** Every trigger by name, with its table (the tests drop them one at a time). */
export const quotesEnquiriesListsTriggers = () => watched.flatMap((w) => ops(w).map((op) => ({ name: name(w, op), table: w.table })));

/**
 * PostgreSQL: a trigger function of these triggers' own, calling 20270207120000's `lists_version_touch`: a
 * trigger depends on the function it executes, so on `lists_version_row()` these would stop
 * dropListsVersionTriggers (which the tests and a bulk loader run) from dropping it.
 */
const pgFunction = `create function lists_version_more_row() returns trigger language plpgsql as $$
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
$$`;

const deferred = (trigger: string, event: string, table: string, when: string | null) =>
  `create constraint trigger ${trigger} after ${event} on ${table} deferrable initially deferred for each row${when ? ` when (${when})` : ''} execute function lists_version_more_row()`;

function pgTriggers(): string[] {
  const out: string[] = [];
  for (const w of watched) {
    if (w.rows !== false) {
      out.push(deferred(name(w, 'insert'), 'insert', w.table, null));
      out.push(deferred(name(w, 'delete'), 'delete', w.table, null));
    }
    out.push(deferred(name(w, 'update'), updateOf(w), w.table, w.columns ? changed(w.columns) : null));
  }
  return out;
}

const isPostgres = (knex: Knex) => knex.client.config.client === 'pg';

/** The triggers (the tests drop and make them again; on PostgreSQL they call 20270207120000's `lists_version_touch`). */
export async function createQuotesEnquiriesListsTriggers(knex: Knex) {
  for (const s of isPostgres(knex) ? [pgFunction, ...pgTriggers()] : sqliteTriggers()) await knex.raw(s);
}

export async function dropQuotesEnquiriesListsTriggers(knex: Knex) {
  for (const t of quotesEnquiriesListsTriggers()) await knex.raw(isPostgres(knex) ? `drop trigger if exists ${t.name} on ${t.table}` : `drop trigger if exists ${t.name}`);
  if (isPostgres(knex)) await knex.raw('drop function if exists lists_version_more_row()');
}

export async function up(knex: Knex) {
  await createQuotesEnquiriesListsTriggers(knex);
}

export async function down(knex: Knex) {
  await dropQuotesEnquiriesListsTriggers(knex);
}
